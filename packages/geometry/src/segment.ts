import { GeometryError } from './errors';
import { integrateAdaptive } from './quadrature';
import { checkSpline, mapSpline, reverseSpline, splineBreaks, splineDomain, splineEval } from './spline';
import type { ArcSegment, EllipseSegment, LineSegment, Point, Segment } from './types';

export const TAU = 2 * Math.PI;

export function line(a: Point, b: Point): LineSegment {
  return { kind: 'line', a, b };
}

export function arc(c: Point, r: number, start: number, sweep: number): ArcSegment {
  return { kind: 'arc', c, r, start, sweep };
}

export function ellipse(c: Point, u: Point, v: Point, start: number, sweep: number): EllipseSegment {
  return { kind: 'ellipse', c, u, v, start, sweep };
}

/** Arc from its centre, start point and signed sweep (radius and start angle derived). */
export function arcFromCentre(c: Point, from: Point, sweep: number): ArcSegment {
  return arc(c, Math.hypot(from.x - c.x, from.y - c.y), Math.atan2(from.y - c.y, from.x - c.x), sweep);
}

export function pointOnArc(s: ArcSegment, angle: number): Point {
  return { x: s.c.x + s.r * Math.cos(angle), y: s.c.y + s.r * Math.sin(angle) };
}

export function pointOnEllipse(s: EllipseSegment, t: number): Point {
  const c = Math.cos(t);
  const n = Math.sin(t);
  return { x: s.c.x + s.u.x * c + s.v.x * n, y: s.c.y + s.u.y * c + s.v.y * n };
}

/** Parameter interval traversed by the segment, in the direction of travel. */
export function paramRange(s: Segment): [number, number] {
  switch (s.kind) {
    case 'line':
      return [0, 1];
    case 'arc':
    case 'ellipse':
      return [s.start, s.start + s.sweep];
    case 'spline':
      return splineDomain(s);
  }
}

/** Point and derivative with respect to the segment's own parameter. */
export function evalSegment(s: Segment, t: number): { p: Point; d: Point } {
  switch (s.kind) {
    case 'line':
      return { p: { x: s.a.x + t * (s.b.x - s.a.x), y: s.a.y + t * (s.b.y - s.a.y) }, d: { x: s.b.x - s.a.x, y: s.b.y - s.a.y } };
    case 'arc':
      return { p: pointOnArc(s, t), d: { x: -s.r * Math.sin(t), y: s.r * Math.cos(t) } };
    case 'ellipse': {
      const c = Math.cos(t);
      const n = Math.sin(t);
      return { p: pointOnEllipse(s, t), d: { x: -s.u.x * n + s.v.x * c, y: -s.u.y * n + s.v.y * c } };
    }
    case 'spline':
      return splineEval(s, t);
  }
}

/**
 * Parameter values splitting the segment into pieces on which it is smooth (polynomial for
 * splines), in the direction of travel. Quadrature and root searches work piece by piece.
 */
export function smoothBreaks(s: Segment): number[] {
  if (s.kind === 'spline') return splineBreaks(s);
  const [a, b] = paramRange(s);
  if (s.kind === 'line') return [a, b];
  // Quarter turns keep trigonometric integrands well resolved by one 16-point rule each.
  const n = Math.max(1, Math.ceil(Math.abs(b - a) / (Math.PI / 4)));
  return Array.from({ length: n + 1 }, (_, i) => (i === n ? b : a + ((b - a) * i) / n));
}

export function startPoint(s: Segment): Point {
  if (s.kind === 'line') return s.a;
  return evalSegment(s, paramRange(s)[0]).p;
}

export function endPoint(s: Segment): Point {
  if (s.kind === 'line') return s.b;
  return evalSegment(s, paramRange(s)[1]).p;
}

export function segmentLength(s: Segment): number {
  if (s.kind === 'line') return Math.hypot(s.b.x - s.a.x, s.b.y - s.a.y);
  if (s.kind === 'arc') return s.r * Math.abs(s.sweep);
  // Elliptic and spline arc length have no elementary closed form: adaptive quadrature of |p'(t)|.
  const br = smoothBreaks(s);
  const size = Math.hypot(...boundingSize(s));
  let sum = 0;
  for (let i = 0; i + 1 < br.length; i++) {
    const r = integrateAdaptive((t, out) => {
      const { d } = evalSegment(s, t);
      out[0] = Math.hypot(d.x, d.y);
    }, br[i]!, br[i + 1]!, 1, [size * 1e-3]);
    sum += Math.abs(r[0]!);
  }
  return sum;
}

