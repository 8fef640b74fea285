import { readFile, readdir, stat } from 'node:fs/promises';
import { basename, extname, join } from 'node:path';
import { ArchiveError, DEFAULT_ZIP_LIMITS, fileSystemCause, readZipCatalogue } from '@keelson/archive';
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
  /** Path as the user gave it (joined to the folder for folder entries; "<archive>:<entry>" inside a ZIP). */
  readonly source: string;
  /** The drawing's text; rejects with an InputError or DxfError when it cannot be had. */
  readonly text: () => Promise<string>;
}

/** File-system errors as one-line causes; anything else stays an internal fault. */
function fsFault(file: string, e: unknown): unknown {
  const cause = fileSystemCause(e);
  return cause ? new InputError(file, cause) : e;
}

const profileName = (file: string) => basename(file.replace(/\\/g, '/'), extname(file));

const byName = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);

/**
 * Every drawing of a ZIP catalogue, each on its own: an entry that cannot be had (bad name, nested
 * archive, over the size cap, corrupt) fails alone when its text is asked for. The archive as a
 * whole fails only when it is not a ZIP or passes the entry-count or total-size caps.
 */
async function zipInputs(target: string): Promise<Input[]> {
  const buf = await readFile(target).catch((e: unknown) => Promise.reject(fsFault(target, e)));
  let catalogue;
  try {
    catalogue = await readZipCatalogue(buf, { ...DEFAULT_ZIP_LIMITS, maxEntryBytes: DEFAULT_MAX_BYTES });
  } catch (e) {
    if (e instanceof ArchiveError) throw new InputError(target, e.message);
    throw e;
  }
  const drawings = [...catalogue.drawings].sort((a, b) => byName(a.name, b.name));
  if (!drawings.length) throw new InputError(target, 'no .dxf entries in this archive');
  return drawings.map((d) => {
    const source = `${target}:${d.name}`;
    const text = 'error' in d ? () => Promise.reject(new InputError(source, d.error)) : () => Promise.resolve(decode(d.data));
    return { name: profileName(d.name), source, text };
  });
}

/** One DXF file, every `*.dxf` of a folder (not its subfolders) in name order, or every DXF of a ZIP catalogue. */
export async function listInputs(target: string): Promise<Input[]> {
  const s = await stat(target).catch((e: unknown) => Promise.reject(fsFault(target, e)));
  if (s.isDirectory()) {
    const names = (await readdir(target).catch((e: unknown) => Promise.reject(fsFault(target, e))))
      .filter((n) => /\.dxf$/i.test(n))
      .sort(byName);
    if (!names.length) throw new InputError(target, 'no .dxf files in this folder');
    return names.map((n) => ({ name: profileName(n), source: join(target, n), text: () => readText(join(target, n)) }));
  }
  if (/\.zip$/i.test(target)) return zipInputs(target);
  return [{ name: profileName(target), source: target, text: () => readText(target) }];
}

/** UTF-8, or Latin-1 for older drawings in an ANSI code page. */
function decode(bytes: Uint8Array): string {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    return new TextDecoder('latin1').decode(bytes);
  }
}

/** The file's text: UTF-8, or Latin-1 for older drawings in an ANSI code page. Refuses files over the cap unread. */
export async function readText(file: string, maxBytes = DEFAULT_MAX_BYTES): Promise<string> {
  const s = await stat(file).catch((e: unknown) => Promise.reject(fsFault(file, e)));
  if (s.isDirectory()) throw new InputError(file, 'is a folder');
  if (s.size > maxBytes)
    throw new DxfError('TOO_LARGE', file, `file is ${(s.size / 2 ** 20).toFixed(1)} MiB, over the ${maxBytes / 2 ** 20} MiB limit`);
  return decode(await readFile(file).catch((e: unknown) => Promise.reject(fsFault(file, e))));
}
