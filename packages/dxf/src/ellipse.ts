import { TAU, ellipse, type EllipseSegment } from '@keelson/geometry';
import type { Fields } from './fields';
import { planeOf } from './ocs';

/**
 * An ELLIPSE: centre (10) and major semi-axis (11, relative to the centre) in world coordinates,
 * minor/major ratio (40), start and end *parameters* (41, 42; radians, not angles), turning
 * counter-clockwise about the extrusion direction (210): p(t) = c + M·cos t + r·(N × M)·sin t
 * (AutoCAD DXF Reference, ELLIPSE). With N = (0, 0, −1) the minor axis points the other way, which
 * mirrors the run; dxf-parser drops N, so it is read from the pairs here.
 */
export function ellipseSegment(f: Fields): EllipseSegment {
  const c = f.point(10, 'centre');
  const m = f.point(11, 'major axis end point');
  const ratio = f.num(40, 'minor to major ratio');
  if (!(ratio > 0)) f.fail('INVALID_ENTITY', `minor to major ratio ${ratio} is not positive`);
  if (!(Math.hypot(m.x, m.y) > 0)) f.fail('INVALID_ENTITY', 'major axis has zero length');
  const n = f.extrusion();
  planeOf(f, n);
  const s = Math.sign(n.z);
  const v = { x: -s * ratio * m.y, y: s * ratio * m.x };
  const t0 = f.num(41, 'start parameter', 0);
  const t1 = f.num(42, 'end parameter', TAU);
  // The run from t0 to t1 turns counter-clockwise about N; equal parameters (0 and 2π) mean the whole ellipse.
  const w = (((t1 - t0) % TAU) + TAU) % TAU;
  return ellipse(c, m, v, t0, w <= 1e-12 ? TAU : w);
}
