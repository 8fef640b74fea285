import { loopBox, type Box } from './extent';
import { overlappingBoxes } from './sweep';
import { makeRegion, signedLoopArea } from './region';
import { GeometryError } from './errors';
import { flattenSegment } from './flatten';
import { evalSegment, paramRange, segmentLength, startPoint } from './segment';
import type { ArcSegment, Loop, Point, Region, Segment } from './types';

/**
 * Whether the horizontal ray from p towards +x crosses the straight piece a→b, by the half-open
 * rule: a piece counts when exactly one end lies strictly above p (y > p.y), so a ray through a
 * shared vertex counts once, and a horizontal piece never.
 */
function crossesLine(a: Point, b: Point, p: Point): boolean {
  if (a.y > p.y === b.y > p.y) return false;
  const x = a.x + ((p.y - a.y) / (b.y - a.y)) * (b.x - a.x);
  return x > p.x;
}

/**
 * The same test on a y-monotone piece of circle between angles t0 < t1 (no interior extremum of
 * sin t): the crossing lies on the right half (x = cx + √(r² − (p.y − cy)²)) or the left half.
 * Exact on the true arc: no polygonal approximation.
 */
function crossesArcPiece(s: ArcSegment, t0: number, t1: number, y0: number, y1: number, p: Point): boolean {
  if (y0 > p.y === y1 > p.y) return false;
  const u = Math.min(1, Math.max(-1, (p.y - s.c.y) / s.r));
  const half = s.r * Math.sqrt(1 - u * u);
  const right = Math.cos((t0 + t1) / 2) > 0;
  return (right ? s.c.x + half : s.c.x - half) > p.x;
}

/**
 * Number of crossings of the ray from p towards +x with an arc, split at π/2 and 3π/2 (mod 2π).
 * y0, y1: heights of the arc's start and end as the loop's vertices have them.
 */
function arcCrossings(s: ArcSegment, p: Point, y0: number, y1: number): number {
  const lo = Math.min(s.start, s.start + s.sweep);
  const hi = Math.max(s.start, s.start + s.sweep);
  // Angles where y is extremal: π/2 + kπ strictly inside (lo, hi).
  const cuts: number[] = [];
  for (let t = Math.PI / 2 + Math.PI * Math.ceil((lo - Math.PI / 2) / Math.PI); t < hi; t += Math.PI)
    if (t > lo) cuts.push(t);
  const yLo = s.sweep >= 0 ? y0 : y1;
  const yHi = s.sweep >= 0 ? y1 : y0;
  const ts = [lo, ...cuts, hi];
  let n = 0;
  for (let i = 0; i + 1 < ts.length; i++) {
    const t0 = ts[i]!;
    const t1 = ts[i + 1]!;
    const ya = i === 0 ? yLo : s.c.y + s.r * Math.sin(t0);
    const yb = i + 2 === ts.length ? yHi : s.c.y + s.r * Math.sin(t1);
    if (crossesArcPiece(s, t0, t1, ya, yb, p)) n++;
  }
  return n;
}

/** Chord tolerance for curves in containment tests: 1e-7 of the loop's size. */
function curveTolerance(loop: Loop): number {
  const b = loopBox(loop);
  return 1e-7 * Math.max(b.xmax - b.xmin, b.ymax - b.ymin);
}

/** Crossings with an elliptical arc or spline, by its chords (fine enough for loops that do not touch). */
function curveCrossings(seg: Segment, p: Point, y0: number, y1: number, tol: number): number {
  const pts = flattenSegment(seg, tol);
  pts[0] = { x: pts[0]!.x, y: y0 };
  pts[pts.length - 1] = { x: pts[pts.length - 1]!.x, y: y1 };
  let n = 0;
  for (let i = 0; i + 1 < pts.length; i++) if (crossesLine(pts[i]!, pts[i + 1]!, p)) n++;
  return n;
}

/**
 * Point-in-loop by the parity of crossings of a horizontal ray (half-open rule, exact for arcs).
 * Each vertex is given one height, the start of the segment leaving it, on both of its sides: a
 * computed arc end can differ from the next start by an ulp (sin 2π ≠ 0 leaves a full circle's end
 * 6e-15·r below its start), and a ray passing between the two would miss the loop.
 * Points on the boundary may go either way.
 */
