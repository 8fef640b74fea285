import { readFile, readdir, stat } from 'node:fs/promises';
import { basename, dirname, join, relative, resolve, sep } from 'node:path';
import { ArchiveError, DEFAULT_ZIP_LIMITS, readZipCatalogue } from '@keelson/archive';
import { DEFAULT_MAX_BYTES } from '@keelson/dxf';
import { parseManifest, sha256, type Catalogue, type CatalogueDrawing, type Manifest, type MaterialInput } from '@keelson/verify';
import { SourceError, fsFault } from './errors';

/** A catalogue ready to verify: its drawings, the manifest, and where the manifest sits in it. */
export interface LoadedCatalogue {
  readonly catalogue: Catalogue;
  readonly manifest: Manifest;
  /** The manifest's folder inside the catalogue ('' for the root): drawing paths are relative to it. */
  readonly manifestDir: string;
  /** Stable id of the catalogue's run history: its name and a hash of its absolute path. */
  readonly key: string;
}

export interface LoadOptions {
  /** A manifest file to use instead of the catalogue's own manifest.csv / manifest.json. */
  readonly manifest?: string;
  readonly materials?: Readonly<Record<string, MaterialInput>>;
}

const MANIFEST_NAMES = ['manifest.csv', 'manifest.json'];
const MANIFEST_ENTRY = /(^|\/)manifest\.(csv|json)$/i;
const SKIP_DIRS = new Set(['node_modules', '.git']);
/** Most drawings read from a folder: a catalogue, not a disk. */
const MAX_FOLDER_DRAWINGS = 20_000;

/** Catalogue history key: "demo-1a2b3c4d" (readable, and two folders of the same name apart). */
export function catalogueKey(target: string): string {
  const name = basename(resolve(target)).replace(/\.zip$/i, '').replace(/[^A-Za-z0-9._-]+/g, '-').slice(0, 60) || 'catalogue';
  return `${name}-${sha256(resolve(target)).slice(0, 8)}`;
}

const posix = (p: string) => p.split(sep).join('/');

/** Every *.dxf under a folder (subfolders too, dot-folders skipped), as `/`-separated relative paths. */
async function folderDrawings(root: string): Promise<CatalogueDrawing[]> {
  const out: CatalogueDrawing[] = [];
  const walk = async (dir: string): Promise<void> => {
    const entries = await readdir(dir, { withFileTypes: true }).catch((e: unknown) => Promise.reject(fsFault(dir, e)));
    entries.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
    for (const e of entries) {
      const p = join(dir, e.name);
      if (e.isDirectory() && !e.name.startsWith('.') && !SKIP_DIRS.has(e.name)) await walk(p);
      else if (e.isFile() && /\.dxf$/i.test(e.name)) {
        if (out.length >= MAX_FOLDER_DRAWINGS) throw new SourceError('UNREADABLE_INPUT', root, `more than ${MAX_FOLDER_DRAWINGS} drawings`);
        const path = posix(relative(root, p));
        const size = (await stat(p)).size;
        out.push(size > DEFAULT_MAX_BYTES ? { path, error: `file is over the ${DEFAULT_MAX_BYTES / 2 ** 20} MiB limit` } : { path, bytes: new Uint8Array(await readFile(p)) });
      }
    }
  };
  await walk(root);
  return out;
}

async function readManifestFile(file: string, opts: LoadOptions): Promise<Manifest> {
  const text = await readFile(file, 'utf8').catch((e: unknown) => Promise.reject(fsFault(file, e)));
  return parseManifest(text, file, { materials: opts.materials });
}

async function fromFolder(target: string, opts: LoadOptions): Promise<LoadedCatalogue> {
  const drawings = await folderDrawings(target);
  let manifestFile = opts.manifest;
  if (!manifestFile) {
    for (const n of MANIFEST_NAMES) {
      const p = join(target, n);
      if (await stat(p).then((s) => s.isFile(), () => false)) {
        manifestFile = p;
        break;
      }
    }
  }
  if (!manifestFile) throw new SourceError('NO_MANIFEST', target, 'no manifest.csv or manifest.json in this folder; give one with --manifest');
  const manifest = await readManifestFile(manifestFile, opts);
  // A manifest inside the catalogue names drawings relative to itself; one outside, relative to the root.
  const rel = posix(relative(resolve(target), resolve(dirname(manifestFile))));
  const manifestDir = rel.startsWith('..') || rel.startsWith('/') ? '' : rel;
  if (!drawings.length) throw new SourceError('NO_DRAWINGS', target, 'no .dxf files in this folder');
  return { catalogue: { name: basename(resolve(target)), source: target, drawings }, manifest, manifestDir, key: catalogueKey(target) };
}

async function fromZip(target: string, opts: LoadOptions): Promise<LoadedCatalogue> {
  const buf = await readFile(target).catch((e: unknown) => Promise.reject(fsFault(target, e)));
  let zip;
  try {
    zip = await readZipCatalogue(buf, { ...DEFAULT_ZIP_LIMITS, maxEntryBytes: DEFAULT_MAX_BYTES }, { alsoRead: (name) => MANIFEST_ENTRY.test(name) });
  } catch (e) {
    if (e instanceof ArchiveError) throw new SourceError('UNREADABLE_INPUT', target, e.message);
    throw e;
  }
  const drawings: CatalogueDrawing[] = zip.drawings.map((d) => ('error' in d ? { path: d.name, error: d.error } : { path: d.name, bytes: new Uint8Array(d.data) }));
  if (!drawings.length) throw new SourceError('NO_DRAWINGS', target, 'no .dxf entries in this archive');
  let manifest: Manifest;
  let manifestDir = '';
  if (opts.manifest) manifest = await readManifestFile(opts.manifest, opts);
  else {
    // The shallowest manifest of the archive (a catalogue zipped with its folder has it one level down).
    const found = zip.files.filter((f) => MANIFEST_ENTRY.test(f.name)).sort((a, b) => a.name.split('/').length - b.name.split('/').length || (a.name < b.name ? -1 : 1))[0];
    if (!found) throw new SourceError('NO_MANIFEST', target, 'no manifest.csv or manifest.json in this archive; give one with --manifest');
    manifest = parseManifest(found.data.toString('utf8'), `${target}:${found.name}`, { materials: opts.materials });
    manifestDir = found.name.includes('/') ? found.name.slice(0, found.name.lastIndexOf('/')) : '';
  }
  return { catalogue: { name: basename(target).replace(/\.zip$/i, ''), source: target, drawings }, manifest, manifestDir, key: catalogueKey(target) };
}

/**
 * Reads a catalogue to verify: a folder (every *.dxf below it; its manifest.csv or manifest.json)
 * or a ZIP archive (its DXF entries, each read alone under the archive's caps; the shallowest
 * manifest entry). `opts.manifest` names a manifest file instead. Throws SourceError or VerifyError
 * (a bad manifest) for input the user can fix.
 */
export async function loadCatalogue(target: string, opts: LoadOptions = {}): Promise<LoadedCatalogue> {
  const s = await stat(target).catch((e: unknown) => Promise.reject(fsFault(target, e)));
  if (s.isDirectory()) return fromFolder(target, opts);
  if (/\.zip$/i.test(target)) return fromZip(target, opts);
  throw new SourceError('UNREADABLE_INPUT', target, 'give a folder of drawings or a ZIP catalogue');
}
