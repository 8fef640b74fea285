import { GeometryError, makeRegion, type Region } from '@keelson/geometry';
import { filletedPolygon } from './fillet';

/**
 * Tee (T-section), flange on top: overall depth h, flange width b, stem thickness tw, flange
 * thickness tf, root radius r between stem and flange, toe radius rt at the underside of the
 * flange tips and at the stem's end corners (as rolled and extruded tees are drawn).
 * Symmetric about the y-axis; the stem ends at y = 0, the flange's top face is at y = h.
 */
export function tee(d: { h: number; b: number; tw: number; tf: number; r?: number; rt?: number }): Region {
  const { h, b, tw, tf } = d;
  const r = d.r ?? 0;
  const rt = d.rt ?? 0;
  if (!(b > tw && h > tf && tw > 0 && tf > 0))
    throw new GeometryError('DEGENERATE_LOOP', `tee ${h}×${b}: needs b > tw > 0 and h > tf > 0`);
  const x = b / 2;
  const w = tw / 2;
  const yi = h - tf;
  return makeRegion([
    {
      outer: filletedPolygon([
        { x: -w, y: 0, r: rt },
        { x: w, y: 0, r: rt },
        { x: w, y: yi, r },
        { x: x, y: yi, r: rt },
        { x: x, y: h },
        { x: -x, y: h },
        { x: -x, y: yi, r: rt },
        { x: -w, y: yi, r },
      ]),
      holes: [],
    },
  ]);
}
