/** Stable codes for geometry faults; services map them to messages and HTTP problems. */
export type GeometryErrorCode =
  | 'EMPTY_REGION'
  | 'DEGENERATE_LOOP'
  | 'OPEN_LOOP'
  | 'NON_FINITE'
  | 'INVALID_SEGMENT';

export class GeometryError extends Error {
  override readonly name = 'GeometryError';
  constructor(
    readonly code: GeometryErrorCode,
    message: string,
  ) {
    super(message);
  }
}
