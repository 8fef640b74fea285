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

const FS_CAUSES: Record<string, string> = {
  ENOENT: 'no such file or folder',
  EACCES: 'permission denied',
  EPERM: 'permission denied',
  EISDIR: 'is a folder',
  ENOTDIR: 'not a folder',
  ELOOP: 'too many symbolic links',
};

/** File-system errors as one-line causes; anything else stays an internal fault. */
export function fsFault(file: string, e: unknown): unknown {
  const code = (e as { code?: string }).code;
  return code && FS_CAUSES[code] ? new SourceError('UNREADABLE_INPUT', file, FS_CAUSES[code]) : e;
}
