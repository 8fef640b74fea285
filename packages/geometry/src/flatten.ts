import { evalSegment, paramRange, smoothBreaks } from './segment';
import type { Point, Segment } from './types';

/**
 * Points along a segment, start to end, whose chords stay within `tol` of the true curve.
 * Arcs and elliptical arcs use the chord error bound Δt²·R/8 (R the largest semi-diameter);
 * splines are halved until the curve's midpoint lies within tol of the chord. For display,
 * meshing and topology tests only: integrals never use the polyline.
 */
export function flattenSegment(s: Segment, tol: number): Point[] {
  const [t0, t1] = paramRange(s);
  if (s.kind === 'line') return [s.a, s.b];
  if (s.kind === 'arc' || s.kind === 'ellipse') {
    const R = s.kind === 'arc' ? s.r : Math.max(Math.hypot(s.u.x, s.u.y), Math.hypot(s.v.x, s.v.y));
    const step = Math.sqrt((8 * tol) / R);
    const n = Math.min(1 << 20, Math.max(1, Math.ceil(Math.abs(t1 - t0) / step)));
    return Array.from({ length: n + 1 }, (_, i) => evalSegment(s, i === n ? t1 : t0 + ((t1 - t0) * i) / n).p);
  }
  const out: Point[] = [evalSegment(s, t0).p];
  const br = smoothBreaks(s);
  const refine = (a: number, pa: Point, b: number, pb: Point, depth: number) => {
    const m = (a + b) / 2;
    const pm = evalSegment(s, m).p;
    const dx = pb.x - pa.x;
    const dy = pb.y - pa.y;
    const len = Math.hypot(dx, dy);
    const dev = len > 0 ? Math.abs((pm.x - pa.x) * dy - (pm.y - pa.y) * dx) / len : Math.hypot(pm.x - pa.x, pm.y - pa.y);
    if (depth < 20 && (depth < 3 || dev > tol)) {
      refine(a, pa, m, pm, depth + 1);
      refine(m, pm, b, pb, depth + 1);
    } else out.push(pb);
  };
  for (let i = 0; i + 1 < br.length; i++) refine(br[i]!, evalSegment(s, br[i]!).p, br[i + 1]!, evalSegment(s, br[i + 1]!).p, 0);
  return out;
}
