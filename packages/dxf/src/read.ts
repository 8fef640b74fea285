import { regionBox, segmentCount, type LengthUnit, type Region } from '@keelson/geometry';
import { assemble, type Assembled } from './assemble';
import { collect, type Collected } from './collect';
import { DxfError } from './errors';
import { LayerFilter, type LayerSelection } from './layers';
import { Limits, type ParseLimits } from './limits';
import { groupLeaves, type SplitMode } from './split';
import { readStructure } from './structure';
import { readTags } from './tags';
import { drawingUnit } from './units';

export interface ReadOptions extends LayerSelection, ParseLimits {
  /** Name of the drawing in messages (a path or an upload's name). */
  readonly file: string;
  /** Profile name for the whole drawing, and the stem of numbered ones (default: the file's base name). */
  readonly name?: string;
  /** Unit of the drawing when `$INSUNITS` is missing or wrong; wins over the header. */
  readonly drawingUnits?: LengthUnit;
  /** Largest text accepted, in UTF-8 bytes (default 64 MiB). */
  readonly maxBytes?: number;
  /** Ends closer than this are joined, in drawing units (default 1e-6 of the drawing's extent). */
  readonly joinTolerance?: number;
  /** Most segments the drawing may expand to, blocks and arrays multiplied out (default 1,000,000). */
  readonly maxSegments?: number;
  /** How the drawing becomes profiles (default `none`: one profile). */
  readonly split?: SplitMode;
}

/** One profile read into an exact region, lengths in `unit` (the drawing's own). */
export interface Drawing {
  readonly file: string;
  readonly name: string;
  readonly unit: LengthUnit;
  readonly region: Region;
  /** Everything read differently from what the file says, or not read at all. */
  readonly warnings: string[];
  /**
   * Largest distance between the region's boundary and the drawn entities, in `unit`: gaps closed
   * between segment ends, curves flattened where overlapping parts were united. 0 when the region
   * is the drawing to rounding.
   */
  readonly deviation: number;
  readonly stats: { readonly entities: number; readonly segments: number; readonly loops: number };
}

/** A profile of a split drawing that could not be read; the others are unaffected. */
export interface DrawingFault {
  readonly file: string;
  readonly name: string;
  readonly error: DxfError;
}

export interface DrawingSet {
  readonly file: string;
  readonly unit: LengthUnit;
  readonly profiles: (Drawing | DrawingFault)[];
}

export const DEFAULT_MAX_BYTES = 64 * 1024 * 1024;
export const DEFAULT_MAX_SEGMENTS = 1_000_000;

const size = (n: number) => (n >= 2 ** 20 ? `${+(n / 2 ** 20).toFixed(1)} MiB` : `${n} bytes`);

const baseName = (file: string) => file.replace(/^.*[\\/:]/, '').replace(/\.[^.]*$/, '') || file;

const counts = (m: ReadonlyMap<string, number>) =>
  [...m]
    .sort((a, b) => b[1] - a[1] || (a[0] < b[0] ? -1 : 1))
    .map(([t, n]) => `${n} ${t}`)
    .join(', ');

/** Sentences on what the drawing holds that is not read: annotation, helpers, unsupported types, paper space, external references. */
function drawingNotes(c: Collected, filter: LayerFilter): { warnings: string[]; notRead: string } {
  const warnings: string[] = [];
  const layers = filter.report();
  if (layers) warnings.push(layers);
  if (c.annotation.size) warnings.push(`ignored annotation: ${counts(c.annotation)}`);
  if (c.construction.size) warnings.push(`ignored construction entities: ${counts(c.construction)}`);
  if (c.unsupported.size) warnings.push(`not read (entity types Keelson does not read): ${counts(c.unsupported)}`);
  if (c.paperSpace) warnings.push(`ignored ${c.paperSpace} paper-space entit${c.paperSpace === 1 ? 'y' : 'ies'}`);
  if (c.xrefs.size) warnings.push(`not read: external reference${c.xrefs.size === 1 ? '' : 's'} ${[...c.xrefs].join(', ')} (drawn in another file)`);
  const notRead = [counts(c.annotation), counts(c.construction), counts(c.unsupported)].filter(Boolean).join(', ');
  return { warnings, notRead };
}

