import { escapeHtml } from './escape';
import type { ProfileResult } from './run';

/** Significant figures for SVG coordinates: far below a pixel at any print size. */
const fmt = (v: number) => String(Number(v.toPrecision(6)));

/**
 * An SVG picture of a profile: the outline filled even-odd (holes open), the centroid (circle with a
 * cross), the principal axes through it (1 major, solid; 2 minor, dashed) and the shear centre
 * (diamond), each told apart by shape as well as colour so a grey printout still reads. The outline
 * is stored y-up; the picture flips it, and draws markers at (x, −y).
 */
export function sectionSvg(p: ProfileResult, title: string): string {
  const o = p.outline;
  if (!o) return '';
  const { xmin, ymin, xmax, ymax } = o.box;
  const size = Math.max(xmax - xmin, ymax - ymin) || 1;
  const pad = size * 0.12;
  const view = [xmin - pad, -ymax - pad, xmax - xmin + 2 * pad, ymax - ymin + 2 * pad].map(fmt).join(' ');
  const v = p.values;
  const mark = size * 0.025;
  const out: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" class="section" viewBox="${view}" role="img" aria-label="${escapeHtml(title)}">`,
    `<title>${escapeHtml(title)}</title>`,
    `<path class="outline" fill-rule="evenodd" transform="scale(1 -1)" vector-effect="non-scaling-stroke" d="${o.d}"/>`,
  ];
  if (v.cx !== undefined && v.cy !== undefined) {
    const cx = v.cx;
    const cy = -v.cy;
    if (v.theta !== undefined) {
      // theta is counter-clockwise in y-up drawing coordinates: clockwise once y is flipped.
      const t = (v.theta * Math.PI) / 180;
      const half = size * 0.62;
      for (const [axis, a] of [['1', t], ['2', t + Math.PI / 2]] as const) {
        const dx = Math.cos(a) * half;
        const dy = -Math.sin(a) * half;
        out.push(
          `<line class="axis axis-${axis}" vector-effect="non-scaling-stroke" x1="${fmt(cx - dx)}" y1="${fmt(cy - dy)}" x2="${fmt(cx + dx)}" y2="${fmt(cy + dy)}"/>`,
          `<text class="axis-label" x="${fmt(cx + dx * 1.06)}" y="${fmt(cy + dy * 1.06)}" font-size="${fmt(size * 0.06)}">${axis}</text>`,
        );
      }
    }
    out.push(
      `<circle class="centroid" vector-effect="non-scaling-stroke" cx="${fmt(cx)}" cy="${fmt(cy)}" r="${fmt(mark)}"><title>centroid</title></circle>`,
      `<path class="centroid" vector-effect="non-scaling-stroke" d="M${fmt(cx - mark)} ${fmt(cy)}H${fmt(cx + mark)}M${fmt(cx)} ${fmt(cy - mark)}V${fmt(cy + mark)}"/>`,
    );
  }
  if (v.xs !== undefined && v.ys !== undefined) {
    const [x, y, s] = [v.xs, -v.ys, mark * 1.3];
    out.push(`<path class="shear-centre" vector-effect="non-scaling-stroke" d="M${fmt(x)} ${fmt(y - s)}L${fmt(x + s)} ${fmt(y)}L${fmt(x)} ${fmt(y + s)}L${fmt(x - s)} ${fmt(y)}Z"><title>shear centre</title></path>`);
  }
  out.push('</svg>');
  return out.join('');
}
