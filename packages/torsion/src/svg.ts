import type { QuadMesh } from './levels';

export interface MeshSvgOptions {
  /** Width of the drawing in pixels (height follows the section's aspect). Default 800. */
  readonly width?: number;
  /** Stroke colour of element sides. Default '#1f4e79'. */
  readonly stroke?: string;
}

/**
 * The mesh as an SVG document for inspection: one path per element, curved sides drawn as the
 * quadratic curves the elements really have (control point 2m − (a + b)/2 through the side node m),
 * y up as in the drawing.
 */
export function meshSvg(mesh: QuadMesh, opts: MeshSvgOptions = {}): string {
  const { x, y, el } = mesh;
  let xmin = Infinity;
  let xmax = -Infinity;
  let ymin = Infinity;
  let ymax = -Infinity;
  for (let i = 0; i < x.length; i++) {
    xmin = Math.min(xmin, x[i]!);
    xmax = Math.max(xmax, x[i]!);
    ymin = Math.min(ymin, y[i]!);
    ymax = Math.max(ymax, y[i]!);
  }
  const size = Math.max(xmax - xmin, ymax - ymin) || 1;
  const pad = 0.02 * size;
  const width = opts.width ?? 800;
  const w = xmax - xmin + 2 * pad;
  const h = ymax - ymin + 2 * pad;
  const height = Math.max(1, Math.round((width * h) / w));
  const stroke = opts.stroke ?? '#1f4e79';
  const px = (i: number) => +((x[i]! - xmin + pad) / size).toFixed(7);
  const py = (i: number) => +((ymax + pad - y[i]!) / size).toFixed(7);
  const parts: string[] = [];
  for (let e = 0; e < el.length / 6; e++) {
    const v = el.subarray(6 * e, 6 * e + 6);
    let d = `M${px(v[0]!)} ${py(v[0]!)}`;
    for (let k = 0; k < 3; k++) {
      const a = v[k]!;
      const b = v[(k + 1) % 3]!;
      const m = v[3 + k]!;
      const cx = 2 * px(m) - (px(a) + px(b)) / 2;
      const cy = 2 * py(m) - (py(a) + py(b)) / 2;
      const straight = Math.abs(cx - px(m)) + Math.abs(cy - py(m)) < 1e-9;
      d += straight ? `L${px(b)} ${py(b)}` : `Q${+cx.toFixed(7)} ${+cy.toFixed(7)} ${px(b)} ${py(b)}`;
    }
    parts.push(`<path d="${d}Z"/>`);
  }
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${+(w / size).toFixed(7)} ${+(h / size).toFixed(7)}">`,
    `<g fill="#eef3f8" stroke="${stroke}" stroke-width="${+(0.75 / width * (w / size)).toFixed(7)}" stroke-linejoin="round">`,
    ...parts,
    '</g>',
    '</svg>',
    '',
  ].join('\n');
}
