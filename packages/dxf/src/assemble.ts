import { GeometryError, transformSegment, type LengthUnit, type Loop, type Point, type Region, type Segment } from '@keelson/geometry';
import { ResolveError, resolveLoops } from '@keelson/resolve';
import type { Leaf } from './collect';
import { outlineSegments } from './entities';
import { DxfError } from './errors';
import { Fields } from './fields';
import { hatchBoundary } from './hatch';
import type { Limits } from './limits';
import { mergeCollinear } from './overlap';
import { entityLabel } from './source';
import { extentOf, stitch, type Piece, type StitchFault } from './stitch';
import type { Tags } from './tags';

export interface AssembleContext {
  readonly tags: Tags;
  readonly file: string;
  readonly unit: LengthUnit;
  /** Ends closer than this join (drawing units); default `DEFAULT_JOIN_TOLERANCE` × the extent. */
  readonly joinTolerance?: number;
  /** What the drawing holds that is not read, for the message when nothing closes. */
  readonly notRead: string;
  readonly limits: Limits;
}

export interface Assembled {
  readonly region: Region;
  readonly warnings: string[];
  /** Largest distance between the region's boundary and the drawn entities (closed gaps, flattening), drawing units. */
  readonly deviation: number;
}

/** Default join tolerance relative to the drawing's extent: corner gaps of real exports, far below any feature of a section. */
export const DEFAULT_JOIN_TOLERANCE = 1e-6;

/** Coincidence tolerance for crossings and unions, relative to the extent: rounding only, so separate loops stay separate. */
const RESOLVE_TOLERANCE = 1e-9;

/** Coordinates beyond this are not a drawing of a section (and their fourth powers would overflow). */
const MAX_COORDINATE = 1e12;

/** "(12.5, -3)": coordinates to 8 significant digits. */
export function formatPoint(p: Point): string {
  const g = (v: number) => String(Number(v.toPrecision(8)) || 0);
  return `(${g(p.x)}, ${g(p.y)})`;
}

const fmtLength = (v: number, unit: string) => `${Number(v.toPrecision(2))} ${unit}`;

function fieldsOf(tags: Tags, leaf: Leaf, file: string): Fields {
  return new Fields(tags, leaf.rec.at, leaf.rec.end, leaf.src, file);
}

function place(leaf: Leaf, segs: readonly Segment[]): Segment[] {
  const t = leaf.t;
  return t ? segs.map((s) => transformSegment(t, s)) : [...segs];
}

function describe(places: StitchFault['at'], max: number): string {
  const shown = places.slice(0, max).map(({ p, srcs }) => `${formatPoint(p)} on ${srcs.map(entityLabel).join(' and ')}`);
  return shown.join('; ') + (places.length > max ? `; and ${places.length - max} more` : '');
}

/** Distance from each open end to the nearest other one: the gap that would have to be bridged. */
function widestGap(at: StitchFault['at']): number {
  let widest = 0;
  for (const a of at) {
    let nearest = Infinity;
    for (const b of at) if (b !== a) nearest = Math.min(nearest, Math.hypot(a.p.x - b.p.x, a.p.y - b.p.y));
    if (Number.isFinite(nearest)) widest = Math.max(widest, nearest);
  }
  return widest;
}

function stitchError(f: StitchFault, ctx: AssembleContext, tol: number, what: string): DxfError {
  const also = ctx.notRead ? `; not read: ${ctx.notRead}` : '';
  if (f.kind === 'none') return new DxfError('NO_CLOSED_OUTLINE', ctx.file, `no closed outline: ${what}${also}`);
  if (f.kind === 'branching')
    return new DxfError('BRANCHING_OUTLINE', ctx.file, `more than two segment ends meet at ${describe(f.at, 1)}${also}`);
  const gap = widestGap(f.at);
  const hint = gap > tol ? `; open ends up to ${fmtLength(gap, ctx.unit)} apart, the join tolerance is ${fmtLength(tol, ctx.unit)} (--join-tolerance)` : '';
  const ends = `${f.at.length} open end${f.at.length === 1 ? '' : 's'} at ${describe(f.at, 12)}${hint}`;
  if (f.closed === 0) return new DxfError('NO_CLOSED_OUTLINE', ctx.file, `no closed outline: ${ends}${also}`);
  return new DxfError('OPEN_OUTLINE', ctx.file, `open outline: ${ends}${also}`);
}

