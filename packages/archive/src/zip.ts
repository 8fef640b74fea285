import yauzl, { type Entry, type ZipFile } from 'yauzl';
import { ArchiveError } from './errors';

export interface ZipLimits {
  /** Most entries (files and folders) an archive may list. */
  readonly maxEntries: number;
  /** Most bytes one entry may inflate to. */
  readonly maxEntryBytes: number;
  /** Most bytes all entries together may inflate to. */
  readonly maxTotalBytes: number;
}

export const DEFAULT_ZIP_LIMITS: ZipLimits = {
  maxEntries: 10_000,
  maxEntryBytes: 64 * 2 ** 20,
  maxTotalBytes: 1024 * 2 ** 20,
};

/** One drawing of a catalogue archive: its bytes, or why it was not read. */
export type ZipDrawing =
  | { readonly name: string; readonly data: Buffer }
  | { readonly name: string; readonly error: string };

export interface ZipCatalogue {
  readonly drawings: ZipDrawing[];
  /** Entries asked for by `alsoRead` (a catalogue's manifest), read under the same caps. */
  readonly files: { readonly name: string; readonly data: Buffer }[];
  /** Entries that are not drawings (readme files, images…), by name: listed, not read. */
  readonly ignored: string[];
}

const ARCHIVE = /\.(zip|7z|rar|tar|gz|tgz|bz2|xz)$/i;

/** Why an entry name cannot be trusted, or null: names are labels here, never paths on disk. */
function badName(name: string): string | null {
  if (name.includes('\0')) return 'name contains a NUL character';
  if (/^([a-zA-Z]:)?[\\/]/.test(name)) return 'absolute path refused';
  if (name.split(/[\\/]/).includes('..')) return '"../" in the name refused';
  return null;
}

function open(buf: Buffer): Promise<ZipFile> {
  return new Promise((resolve, reject) =>
    // Raw names (decodeStrings: false) so that a bad name fails its own entry, not the archive.
    yauzl.fromBuffer(buf, { lazyEntries: true, decodeStrings: false, validateEntrySizes: true }, (err, zip) =>
      err ? reject(new ArchiveError('NOT_ZIP', `not a readable ZIP archive (${err.message})`)) : resolve(zip),
    ),
  );
}

/** Inflates one entry, stopping as soon as it passes `cap` bytes. */
function inflate(zip: ZipFile, entry: Entry, cap: number): Promise<Buffer | 'over'> {
  return new Promise((resolve, reject) => {
    zip.openReadStream(entry, (err, stream) => {
      if (err) return reject(err);
      const chunks: Buffer[] = [];
      let size = 0;
      stream.on('data', (c: Buffer) => {
        size += c.length;
        if (size > cap) {
          stream.destroy();
          resolve('over');
        } else chunks.push(c);
      });
      stream.on('error', reject);
      stream.on('end', () => resolve(Buffer.concat(chunks)));
    });
  });
}

/**
 * Reads every `.dxf` entry of a ZIP catalogue (yauzl with lazy entries), and the other entries
 * `alsoRead` accepts (a manifest), each independently: a
 * broken, oversized, nested-archive or badly named entry becomes an error entry and the rest go on.
 * The entry count and the bytes actually inflated, per entry and in total, are capped (zip bombs
 * declare small sizes); passing the total cap or the entry count stops the whole archive.
 */
export async function readZipCatalogue(
  buf: Buffer,
  limits: ZipLimits = DEFAULT_ZIP_LIMITS,
  opts: { readonly alsoRead?: (name: string) => boolean } = {},
): Promise<ZipCatalogue> {
  const zip = await open(buf);
  if (zip.entryCount > limits.maxEntries)
    throw new ArchiveError('TOO_MANY_ENTRIES', `archive lists ${zip.entryCount} entries; the limit is ${limits.maxEntries}`);
  const drawings: ZipDrawing[] = [];
  const files: { name: string; data: Buffer }[] = [];
  const ignored: string[] = [];
  let total = 0;
  try {
    await new Promise<void>((resolve, reject) => {
      zip.on('error', (e: Error) => reject(new ArchiveError('CORRUPT', `archive is corrupt: ${e.message}`)));
      zip.on('end', resolve);
      zip.on('entry', (entry: Entry) => {
        const name = Buffer.isBuffer(entry.fileName) ? (entry.fileName as Buffer).toString('utf8') : String(entry.fileName);
        const next = () => zip.readEntry();
        if (name.endsWith('/')) return next();
        const bad = badName(name);
        if (bad) {
          drawings.push({ name, error: bad });
          return next();
        }
        if (ARCHIVE.test(name)) {
          drawings.push({ name, error: 'nested archive refused: unpack it into the catalogue instead' });
          return next();
        }
        const extra = !/\.dxf$/i.test(name) && (opts.alsoRead?.(name) ?? false);
        if (!/\.dxf$/i.test(name) && !extra) {
          ignored.push(name);
          return next();
        }
        const cap = Math.min(limits.maxEntryBytes, limits.maxTotalBytes - total);
        inflate(zip, entry, cap).then(
          (data) => {
            if (data === 'over') {
              if (cap < limits.maxEntryBytes)
                return reject(new ArchiveError('TOO_LARGE', `archive inflates to more than ${limits.maxTotalBytes} bytes`));
              drawings.push({ name, error: `inflates to more than ${limits.maxEntryBytes} bytes` });
            } else {
              total += data.length;
              (extra ? files : drawings).push({ name, data });
            }
            next();
          },
          (e: Error) => {
            drawings.push({ name, error: `cannot be inflated: ${e.message}` });
            next();
          },
        );
      });
      zip.readEntry();
    });
  } finally {
    zip.close();
  }
  return { drawings, files, ignored };
}
