import { GeometryError, makeRegion, type Region } from '@keelson/geometry';
import { circleLoop } from './basic';
import { filletedPolygon, type Corner } from './fillet';
import { assertFilletsFit } from './fit';

/** Dimensions of a square T-slot framing profile (all lengths in one unit). */
export interface TSlotDims {
  /** Outside size of the square. */
  a: number;
  /** Slot opening width at the face. */
  s: number;
  /** Lip thickness: depth of the slot's neck below the face. */
  tl: number;
  /** Width of the slot's undercut chamber (behind the lips). */
  w: number;
  /** Total slot depth from the face to the chamber floor. */
  d: number;
  /** 45° chamfer at the two floor corners of the chamber (0: square). */
  k?: number;
  /** Central bore diameter (0 or omitted: none). */
  bore?: number;
  /** Radius of the four outside corners. */
  ro?: number;
  /** Radius of every slot corner (lip edges and chamber corners). */
  rf?: number;
}

/**
 * Square T-slot profile centred on the origin, with one T-slot in the middle of each face and an
 * optional central bore: a single outline of 4 + 4 × 10 corners (4 × 8 without chamfers) plus one circular hole. The slot,
 * seen from its face (u along the face, v inward), runs through (−s/2, 0), (−s/2, tl), (−w/2, tl),
 * (−w/2, d − k), (−w/2 + k, d) and their mirror images.
 * Throws unless the slots stay clear of each other (d < a/2 − w/2) and of the bore (d + bore/2 < a/2).
 */
export function tSlotProfile(dims: TSlotDims): Region {
  const { a, s, tl, w, d } = dims;
  const k = dims.k ?? 0;
  const bore = dims.bore ?? 0;
  const ro = dims.ro ?? 0;
  const rf = dims.rf ?? 0;
  const h = a / 2;
  if (!(0 < s && s < w && 0 < tl && tl + k < d && k < w / 2))
    throw new GeometryError('DEGENERATE_LOOP', `T-slot: needs 0 < s < w, 0 < tl, tl + k < d and k < w/2`);
  if (!(d < h - w / 2))
    throw new GeometryError('DEGENERATE_LOOP', `T-slot: slots ${w} wide, ${d} deep meet at the corners`);
  if (!(d + bore / 2 < h)) throw new GeometryError('DEGENERATE_LOOP', `T-slot: bore ${bore} cuts into the slots`);

  const floor: [number, number][] =
    k > 0
      ? [
          [-w / 2, d - k],
          [-w / 2 + k, d],
          [w / 2 - k, d],
          [w / 2, d - k],
        ]
      : [
          [-w / 2, d],
          [w / 2, d],
        ];
  const slot: [number, number][] = [
    [-s / 2, 0],
    [-s / 2, tl],
    [-w / 2, tl],
    ...floor,
    [w / 2, tl],
    [s / 2, tl],
    [s / 2, 0],
  ];
  const corners: Corner[] = [];
  // Faces counter-clockwise from the bottom: start corner, direction u along the face, inward normal v.
  const faces = [
    { x: -h, y: -h, ux: 1, uy: 0 },
    { x: h, y: -h, ux: 0, uy: 1 },
    { x: h, y: h, ux: -1, uy: 0 },
    { x: -h, y: h, ux: 0, uy: -1 },
  ];
  for (const f of faces) {
    corners.push({ x: f.x, y: f.y, r: ro });
    const mx = f.x + f.ux * h;
    const my = f.y + f.uy * h;
    for (const [u, v] of slot)
      corners.push({ x: mx + f.ux * u - f.uy * v, y: my + f.uy * u + f.ux * v, r: rf });
  }
  assertFilletsFit(corners, 'T-slot profile');
  return makeRegion([{ outer: filletedPolygon(corners), holes: bore > 0 ? [circleLoop(bore / 2)] : [] }]);
}
