import type { Point } from '@keelson/geometry';

export type ResolveErrorCode = 'SELF_INTERSECTION' | 'UNRESOLVED';

/** A region that cannot be resolved, with the place to look at in the drawing. */
export class ResolveError extends Error {
  override readonly name = 'ResolveError';
  constructor(
    readonly code: ResolveErrorCode,
    message: string,
    readonly at: Point,
  ) {
    super(message);
  }
}

export const fmt = (p: Point) => `(${+p.x.toPrecision(10)}, ${+p.y.toPrecision(10)})`;
