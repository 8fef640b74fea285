import { fileSystemCause } from '@keelson/archive';

/** A catalogue, manifest or stored run the user named that cannot be used: exit 2 / HTTP 4xx. */
export type SourceErrorCode = 'UNREADABLE_INPUT' | 'NO_MANIFEST' | 'NO_DRAWINGS' | 'RUN_NOT_FOUND';

export class SourceError extends Error {
  override readonly name = 'SourceError';
  constructor(
    readonly code: SourceErrorCode,
    readonly file: string,
    readonly detail: string,
  ) {
    super(`${file}: ${detail}`);
  }
}

/** File-system errors as one-line causes; anything else stays an internal fault. */
export function fsFault(file: string, e: unknown): unknown {
  const cause = fileSystemCause(e);
  return cause ? new SourceError('UNREADABLE_INPUT', file, cause) : e;
}