/** Refuses drawings whose numbers cannot give finite properties: coordinates far out, or a section too small to resolve where it lies. */
function checkScale(pieces: readonly Piece[], extent: number, file: string): void {
  let far = 0;
  for (const { seg } of pieces) {
    const p = seg.kind === 'line' ? seg.a : seg.kind === 'spline' ? seg.controls[0]! : seg.c;
    far = Math.max(far, Math.abs(p.x), Math.abs(p.y));
  }
  if (!(far + extent <= MAX_COORDINATE)) throw new DxfError('INVALID_GEOMETRY', file, `coordinates reach ${far.toExponential(1)}, beyond ±${MAX_COORDINATE.toExponential(0)} drawing units`);
  if (!(extent > 1e-9 * far) || !(extent > 0))
    throw new DxfError('INVALID_GEOMETRY', file, `the outline is ${extent.toExponential(1)} across but ${far.toExponential(1)} from the origin: too small to compute where it lies`);
}

/**
 * Closed loops of the outline entities: overlapping collinear lines folded into one, ends within
 * the join tolerance joined (the largest gap closed reported), exact duplicates dropped.
 */
function outlineLoops(leaves: readonly Leaf[], ctx: AssembleContext, warnings: string[]): { loops: Loop[]; gap: number; extent: number } {
  const pieces: Piece[] = [];
  let notOutlines = 0;
  for (const leaf of leaves) {
    ctx.limits.check();
    const f = fieldsOf(ctx.tags, leaf, ctx.file);
    const children = leaf.rec.children.map((c) => new Fields(ctx.tags, c.at, c.end, { ...leaf.src, type: c.type, line: c.line, handle: c.handle }, ctx.file));
    const segs = outlineSegments(f, leaf.rec.type, children, warnings);
    if (!segs) notOutlines++;
    else for (const seg of place(leaf, segs)) pieces.push({ seg, src: leaf.src });
  }
  if (notOutlines) warnings.push(`ignored ${notOutlines} POLYLINE (3D polyline or mesh): not an outline in the drawing plane`);
  const extent = extentOf(pieces);
  if (pieces.length) checkScale(pieces, extent, ctx.file);
  const tol = ctx.joinTolerance ?? DEFAULT_JOIN_TOLERANCE * extent;
  const tick = () => ctx.limits.check();
  const merged = mergeCollinear(pieces, tol, extent, tick);
  if (merged.folded.length)
    warnings.push(`merged ${merged.folded.length} line(s) overlapping others along the same line: ${merged.folded.slice(0, 3).map(entityLabel).join(', ')}`);
  const st = stitch(merged.pieces, tol, tick);
  tick();
  if (st.fault) throw stitchError(st.fault, ctx, tol, 'no LINE, ARC, CIRCLE, ELLIPSE, SPLINE, LWPOLYLINE, POLYLINE or HATCH in model space');
  if (st.duplicates.length)
    warnings.push(`removed ${st.duplicates.length} duplicate segment(s): ${st.duplicates.slice(0, 3).map(entityLabel).join(', ')}`);
  if (st.degenerate) warnings.push(`dropped ${st.degenerate} zero-length segment(s)`);
  // Gaps at the level of rounding are not news; anything larger is, with where the largest was.
  const gap = st.largestGap > 1e-12 * extent ? st.largestGap : 0;
  if (gap > 0 && st.largestGapAt) warnings.push(`closed gaps between segment ends up to ${fmtLength(gap, ctx.unit)} (largest at ${formatPoint(st.largestGapAt)})`);
  return { loops: st.loops, gap, extent };
}

