import { arcContainsAngle, endPoint, pointOnArc, startPoint } from './segment';
import type { Loop, Point, Region, Segment } from './types';

export interface Box {
  xmin: number;
  xmax: number;
  ymin: number;
  ymax: number;
}

/**
 * Smallest and largest value of (p − o)·d over a segment, for a unit direction d = (dx, dy).
 * Exact on arcs: besides the ends, the arc's points at angles ψ and ψ + π (ψ the angle of d) count when swept.
 */
export function segmentRange(s: Segment, dx: number, dy: number, o: Point): [number, number] {
  const psi = Math.atan2(dy, dx);
  const proj = (p: Point) => (p.x - o.x) * dx + (p.y - o.y) * dy;
  const p0 = proj(startPoint(s));
  const p1 = proj(endPoint(s));
  let lo = Math.min(p0, p1);
  let hi = Math.max(p0, p1);
  if (s.kind === 'arc') {
    if (arcContainsAngle(s, psi)) hi = Math.max(hi, proj(pointOnArc(s, psi)));
    if (arcContainsAngle(s, psi + Math.PI)) lo = Math.min(lo, proj(pointOnArc(s, psi + Math.PI)));
  }
  return [lo, hi];
}

/** Range of (p − o)·d over the whole boundary: distances from o to the extreme fibres along d. */
export function regionRange(region: Region, dx: number, dy: number, o: Point = { x: 0, y: 0 }): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const part of region.parts)
    for (const s of part.outer) {
      const [a, b] = segmentRange(s, dx, dy, o);
      if (a < lo) lo = a;
      if (b > hi) hi = b;
    }
  return [lo, hi];
}

export function loopBox(loop: Loop): Box {
  const o = { x: 0, y: 0 };
  const box: Box = { xmin: Infinity, xmax: -Infinity, ymin: Infinity, ymax: -Infinity };
  for (const s of loop) {
    const [x0, x1] = segmentRange(s, 1, 0, o);
    const [y0, y1] = segmentRange(s, 0, 1, o);
    box.xmin = Math.min(box.xmin, x0);
    box.xmax = Math.max(box.xmax, x1);
    box.ymin = Math.min(box.ymin, y0);
    box.ymax = Math.max(box.ymax, y1);
  }
  return box;
}

export function regionBox(region: Region): Box {
  const boxes = region.parts.map((p) => loopBox(p.outer));
  return {
    xmin: Math.min(...boxes.map((b) => b.xmin)),
    xmax: Math.max(...boxes.map((b) => b.xmax)),
    ymin: Math.min(...boxes.map((b) => b.ymin)),
    ymax: Math.max(...boxes.map((b) => b.ymax)),
  };
}
