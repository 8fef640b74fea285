import { GeometryError } from './errors';
import type { Point, SplineSegment, WeightedPoint } from './types';

/** Parameter interval of the curve: [knots[p], knots[n]] with n control points, degree p. */
export function splineDomain(s: SplineSegment): [number, number] {
  return [s.knots[s.degree]!, s.knots[s.controls.length]!];
}

/** Breakpoints: the distinct knots inside the domain, ends included (polynomial between them). */
export function splineBreaks(s: SplineSegment): number[] {
  const [a, b] = splineDomain(s);
  const out = [a];
  for (let i = s.degree + 1; i < s.controls.length; i++) {
    const k = s.knots[i]!;
    if (k > out[out.length - 1]! && k < b) out.push(k);
  }
  out.push(b);
  return out;
}

function findSpan(s: SplineSegment, t: number): number {
  const p = s.degree;
  const n = s.controls.length - 1;
  if (t >= s.knots[n + 1]!) {
    let k = n;
    while (k > p && s.knots[k]! >= s.knots[n + 1]!) k--;
    return k;
  }
  let lo = p;
  let hi = n + 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (t < s.knots[mid]!) hi = mid;
    else lo = mid;
  }
  return lo;
}

/** Scratch rows reused across evaluations (degree ≤ 25): evaluation runs in tight loops. */
const MAXP = 26;
const left = new Float64Array(MAXP);
const right = new Float64Array(MAXP);
const ndu: Float64Array[] = Array.from({ length: MAXP }, () => new Float64Array(MAXP));
const N = new Float64Array(MAXP);
const dN = new Float64Array(MAXP);

/**
 * Basis functions and their first derivatives at t on the given span, into N and dN — The NURBS
 * Book (Piegl & Tiller, 2nd ed.), algorithm A2.3 for k = 1.
 */
function basis(s: SplineSegment, span: number, t: number): void {
  const p = s.degree;
  const U = s.knots;
  ndu[0]![0] = 1;
  for (let j = 1; j <= p; j++) {
    left[j] = t - U[span + 1 - j]!;
    right[j] = U[span + j]! - t;
    let saved = 0;
    for (let r = 0; r < j; r++) {
      ndu[j]![r] = right[r + 1]! + left[j - r]!;
      const temp = ndu[r]![j - 1]! / ndu[j]![r]!;
      ndu[r]![j] = saved + right[r + 1]! * temp;
      saved = left[j - r]! * temp;
    }
    ndu[j]![j] = saved;
  }
  for (let j = 0; j <= p; j++) N[j] = ndu[j]![p]!;
  for (let r = 0; r <= p; r++) {
    let d = 0;
    if (r >= 1) d += ndu[r - 1]![p - 1]! / ndu[p]![r - 1]!;
    if (r <= p - 1) d -= ndu[r]![p - 1]! / ndu[p]![r]!;
    dN[r] = p * d;
  }
}

/** Point and first derivative of the (rational) curve at t: p = A/w, p' = (A' − p·w')/w. */
export function splineEval(s: SplineSegment, t: number): { p: Point; d: Point } {
  const p = s.degree;
  const span = findSpan(s, t);
  basis(s, span, t);
  let ax = 0;
  let ay = 0;
  let aw = 0;
  let dx = 0;
  let dy = 0;
  let dw = 0;
  for (let j = 0; j <= p; j++) {
    const c = s.controls[span - p + j]!;
    const nw = N[j]! * c.w;
    const dw1 = dN[j]! * c.w;
    ax += nw * c.x;
    ay += nw * c.y;
    aw += nw;
    dx += dw1 * c.x;
    dy += dw1 * c.y;
    dw += dw1;
  }
  const x = ax / aw;
  const y = ay / aw;
  return { p: { x, y }, d: { x: (dx - x * dw) / aw, y: (dy - y * dw) / aw } };
}

export function isRational(s: SplineSegment): boolean {
  const w0 = s.controls[0]!.w;
  return s.controls.some((c) => c.w !== w0);
}

export function reverseSpline(s: SplineSegment): SplineSegment {
  const last = s.knots[s.knots.length - 1]!;
  const first = s.knots[0]!;
  return {
    ...s,
    knots: s.knots.map((k) => first + last - k).reverse(),
    controls: [...s.controls].reverse(),
  };
}

/** NURBS are invariant under affine maps applied to their control points (The NURBS Book, §4.2). */
export function mapSpline(s: SplineSegment, f: (p: Point) => Point): SplineSegment {
  return { ...s, controls: s.controls.map((c): WeightedPoint => ({ ...f(c), w: c.w })) };
}

export function checkSpline(s: SplineSegment): void {
  const { degree: p, knots, controls } = s;
  if (!Number.isInteger(p) || p < 1 || p > 25) throw new GeometryError('INVALID_SEGMENT', `spline degree ${p} is not supported`);
  if (controls.length < p + 1)
    throw new GeometryError('INVALID_SEGMENT', `spline of degree ${p} needs ${p + 1} control points, has ${controls.length}`);
  if (knots.length !== controls.length + p + 1)
    throw new GeometryError(
      'INVALID_SEGMENT',
      `spline has ${knots.length} knots; ${controls.length} control points of degree ${p} need ${controls.length + p + 1}`,
    );
  for (let i = 1; i < knots.length; i++)
    if (!(knots[i]! >= knots[i - 1]!)) throw new GeometryError('INVALID_SEGMENT', 'spline knots decrease');
  if (!(knots[controls.length]! > knots[p]!)) throw new GeometryError('INVALID_SEGMENT', 'spline has an empty parameter range');
  for (const c of controls) {
    if (![c.x, c.y, c.w].every(Number.isFinite)) throw new GeometryError('NON_FINITE', 'spline has a non-finite control point');
    if (!(c.w > 0)) throw new GeometryError('INVALID_SEGMENT', `spline weight ${c.w} is not positive`);
  }
}
