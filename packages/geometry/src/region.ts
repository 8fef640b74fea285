import { GeometryError } from './errors';
import { loopMoments } from './moments';
import {
  checkSegment,
  endPoint,
  reverseSegment,
  segmentLength,
  startPoint,
  transformSegment,
  type Affine,
} from './segment';
import type { Loop, Part, Region } from './types';
import { loopBox } from './extent';

/** Gap allowed between consecutive segment ends, relative to the loop's size: rounding only. */
const CLOSURE_TOLERANCE = 1e-9;

export function reverseLoop(loop: Loop): Loop {
  return loop.map(reverseSegment).reverse();
}

export function signedLoopArea(loop: Loop): number {
  const b = loopBox(loop);
  return loopMoments(loop, { x: (b.xmin + b.xmax) / 2, y: (b.ymin + b.ymax) / 2 }).a;
}

/** Throws unless every segment is valid and the chain closes on itself. */
export function checkLoop(loop: Loop, label = 'loop'): void {
  if (loop.length === 0) throw new GeometryError('DEGENERATE_LOOP', `${label} has no segments`);
  for (const s of loop) checkSegment(s);
  const b = loopBox(loop);
  const tol = CLOSURE_TOLERANCE * Math.max(b.xmax - b.xmin, b.ymax - b.ymin);
  for (let i = 0; i < loop.length; i++) {
    const e = endPoint(loop[i]!);
    const s = startPoint(loop[(i + 1) % loop.length]!);
    const gap = Math.hypot(e.x - s.x, e.y - s.y);
    if (!(gap <= tol))
      throw new GeometryError(
        'OPEN_LOOP',
        `${label} is open at (${e.x}, ${e.y}): gap ${gap.toPrecision(3)} to the next segment`,
      );
  }
  if (signedLoopArea(loop) === 0) throw new GeometryError('DEGENERATE_LOOP', `${label} encloses no area`);
}

function oriented(loop: Loop, ccw: boolean): Loop {
  return signedLoopArea(loop) > 0 === ccw ? loop : reverseLoop(loop);
}

/**
 * Builds a region from parts whose holes lie inside their outer loop and do not cross it
 * (resolving overlaps is the importer's job). Orientation is fixed here: outer loops
 * counter-clockwise, holes clockwise, so signed integrals over all loops give the solid.
 */
export function makeRegion(parts: readonly Part[]): Region {
  if (parts.length === 0) throw new GeometryError('EMPTY_REGION', 'region has no parts');
  return {
    parts: parts.map((p, i) => {
      checkLoop(p.outer, `part ${i + 1} outline`);
      p.holes.forEach((h, j) => checkLoop(h, `part ${i + 1} hole ${j + 1}`));
      return { outer: oriented(p.outer, true), holes: p.holes.map((h) => oriented(h, false)) };
    }),
  };
}

export function allLoops(region: Region): Loop[] {
  return region.parts.flatMap((p) => [p.outer, ...p.holes]);
}

/** Total boundary length, holes included (the surface to coat or anodise per unit length). */
export function perimeter(region: Region): number {
  let sum = 0;
  for (const loop of allLoops(region)) for (const s of loop) sum += segmentLength(s);
  return sum;
}

export function segmentCount(region: Region): number {
  return allLoops(region).reduce((n, l) => n + l.length, 0);
}

/** Maps every loop through a similarity and restores orientation (a mirror reverses it). */
export function transformRegion(region: Region, t: Affine): Region {
  return makeRegion(
    region.parts.map((p) => ({
      outer: p.outer.map((s) => transformSegment(t, s)),
      holes: p.holes.map((h) => h.map((s) => transformSegment(t, s))),
    })),
  );
}

export const translation = (dx: number, dy: number): Affine => ({ a: 1, b: 0, c: 0, d: 1, tx: dx, ty: dy });
export const rotation = (phi: number): Affine => {
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  return { a: c, b: -s, c: s, d: c, tx: 0, ty: 0 };
};
export const scaling = (k: number): Affine => ({ a: k, b: 0, c: 0, d: k, tx: 0, ty: 0 });
/** Mirror in the y-axis (x → −x). */
export const mirrorX: Affine = { a: -1, b: 0, c: 0, d: 1, tx: 0, ty: 0 };
