import { GeometryError, findCrossing, nestLoops, segmentCount, type LengthUnit, type Point, type Region } from '@keelson/geometry';
import { entitySegments, READ_TYPES, type Piece } from './entities';
import { DxfError } from './errors';
import { parseInWorker, type ParsedEntity, type ParseLimits } from './parse';
import { entityLabel, scanDxf, type EntitySource, type RawScan } from './scan';
import { extentOf, stitch, type StitchFault } from './stitch';
import { drawingUnit } from './units';

export interface ReadOptions extends ParseLimits {
  /** Name of the drawing in messages (a path or an upload's name). */
  readonly file: string;
  /** Unit of the drawing when `$INSUNITS` is missing or wrong; wins over the header. */
  readonly drawingUnits?: LengthUnit;
  /** Largest text accepted, in UTF-8 bytes (default 64 MiB). */
  readonly maxBytes?: number;
  /** Ends closer than this fraction of the drawing's size are joined (default 1e-9). */
  readonly joinTolerance?: number;
}

/** One drawing read into an exact region, lengths in `unit` (the drawing's own). */
export interface Drawing {
  readonly file: string;
  readonly unit: LengthUnit;
  readonly region: Region;
  /** Everything read differently from what the file says or not read at all. */
  readonly warnings: string[];
  readonly stats: { readonly entities: number; readonly segments: number; readonly loops: number };
}

export const DEFAULT_MAX_BYTES = 64 * 1024 * 1024;

const size = (n: number) => (n >= 2 ** 20 ? `${+(n / 2 ** 20).toFixed(1)} MiB` : `${n} bytes`);

/** "(12.5, -3)": coordinates to 8 significant digits. */
export function formatPoint(p: Point): string {
  const g = (v: number) => String(Number(v.toPrecision(8)) || 0);
  return `(${g(p.x)}, ${g(p.y)})`;
}

/** Reads the entities of model space in file order; the others are counted by type. */
function collectPieces(scan: RawScan, entities: readonly ParsedEntity[], file: string, warnings: string[]) {
  // dxf-parser lists the entities it knows in file order, so the k-th of a type is the scan's k-th of that type.
  const parsed = new Map<string, ParsedEntity[]>();
  for (const e of entities) if (e.type && READ_TYPES.has(e.type)) parsed.set(e.type, [...(parsed.get(e.type) ?? []), e]);
  const taken = new Map<string, number>();
  const pieces: Piece[] = [];
  const ignored = new Map<string, number>();
  let paperSpace = 0;
  for (const raw of scan.entities) {
    const k = taken.get(raw.type) ?? 0;
    taken.set(raw.type, k + 1);
    if (raw.paperSpace) {
      paperSpace++;
      continue;
    }
    if (!READ_TYPES.has(raw.type)) {
      ignored.set(raw.type, (ignored.get(raw.type) ?? 0) + 1);
      continue;
    }
    const e = parsed.get(raw.type)?.[k];
    if (!e) throw new Error(`${file}: parser and scan disagree on ${entityLabel(raw)}`);
    const src: EntitySource = { type: raw.type, handle: raw.handle, layer: raw.layer ?? e.layer, line: raw.line };
    for (const seg of entitySegments(e, src, raw, file, warnings)) pieces.push({ seg, src });
  }
  const skipped = [...ignored].map(([t, n]) => `${n} ${t}`).join(', ');
  if (skipped) warnings.push(`ignored ${skipped}: Keelson reads LINE, ARC, CIRCLE and LWPOLYLINE`);
  if (paperSpace) warnings.push(`ignored ${paperSpace} paper-space entit${paperSpace === 1 ? 'y' : 'ies'}`);
  return { pieces, skipped };
}

function describe(places: StitchFault['at'], max = 3): string {
  const shown = places.slice(0, max).map(({ p, srcs }) => `${formatPoint(p)} on ${srcs.map(entityLabel).join(' and ')}`);
  return shown.join('; ') + (places.length > max ? `; and ${places.length - max} more` : '');
}

function stitchError(f: StitchFault, file: string, skipped: string): DxfError {
  const also = skipped ? `; not read: ${skipped}` : '';
  if (f.kind === 'none')
    return new DxfError('NO_CLOSED_OUTLINE', file, `no closed outline: no LINE, ARC, CIRCLE or LWPOLYLINE in model space${also}`);
  if (f.kind === 'branching')
    return new DxfError('BRANCHING_OUTLINE', file, `more than two segment ends meet at ${describe(f.at, 1)}${also}`);
  const ends = `${f.at.length} open end${f.at.length === 1 ? '' : 's'} at ${describe(f.at)}`;
  if (f.closed === 0) return new DxfError('NO_CLOSED_OUTLINE', file, `no closed outline: ${ends}${also}`);
  return new DxfError('OPEN_OUTLINE', file, `open outline: ${ends}${also}`);
}

/**
 * Reads an ASCII DXF drawing into an exact region: LINE, ARC, CIRCLE and LWPOLYLINE (bulges as exact
 * arcs) of model space, in world coordinates (OCS applied), joined into closed loops and nested
 * into parts and holes. Throws a DxfError (one line, naming the file, the entity or the place, and
 * the cause) on anything it cannot read faithfully; reports what it read differently in `warnings`.
 */
export async function readDrawing(text: string, opts: ReadOptions): Promise<Drawing> {
  const { file } = opts;
  const maxBytes = opts.maxBytes ?? DEFAULT_MAX_BYTES;
  const bytes = Buffer.byteLength(text, 'utf8');
  if (bytes > maxBytes) throw new DxfError('TOO_LARGE', file, `file is ${size(bytes)}, over the ${size(maxBytes)} limit`);
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);

  const warnings: string[] = [];
  const scan = scanDxf(text, file);
  const unit = drawingUnit(scan.insunits, file, opts.drawingUnits, warnings);
  const parsed = await parseInWorker(text, file, opts);
  for (const note of new Set(parsed.notes)) warnings.push(`parser: ${note}`);

  const { pieces, skipped } = collectPieces(scan, parsed.entities, file, warnings);
  const tol = (opts.joinTolerance ?? 1e-9) * extentOf(pieces);
  const st = stitch(pieces, tol);
  if (st.fault) throw stitchError(st.fault, file, skipped);
  if (st.duplicates.length)
    warnings.push(`removed ${st.duplicates.length} duplicate segment(s): ${st.duplicates.slice(0, 3).map(entityLabel).join(', ')}`);
  if (st.degenerate) warnings.push(`dropped ${st.degenerate} zero-length segment(s)`);
  if (st.largestGap > tol * 1e-4) warnings.push(`closed gaps between segment ends up to ${st.largestGap.toPrecision(2)} ${unit}`);

  let region: Region;
  try {
    region = nestLoops(st.loops);
  } catch (e) {
    if (e instanceof GeometryError) throw new DxfError('INVALID_GEOMETRY', file, e.message);
    throw e;
  }
  const crossing = findCrossing(region, tol);
  if (crossing) throw new DxfError('CROSSING_OUTLINE', file, `outline crosses, touches or overlaps itself at ${formatPoint(crossing.at)}`);
  return {
    file,
    unit,
    region,
    warnings,
    stats: { entities: scan.entities.filter((e) => !e.paperSpace).length, segments: segmentCount(region), loops: st.loops.length },
  };
}
