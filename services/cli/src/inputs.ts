import { readFile, readdir, stat } from 'node:fs/promises';
import { basename, extname, join } from 'node:path';
import { DEFAULT_MAX_BYTES, DxfError } from '@keelson/dxf';

/** A file or folder the user named that cannot be read: exit 2, "keelson: <file>: <detail>". */
export class InputError extends Error {
  override readonly name = 'InputError';
  constructor(
    readonly file: string,
    readonly detail: string,
  ) {
    super(`${file}: ${detail}`);
  }
}

export interface Input {
  /** Profile name: the file's base name without extension. */
  readonly name: string;
  /** Path as the user gave it (joined to the folder for folder entries). */
  readonly source: string;
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
function fsFault(file: string, e: unknown): unknown {
  const code = (e as { code?: string }).code;
  return code && FS_CAUSES[code] ? new InputError(file, FS_CAUSES[code]) : e;
}

const profileName = (file: string) => basename(file, extname(file));

/** One DXF file, or every `*.dxf` of a folder (not its subfolders) in name order. */
export async function listInputs(target: string): Promise<Input[]> {
  const s = await stat(target).catch((e: unknown) => Promise.reject(fsFault(target, e)));
  if (s.isDirectory()) {
    const names = (await readdir(target).catch((e: unknown) => Promise.reject(fsFault(target, e))))
      .filter((n) => /\.dxf$/i.test(n))
      .sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
    if (!names.length) throw new InputError(target, 'no .dxf files in this folder');
    return names.map((n) => ({ name: profileName(n), source: join(target, n) }));
  }
  if (/\.zip$/i.test(target)) throw new InputError(target, 'ZIP catalogues are not read yet: unpack it and pass the folder');
  return [{ name: profileName(target), source: target }];
}

/** The file's text: UTF-8, or Latin-1 for older drawings in an ANSI code page. Refuses files over the cap unread. */
export async function readText(file: string, maxBytes = DEFAULT_MAX_BYTES): Promise<string> {
  const s = await stat(file).catch((e: unknown) => Promise.reject(fsFault(file, e)));
  if (s.isDirectory()) throw new InputError(file, 'is a folder');
  if (s.size > maxBytes)
    throw new DxfError('TOO_LARGE', file, `file is ${(s.size / 2 ** 20).toFixed(1)} MiB, over the ${maxBytes / 2 ** 20} MiB limit`);
  const bytes = await readFile(file).catch((e: unknown) => Promise.reject(fsFault(file, e)));
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    return new TextDecoder('latin1').decode(bytes);
  }
}
