/** Stable codes for torsion faults; services map them to messages and HTTP problems. */
export type TorsionErrorCode = 'MESH_FAILED' | 'SOLVER_FAILED' | 'INVALID_OPTION';

export class TorsionError extends Error {
  override readonly name = 'TorsionError';
  constructor(
    readonly code: TorsionErrorCode,
    message: string,
  ) {
    super(message);
  }
}
