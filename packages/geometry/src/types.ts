/** A point in drawing coordinates. */
export interface Point {
  readonly x: number;
  readonly y: number;
}

/** Straight segment from `a` to `b`. */
export interface LineSegment {
  readonly kind: 'line';
  readonly a: Point;
  readonly b: Point;
}

/**
 * Circular arc about centre `c` with radius `r`, starting at angle `start` (radians from +x)
 * and turning through the signed angle `sweep` (positive counter-clockwise, |sweep| ≤ 2π).
 * A full circle is one arc with |sweep| = 2π.
 */
export interface ArcSegment {
  readonly kind: 'arc';
  readonly c: Point;
  readonly r: number;
  readonly start: number;
  readonly sweep: number;
}

/**
 * Elliptical arc p(t) = c + u·cos t + v·sin t for t from `start` through the signed `sweep`
 * (|sweep| ≤ 2π). u and v are conjugate semi-diameters (perpendicular for an ellipse drawn with its
 * axes; any non-parallel pair for the affine image of a circle, e.g. a block inserted with unequal
 * scales). The arc turns counter-clockwise when sweep·det[u v] > 0.
 */
export interface EllipseSegment {
  readonly kind: 'ellipse';
  readonly c: Point;
  readonly u: Point;
  readonly v: Point;
  readonly start: number;
  readonly sweep: number;
}

/** A control point of a rational B-spline with its weight (1 for a non-rational spline). */
export interface WeightedPoint {
  readonly x: number;
  readonly y: number;
  readonly w: number;
}

/**
 * NURBS curve of the given degree over a clamped or unclamped knot vector, traversed from
 * knots[degree] to knots[controls.length]: knots.length = controls.length + degree + 1.
 */
export interface SplineSegment {
  readonly kind: 'spline';
  readonly degree: number;
  readonly knots: readonly number[];
  readonly controls: readonly WeightedPoint[];
}

export type Segment = LineSegment | ArcSegment | EllipseSegment | SplineSegment;

/** A closed chain of segments: each segment ends where the next begins, the last ends at the first's start. */
export type Loop = readonly Segment[];

/** One solid piece: an outer loop (counter-clockwise) and any number of holes (clockwise). */
export interface Part {
  readonly outer: Loop;
  readonly holes: readonly Loop[];
}

/** A cross-section: one or more disjoint parts. Built by `makeRegion`, which fixes orientation. */
export interface Region {
  readonly parts: readonly Part[];
}
