import { arcContainsAngle, endPoint, evalSegment, pointOnArc, pointOnEllipse, smoothBreaks, startPoint } from './segment';
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
  const p0 = project(startPoint(s), dx, dy, o);
  const p1 = project(endPoint(s), dx, dy, o);
  let lo = Math.min(p0, p1);
  let hi = Math.max(p0, p1);
  if (s.kind === 'arc') {
    const psi = Math.atan2(dy, dx);
    if (arcContainsAngle(s, psi)) hi = Math.max(hi, project(pointOnArc(s, psi), dx, dy, o));
    if (arcContainsAngle(s, psi + Math.PI)) lo = Math.min(lo, project(pointOnArc(s, psi + Math.PI), dx, dy, o));
  } else if (s.kind === 'ellipse') {
    // (p − o)·d = const + (u·d) cos t + (v·d) sin t is extreme at t = atan2(v·d, u·d) and that + π.
    const t = Math.atan2(s.v.x * dx + s.v.y * dy, s.u.x * dx + s.u.y * dy);
    if (arcContainsAngle(s, t)) hi = Math.max(hi, project(pointOnEllipse(s, t), dx, dy, o));
    if (arcContainsAngle(s, t + Math.PI)) lo = Math.min(lo, project(pointOnEllipse(s, t + Math.PI), dx, dy, o));
  } else if (s.kind === 'spline') {
    [lo, hi] = splineRange(s, (p) => project(p, dx, dy, o), lo, hi);
  }
  return [lo, hi];
}

/** (p − o)·d. A module-level function: a closure made on every call costs more than the sum. */
function project(p: Point, dx: number, dy: number, o: Point): number {
  return (p.x - o.x) * dx + (p.y - o.y) * dy;
}

/**
 * Extremes of a projection over a spline: sampled on each knot span, each local extreme then
 * refined by golden-section search to the parameter's rounding, so the extreme value is exact to
 * rounding (it is stationary there).
 */
function splineRange(s: Segment, proj: (p: Point) => number, lo: number, hi: number): [number, number] {
  const f = (t: number) => proj(evalSegment(s, t).p);
  // One run of samples over all knot spans, so an extreme next to a knot is bracketed too.
  const br = smoothBreaks(s);
  const N = 32;
  const ts: number[] = [br[0]!];
  for (let i = 0; i + 1 < br.length; i++)
    for (let k = 1; k <= N; k++) ts.push(k === N ? br[i + 1]! : br[i]! + ((br[i + 1]! - br[i]!) * k) / N);
  const vs = ts.map(f);
  for (const v of vs) {
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  for (let k = 1; k + 1 < ts.length; k++) {
    const v = vs[k]!;
    if (v >= vs[k - 1]! && v >= vs[k + 1]!) hi = Math.max(hi, golden(f, ts[k - 1]!, ts[k + 1]!, 1));
    if (v <= vs[k - 1]! && v <= vs[k + 1]!) lo = Math.min(lo, golden(f, ts[k - 1]!, ts[k + 1]!, -1));
  }
  return [lo, hi];
}

/** Largest (sign 1) or smallest (sign −1) value of f on [a, b] by golden-section search. */
function golden(f: (t: number) => number, a: number, b: number, sign: number): number {
  const g = (Math.sqrt(5) - 1) / 2;
  let x1 = b - g * (b - a);
  let x2 = a + g * (b - a);
  let f1 = sign * f(x1);
  let f2 = sign * f(x2);
  for (let i = 0; i < 80 && b - a > 0; i++) {
    if (f1 > f2) {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - g * (b - a);
      f1 = sign * f(x1);
    } else {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + g * (b - a);
      f2 = sign * f(x2);
    }
  }
  return sign * Math.max(f1, f2, sign * f(a), sign * f(b));
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
  // A loop, not Math.min(...boxes): spreading 120,000 parts overflows the call stack.
  const box = { xmin: Infinity, xmax: -Infinity, ymin: Infinity, ymax: -Infinity };
  for (const p of region.parts) {
    const b = loopBox(p.outer);
    box.xmin = Math.min(box.xmin, b.xmin);
    box.xmax = Math.max(box.xmax, b.xmax);
    box.ymin = Math.min(box.ymin, b.ymin);
    box.ymax = Math.max(box.ymax, b.ymax);
  }
  return box;
}
