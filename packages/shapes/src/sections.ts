import { makeRegion, type Region } from '@keelson/geometry';
import { filletedPolygon } from './fillet';
import { rectangleLoop } from './basic';

/**
 * Doubly symmetric I-section, centred on the origin: depth h, flange width b, web tw, flange tf,
 * root radius r between web and flanges (hot-rolled shapes as EN 10365 draws them).
 */
export function iSection(d: { h: number; b: number; tw: number; tf: number; r?: number }): Region {
  const { h, b, tw, tf } = d;
  const r = d.r ?? 0;
  const x = b / 2;
  const w = tw / 2;
  const y = h / 2;
  const yi = y - tf;
  return makeRegion([
    {
      outer: filletedPolygon([
        { x: -x, y: -y },
        { x: x, y: -y },
        { x: x, y: -yi },
        { x: w, y: -yi, r },
        { x: w, y: yi, r },
        { x: x, y: yi },
        { x: x, y: y },
        { x: -x, y: y },
        { x: -x, y: yi },
        { x: -w, y: yi, r },
        { x: -w, y: -yi, r },
        { x: -x, y: -yi },
      ]),
      holes: [],
    },
  ]);
}

/**
 * Parallel-flange channel: web along the y-axis at x ∈ [0, tw], flanges to +x; depth h, flange
 * width b, root radius r.
 */
export function channel(d: { h: number; b: number; tw: number; tf: number; r?: number }): Region {
  const { h, b, tw, tf } = d;
  const r = d.r ?? 0;
  const y = h / 2;
  const yi = y - tf;
  return makeRegion([
    {
      outer: filletedPolygon([
        { x: 0, y: -y },
        { x: b, y: -y },
        { x: b, y: -yi },
        { x: tw, y: -yi, r },
        { x: tw, y: yi, r },
        { x: b, y: yi },
        { x: b, y: y },
        { x: 0, y: y },
      ]),
      holes: [],
    },
  ]);
}

/**
 * Angle with legs along +x (length a) and +y (length b) from the heel at the origin, thickness t,
 * root radius r and toe radius rt.
 */
export function angle(d: { a: number; b: number; t: number; r?: number; rt?: number }): Region {
  const { a, b, t } = d;
  const r = d.r ?? 0;
  const rt = d.rt ?? 0;
  return makeRegion([
    {
      outer: filletedPolygon([
        { x: 0, y: 0 },
        { x: a, y: 0 },
        { x: a, y: t, r: rt },
        { x: t, y: t, r },
        { x: t, y: b, r: rt },
        { x: 0, y: b },
      ]),
      holes: [],
    },
  ]);
}

/**
 * Rectangular hollow section w × h, wall t, outer corner radius ro, inner ri, centred on the origin
 * (EN 10219 draws cold-formed tubes with ro = 2t, ri = t for t ≤ 6 mm).
 */
export function hollowRectangle(d: { w: number; h: number; t: number; ro?: number; ri?: number }): Region {
  const { w, h, t } = d;
  return makeRegion([
    {
      outer: rectangleLoop(w, h, -w / 2, -h / 2, d.ro ?? 0),
      holes: [rectangleLoop(w - 2 * t, h - 2 * t, -w / 2 + t, -h / 2 + t, d.ri ?? 0)],
    },
  ]);
}