export function pointInLoop(p: Point, loop: Loop): boolean {
  return inside(p, loop, vertexHeights(loop));
}

/** Height of each vertex: that of the start of the segment leaving it. */
const vertexHeights = (loop: Loop): Float64Array => Float64Array.from(loop, (s) => startPoint(s).y);

function inside(p: Point, loop: Loop, ys: Float64Array): boolean {
  let n = 0;
  let tol = 0;
  for (let i = 0; i < loop.length; i++) {
    const s = loop[i]!;
    const y0 = ys[i]!;
    const y1 = ys[(i + 1) % loop.length]!;
    if (s.kind === 'arc') n += arcCrossings(s, p, y0, y1);
    else if (s.kind === 'line') n += y0 > p.y !== y1 > p.y && crossesLine({ x: s.a.x, y: y0 }, { x: s.b.x, y: y1 }, p) ? 1 : 0;
    else n += curveCrossings(s, p, y0, y1, tol || (tol = curveTolerance(loop)));
  }
  return n % 2 === 1;
}

/** A point on the loop away from its vertices: the middle of its longest segment's chord or arc. */
function samplePoint(loop: Loop): Point {
  let best: Segment = loop[0]!;
  let bestLen = -1;
  for (const s of loop) {
    const len = segmentLength(s);
    if (len > bestLen) {
      best = s;
      bestLen = len;
    }
  }
  const [t0, t1] = paramRange(best);
  return evalSegment(best, (t0 + t1) / 2).p;
}

const boxInside = (inner: Box, outer: Box): boolean =>
  inner.xmin >= outer.xmin && inner.xmax <= outer.xmax && inner.ymin >= outer.ymin && inner.ymax <= outer.ymax;

/**
 * Builds a region from closed, mutually non-crossing loops given in any order and orientation.
 * A loop's depth is the number of loops containing it: even depth starts a part (its outer
 * loop), odd depth is a hole of its smallest container. So a loop inside a hole is an island,
 * a new part. Containment is tested on one point of the inner loop; loops that cross each other
 * are not detected here (resolving overlaps belongs to clipping). Orientation is fixed by makeRegion.
 */
export function nestLoops(loops: readonly Loop[]): Region {
  const info = loops.map((loop) => ({
    loop,
    box: loopBox(loop),
    area: Math.abs(signedLoopArea(loop)),
    p: samplePoint(loop),
    ys: vertexHeights(loop),
  }));
  // Parent candidates of i: larger loops whose box holds i's box and that contain i's sample point.
  // A box holding another overlaps it: only overlapping pairs are tested (a sweep, not all n² pairs).
  const containers: number[][] = info.map(() => []);
  const holds = (j: number, i: number) => info[j]!.area > info[i]!.area && boxInside(info[i]!.box, info[j]!.box) && inside(info[i]!.p, info[j]!.loop, info[j]!.ys);
  overlappingBoxes(
    info.map((a) => a.box),
    0,
    (i, j) => {
      if (holds(j, i)) containers[i]!.push(j);
      else if (holds(i, j)) containers[j]!.push(i);
    },
  );
  const depth = containers.map((c) => c.length);
  const parts = new Map<number, { outer: Loop; holes: Loop[] }>();
  info.forEach((a, i) => {
    if (depth[i]! % 2 === 0) parts.set(i, { outer: a.loop, holes: [] });
  });
  info.forEach((a, i) => {
    if (depth[i]! % 2 === 0) return;
    // Smallest container: the one of depth d − 1 (an even-depth loop, an outer).
    const parent = containers[i]!.reduce((best, j) => (info[j]!.area < info[best]!.area ? j : best));
    const part = parts.get(parent);
    // Only loops that cross each other can make the smallest container a hole itself.
    if (!part) throw new GeometryError('DEGENERATE_LOOP', `loops overlap near (${a.p.x}, ${a.p.y}): nesting is ambiguous`);
    part.holes.push(a.loop);
  });
  return makeRegion([...parts.values()]);
}
