const CAUSES: Record<string, string> = {
  ENOENT: 'no such file or folder',
  EACCES: 'permission denied',
  EPERM: 'permission denied',
  EISDIR: 'is a folder',
  ENOTDIR: 'not a folder',
  ELOOP: 'too many symbolic links',
};

/**
 * Why a catalogue, folder or drawing could not be opened, as a short cause for a one-line message,
 * or null when the error is not one of the file system's ordinary refusals (then it is a fault).
 */
export function fileSystemCause(e: unknown): string | null {
  const code = (e as { code?: unknown } | null)?.code;
  return typeof code === 'string' ? (CAUSES[code] ?? null) : null;
}
