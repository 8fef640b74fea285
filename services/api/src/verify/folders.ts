import { realpath } from 'node:fs/promises';
import { delimiter, isAbsolute, relative, resolve } from 'node:path';

/**
 * Server folders an admin allows catalogues to be registered from: `KEELSON_CATALOGUE_FOLDERS`, a
 * list of absolute paths separated like PATH. None by default: clients then upload ZIPs.
 */
export function allowedFolders(env: NodeJS.ProcessEnv = process.env): string[] {
  return (env.KEELSON_CATALOGUE_FOLDERS ?? '')
    .split(delimiter)
    .map((p) => p.trim())
    .filter(Boolean)
    .map((p) => resolve(p));
}

/**
 * The folder's real path when it lies inside an allowed folder (symbolic links resolved first, so a
 * link cannot lead out), else null.
 */
export async function allowedFolder(path: string, allowed: readonly string[]): Promise<string | null> {
  if (!isAbsolute(path)) return null;
  const real = await realpath(path).catch(() => null);
  if (!real) return null;
  for (const root of allowed) {
    const r = await realpath(root).catch(() => null);
    const rel = r === null ? '..' : relative(r, real);
    if (rel === '' || (!rel.startsWith('..') && !isAbsolute(rel))) return real;
  }
  return null;
}
