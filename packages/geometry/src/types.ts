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

export type Segment = LineSegment | ArcSegment;

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
