import { GeometryError } from './errors';
import type { ArcSegment, LineSegment, Point, Segment } from './types';

export const TAU = 2 * Math.PI;

export function line(a: Point, b: Point): LineSegment {
  return { kind: 'line', a, b };
}

export function arc(c: Point, r: number, start: number, sweep: number): ArcSegment {
  return { kind: 'arc', c, r, start, sweep };
}

/** Arc from its centre, start point and signed sweep (radius and start angle derived). */
export function arcFromCentre(c: Point, from: Point, sweep: number): ArcSegment {
  return arc(c, Math.hypot(from.x - c.x, from.y - c.y), Math.atan2(from.y - c.y, from.x - c.x), sweep);
}

export function pointOnArc(s: ArcSegment, angle: number): Point {
  return { x: s.c.x + s.r * Math.cos(angle), y: s.c.y + s.r * Math.sin(angle) };
}

export function startPoint(s: Segment): Point {
  return s.kind === 'line' ? s.a : pointOnArc(s, s.start);
}

export function endPoint(s: Segment): Point {
  return s.kind === 'line' ? s.b : pointOnArc(s, s.start + s.sweep);
}

export function segmentLength(s: Segment): number {
  return s.kind === 'line' ? Math.hypot(s.b.x - s.a.x, s.b.y - s.a.y) : s.r * Math.abs(s.sweep);
}

export function reverseSegment(s: Segment): Segment {
  return s.kind === 'line' ? line(s.b, s.a) : arc(s.c, s.r, s.start + s.sweep, -s.sweep);
}

/** Whether `angle` lies on the arc's sweep (inclusive of its ends). */
export function arcContainsAngle(s: ArcSegment, angle: number): boolean {
  const d = s.sweep >= 0 ? angle - s.start : s.start - angle;
  const m = ((d % TAU) + TAU) % TAU;
  return m <= Math.abs(s.sweep) + 1e-15;
}

/** Affine map x' = m·x + t with a 2×2 matrix whose determinant is ±s² (rotation, mirror, uniform scale). */
export interface Similarity {
  readonly a: number; // m11
  readonly b: number; // m12
  readonly c: number; // m21
  readonly d: number; // m22
  readonly tx: number;
  readonly ty: number;
}

export function applyToPoint(t: Similarity, p: Point): Point {
  return { x: t.a * p.x + t.b * p.y + t.tx, y: t.c * p.x + t.d * p.y + t.ty };
}

/** Maps a segment through a similarity; a mirroring map reverses arc sweeps, as it must. */
export function transformSegment(t: Similarity, s: Segment): Segment {
  if (s.kind === 'line') return line(applyToPoint(t, s.a), applyToPoint(t, s.b));
  const det = t.a * t.d - t.b * t.c;
  const scale = Math.sqrt(Math.abs(det));
  if (!(scale > 0)) throw new GeometryError('INVALID_SEGMENT', 'transform collapses an arc');
  const p = pointOnArc(s, s.start);
  const c = applyToPoint(t, s.c);
  const q = applyToPoint(t, p);
  return arc(c, s.r * scale, Math.atan2(q.y - c.y, q.x - c.x), det < 0 ? -s.sweep : s.sweep);
}

export function checkSegment(s: Segment): void {
  const nums = s.kind === 'line' ? [s.a.x, s.a.y, s.b.x, s.b.y] : [s.c.x, s.c.y, s.r, s.start, s.sweep];
  if (!nums.every(Number.isFinite)) throw new GeometryError('NON_FINITE', `${s.kind} has a non-finite coordinate`);
  if (s.kind === 'arc') {
    if (!(s.r > 0)) throw new GeometryError('INVALID_SEGMENT', `arc radius ${s.r} is not positive`);
    if (s.sweep === 0 || Math.abs(s.sweep) > TAU * (1 + 1e-12))
      throw new GeometryError('INVALID_SEGMENT', `arc sweep ${s.sweep} rad is outside (0, 2π]`);
  }
}