/** Closed loops of HATCH boundary paths, each path joined on its own (paths are loops by definition). */
function hatchLoops(leaves: readonly Leaf[], ctx: AssembleContext, warnings: string[]): { loops: Loop[]; gap: number; extent: number } {
  const paths: { leaf: Leaf; index: number; pieces: Piece[] }[] = [];
  for (const leaf of leaves) {
    ctx.limits.check();
    const { paths: ps } = hatchBoundary(fieldsOf(ctx.tags, leaf, ctx.file), warnings);
    ps.forEach((segs, i) => paths.push({ leaf, index: i + 1, pieces: place(leaf, segs).map((seg) => ({ seg, src: leaf.src })) }));
  }
  const all = paths.flatMap((p) => p.pieces);
  const extent = extentOf(all);
  if (all.length) checkScale(all, extent, ctx.file);
  const tol = ctx.joinTolerance ?? DEFAULT_JOIN_TOLERANCE * extent;
  const loops: Loop[] = [];
  let gap = 0;
  for (const p of paths) {
    const st = stitch(p.pieces, tol);
    if (st.fault) {
      const e = stitchError(st.fault, ctx, tol, 'boundary path has no segments');
      throw new DxfError(e.code, ctx.file, `${entityLabel(p.leaf.src)} boundary path ${p.index}: ${e.detail}`);
    }
    for (const l of st.loops) loops.push(l);
    gap = Math.max(gap, st.largestGap > 1e-12 * extent ? st.largestGap : 0);
  }
  if (!loops.length) throw new DxfError('NO_CLOSED_OUTLINE', ctx.file, `no closed outline: the HATCH entities have no boundary paths${ctx.notRead ? `; not read: ${ctx.notRead}` : ''}`);
  warnings.push(`solid read from the boundaries of ${leaves.length} HATCH entit${leaves.length === 1 ? 'y' : 'ies'} (the drawing has no outline entities)`);
  return { loops, gap, extent };
}

/**
 * One profile's region from its entities: outlines when there are any (hatches are then fills of
 * those outlines and left out), otherwise the hatches' boundary paths. Loops that cross or overlap
 * are united (clipper-lib behind `resolveLoops`); curves the union cut are flattened and the
 * flattening bound joins the closed gaps in `deviation`. Faults of the geometry core (a degenerate
 * loop, a transform that collapses a curve) and of the union come out as DxfErrors.
 */
export function assemble(leaves: readonly Leaf[], ctx: AssembleContext): Assembled {
  try {
    return assembleLoops(leaves, ctx);
  } catch (e) {
    if (e instanceof ResolveError) throw new DxfError('CROSSING_OUTLINE', ctx.file, e.message);
    if (e instanceof GeometryError) throw new DxfError('INVALID_GEOMETRY', ctx.file, e.message);
    throw e;
  }
}

function assembleLoops(leaves: readonly Leaf[], ctx: AssembleContext): Assembled {
  const warnings: string[] = [];
  const outlines = leaves.filter((l) => l.rec.type !== 'HATCH');
  const hatches = leaves.filter((l) => l.rec.type === 'HATCH');
  if (outlines.length && hatches.length) warnings.push(`ignored ${hatches.length} HATCH: the drawing has outlines, which the hatches fill`);
  const { loops, gap, extent } = outlines.length || !hatches.length ? outlineLoops(outlines, ctx, warnings) : hatchLoops(hatches, ctx, warnings);
  ctx.limits.check();
  const resolved = resolveLoops(loops, RESOLVE_TOLERANCE * extent);
  warnings.push(...resolved.notes);
  const flat = resolved.flattening;
  if (flat) warnings.push(`${flat.loops} united outline(s) cut curves: flattened within ${fmtLength(flat.maxDeviation, ctx.unit)}`);
  return { region: resolved.region, warnings, deviation: Math.max(gap, flat?.maxDeviation ?? 0) };
}