function boundingSize(s: Segment): [number, number] {
  const a = startPoint(s);
  const b = endPoint(s);
  if (s.kind === 'ellipse') return [Math.hypot(s.u.x, s.u.y), Math.hypot(s.v.x, s.v.y)];
  if (s.kind === 'spline') {
    // A loop, not Math.max(...xs): spreading 120,000 control points overflows the call stack.
    let [x0, x1, y0, y1] = [Infinity, -Infinity, Infinity, -Infinity];
    for (const c of s.controls) [x0, x1, y0, y1] = [Math.min(x0, c.x), Math.max(x1, c.x), Math.min(y0, c.y), Math.max(y1, c.y)];
    return [x1 - x0, y1 - y0];
  }
  return [Math.abs(b.x - a.x), Math.abs(b.y - a.y)];
}

export function reverseSegment(s: Segment): Segment {
  switch (s.kind) {
    case 'line':
      return line(s.b, s.a);
    case 'arc':
      return arc(s.c, s.r, s.start + s.sweep, -s.sweep);
    case 'ellipse':
      return ellipse(s.c, s.u, s.v, s.start + s.sweep, -s.sweep);
    case 'spline':
      return reverseSpline(s);
  }
}

/** Whether `angle` lies on the swept parameter range of an arc or elliptical arc (ends included). */
export function arcContainsAngle(s: { start: number; sweep: number }, angle: number): boolean {
  const d = s.sweep >= 0 ? angle - s.start : s.start - angle;
  const m = ((d % TAU) + TAU) % TAU;
  return m <= Math.abs(s.sweep) + 1e-15;
}

/** Affine map x' = M·x + t, M = [[a, b], [c, d]] (rotation, mirror, scale — uniform or not, shear). */
export interface Affine {
  readonly a: number;
  readonly b: number;
  readonly c: number;
  readonly d: number;
  readonly tx: number;
  readonly ty: number;
}

export function applyToPoint(t: Affine, p: Point): Point {
  return { x: t.a * p.x + t.b * p.y + t.tx, y: t.c * p.x + t.d * p.y + t.ty };
}

const applyToVector = (t: Affine, p: Point): Point => ({ x: t.a * p.x + t.b * p.y, y: t.c * p.x + t.d * p.y });

/**
 * Maps a segment through an affine map, exactly: a circular arc stays one under a similarity
 * (a mirror reverses its sweep) and becomes an elliptical arc otherwise; splines map their control points.
 */
export function transformSegment(t: Affine, s: Segment): Segment {
  switch (s.kind) {
    case 'line':
      return line(applyToPoint(t, s.a), applyToPoint(t, s.b));
    case 'ellipse':
      return ellipse(applyToPoint(t, s.c), applyToVector(t, s.u), applyToVector(t, s.v), s.start, s.sweep);
    case 'spline':
      return mapSpline(s, (p) => applyToPoint(t, p));
    case 'arc': {
      const det = t.a * t.d - t.b * t.c;
      if (!(det !== 0)) throw new GeometryError('INVALID_SEGMENT', 'transform collapses an arc');
      const similar = Math.abs(t.a - t.d * Math.sign(det)) + Math.abs(t.b + t.c * Math.sign(det)) <= 1e-14 * Math.hypot(t.a, t.b);
      if (!similar) {
        // The affine image of a circle: conjugate semi-diameters M·(r, 0) and M·(0, r).
        const u = applyToVector(t, { x: s.r, y: 0 });
        const v = applyToVector(t, { x: 0, y: s.r });
        return ellipse(applyToPoint(t, s.c), u, v, s.start, s.sweep);
      }
      const c = applyToPoint(t, s.c);
      const q = applyToPoint(t, pointOnArc(s, s.start));
      return arc(c, s.r * Math.sqrt(Math.abs(det)), Math.atan2(q.y - c.y, q.x - c.x), det < 0 ? -s.sweep : s.sweep);
    }
  }
}

export function checkSegment(s: Segment): void {
  if (s.kind === 'spline') return checkSpline(s);
  const nums =
    s.kind === 'line'
      ? [s.a.x, s.a.y, s.b.x, s.b.y]
      : s.kind === 'arc'
        ? [s.c.x, s.c.y, s.r, s.start, s.sweep]
        : [s.c.x, s.c.y, s.u.x, s.u.y, s.v.x, s.v.y, s.start, s.sweep];
  if (!nums.every(Number.isFinite)) throw new GeometryError('NON_FINITE', `${s.kind} has a non-finite coordinate`);
  if (s.kind === 'line') return;
  if (s.kind === 'arc' && !(s.r > 0)) throw new GeometryError('INVALID_SEGMENT', `arc radius ${s.r} is not positive`);
  if (s.kind === 'ellipse' && !(Math.abs(s.u.x * s.v.y - s.u.y * s.v.x) > 0))
    throw new GeometryError('INVALID_SEGMENT', 'ellipse axes are parallel or zero');
  if (s.sweep === 0 || Math.abs(s.sweep) > TAU * (1 + 1e-12))
    throw new GeometryError('INVALID_SEGMENT', `${s.kind} sweep ${s.sweep} rad is outside (0, 2π]`);
}