/** Parts of a region, each its own profile, ordered left to right (then bottom to top). */
function islands(region: Region): Region[] {
  const parts = region.parts.map((part) => ({ part, box: regionBox({ parts: [part] }) }));
  parts.sort((p, q) => p.box.xmin - q.box.xmin || p.box.ymin - q.box.ymin);
  return parts.map(({ part }) => ({ parts: [part] }));
}

/**
 * Reads an ASCII DXF drawing into profiles of exact regions: outline entities of model space
 * (LINE, ARC, CIRCLE, ELLIPSE, SPLINE, LWPOLYLINE, 2D POLYLINE), INSERTs expanded through nested
 * blocks, HATCH boundaries where a drawing has no outlines, each in world coordinates (OCS
 * applied), on the selected layers, joined into loops, overlaps united, nested into parts and
 * holes, and grouped by `split`. A fault of the whole drawing throws a DxfError (one line naming
 * the file, the entity or place, and the cause); with a split, a fault of one profile becomes its
 * entry and the others are read.
 */
export async function readProfiles(text: string, opts: ReadOptions): Promise<DrawingSet> {
  const { file } = opts;
  const maxBytes = opts.maxBytes ?? DEFAULT_MAX_BYTES;
  // UTF-8 takes at most three bytes per UTF-16 code unit: only a text longer than a third of the cap needs counting.
  if (text.length * 3 > maxBytes) {
    const bytes = Buffer.byteLength(text, 'utf8');
    if (bytes > maxBytes) throw new DxfError('TOO_LARGE', file, `file is ${size(bytes)}, over the ${size(maxBytes)} limit`);
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);

  const limits = new Limits(opts, file);
  const { tags, complete } = readTags(text, file);
  limits.reserve(text.length, tags.count, 0);
  const s = readStructure(tags, complete, file);
  const drawingWarnings: string[] = [];
  const unit = drawingUnit(s.insunits, file, opts.drawingUnits, drawingWarnings);
  const filter = new LayerFilter(s.layers, opts);
  const c = collect(s, filter, { maxSegments: opts.maxSegments ?? DEFAULT_MAX_SEGMENTS, limits }, file);
  const notes = drawingNotes(c, filter);
  drawingWarnings.push(...notes.warnings);

  const split = opts.split ?? 'none';
  const name = opts.name ?? baseName(file);
  const groups = groupLeaves(c, split, name);
  const entities = s.entities.filter((e) => !e.paperSpace).length;
  const ctx = { tags, file, unit, joinTolerance: opts.joinTolerance, notRead: notes.notRead, limits };
  const profiles: (Drawing | DrawingFault)[] = [];
  const drawing = (n: string, region: Region, a: Assembled): Drawing => ({
    file,
    name: n,
    unit,
    region,
    warnings: [...drawingWarnings, ...a.warnings],
    deviation: a.deviation,
    stats: { entities, segments: segmentCount(region), loops: region.parts.reduce((k, p) => k + 1 + p.holes.length, 0) },
  });
  if (!groups.length || (split !== 'none' && !c.leaves.length))
    throw new DxfError('NO_CLOSED_OUTLINE', file, `no closed outline: nothing to read in model space${notes.notRead ? `; not read: ${notes.notRead}` : ''}`);
  for (const g of groups) {
    let a: Assembled;
    try {
      a = assemble(g.leaves, ctx);
    } catch (e) {
      // Alone, a profile's fault is the drawing's; among several, it is that profile's entry.
      if (split === 'none' || split === 'islands' || !(e instanceof DxfError)) throw e;
      profiles.push({ file, name: g.name, error: new DxfError(e.code, file, `${g.name}: ${e.detail}`) });
      continue;
    }
    if (split === 'islands') islands(a.region).forEach((r, i) => profiles.push(drawing(`${g.name}-${i + 1}`, r, a)));
    else profiles.push(drawing(g.name, a.region, a));
  }
  return { file, unit, profiles };
}

/** Reads a drawing as one profile (see `readProfiles`); throws the DxfError of any fault. */
export async function readDrawing(text: string, opts: ReadOptions): Promise<Drawing> {
  const set = await readProfiles(text, { ...opts, split: 'none' });
  const p = set.profiles[0]!;
  if ('error' in p) throw p.error;
  return p;
}
