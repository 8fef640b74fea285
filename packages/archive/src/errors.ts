export type ArchiveErrorCode = 'NOT_ZIP' | 'TOO_MANY_ENTRIES' | 'TOO_LARGE' | 'CORRUPT';

/** The archive as a whole cannot be read; problems with single entries are reported per entry. */
export class ArchiveError extends Error {
  override readonly name = 'ArchiveError';
  constructor(
    readonly code: ArchiveErrorCode,
    message: string,
  ) {
    super(message);
  }
}
