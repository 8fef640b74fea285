import type { Affine } from '@keelson/geometry';
import { ANNOTATION_TYPES, CONSTRUCTION_TYPES, OUTLINE_TYPES, compose } from './entities';
import { DxfError } from './errors';
import { Fields } from './fields';
import type { LayerFilter } from './layers';
import type { Limits } from './limits';
import { ocsToWorld } from './ocs';
import { entityLabel, type EntitySource } from './source';
import type { BlockRecord, DxfStructure, EntityRecord } from './structure';

/** An outline entity or HATCH as placed in the drawing: through which INSERTs, on which layer. */
export interface Leaf {
  readonly rec: EntityRecord;
  /** Block coordinates → world; null for an entity of model space itself. */
  readonly t: Affine | null;
  /** The layer it is drawn on: its own, or the INSERT's when it lies on layer 0 inside a block. */
  readonly layer: string;
  readonly src: EntitySource;
  /** Index into `inserts` of the model-space INSERT it came through; −1 for model space itself. */
  readonly top: number;
}

export interface Collected {
  readonly leaves: Leaf[];
  /** Block names of the model-space INSERTs, by index. */
  readonly inserts: string[];
  /** Entities not read, by kind and type, for the warnings. */
  readonly annotation: Map<string, number>;
  readonly construction: Map<string, number>;
  readonly unsupported: Map<string, number>;
  paperSpace: number;
  readonly xrefs: Set<string>;
}

export interface Budget {
  /** Most segments the drawing may expand to (blocks and arrays multiplied out). */
  readonly maxSegments: number;
  readonly limits: Limits;
}

/** Nesting deeper than this is a broken drawing, not a design (and would overflow the stack). */
const MAX_DEPTH = 64;

const bump = (m: Map<string, number>, k: string, n = 1) => m.set(k, (m.get(k) ?? 0) + n);

/**
 * Rough cost of one entity in segments: its vertices or control points. A spline's span costs
 * (degree + 1)² basis products per quadrature point, against 16 for a cubic, and a rational one
 * is integrated adaptively (about four times the points).
 */
function weight(s: DxfStructure, rec: EntityRecord): number {
  if (rec.type === 'POLYLINE') return rec.children.length;
  if (rec.type !== 'LWPOLYLINE' && rec.type !== 'SPLINE' && rec.type !== 'HATCH') return 1;
  const codes = s.tags.codes;
  let n = 1;
  let degree = 3;
  let rational = false;
  for (let k = rec.at + 1; k < rec.end; k++) {
    if (codes[k] === 10) n++;
    else if (rec.type === 'SPLINE' && codes[k] === 71) degree = Number(s.tags.value(k)) || 3;
    else if (rec.type === 'SPLINE' && codes[k] === 41) rational = true;
  }
  return rec.type === 'SPLINE' ? n * Math.max(1, (degree + 1) ** 2 / 16) * (rational ? 4 : 1) : n;
}

/** The INSERT's placement: block coordinates → the coordinates the INSERT is drawn in. */
interface Placement {
  readonly block: BlockRecord;
  readonly copies: Affine[];
}

/**
 * Where an INSERT puts its block: x' = OCS(N) · (P + R(rot) · (S · (x − B) + array offset))
 * (AutoCAD DXF Reference, INSERT): P the insertion point (10, in the INSERT's OCS), S the scales
 * (41, 42; 1 when absent, negative to mirror), rot (50, degrees), B the block's base point, and a
 * rows × columns array (71, 70) spaced 45, 44 along the rotated axes, unscaled.
 */
function placement(s: DxfStructure, rec: EntityRecord, src: EntitySource, file: string): Placement {
  const f: Fields = new Fields(s.tags, rec.at, rec.end, src, file);
  const nameAt = f.find(2);
  const name = nameAt >= 0 ? s.tags.value(nameAt) : '';
  const block = s.blocks.get(name.toUpperCase());
  if (!block) throw new DxfError('INVALID_BLOCK', file, `${entityLabel(src)}: block ${JSON.stringify(name)} is not defined in the drawing`);
  const head = new Fields(s.tags, block.head.at, block.head.end, { type: 'BLOCK', layer: undefined, line: block.line, handle: name }, file);
  const base = head.point(10, 'base point', { x: 0, y: 0 });
  const p = f.point(10, 'insertion point', { x: 0, y: 0 });
  const sx = f.num(41, 'x scale', 1);
  const sy = f.num(42, 'y scale', 1);
  if (sx === 0 || sy === 0) f.fail('INVALID_ENTITY', `scale ${sx} × ${sy} collapses the block`);
  const rot = (f.num(50, 'rotation', 0) * Math.PI) / 180;
  const cols = Math.max(1, f.int(70, 1));
  const rows = Math.max(1, f.int(71, 1));
  const dc = f.num(44, 'column spacing', 0);
  const dr = f.num(45, 'row spacing', 0);
  const n = f.extrusion();
  const ocs = ocsToWorld(n);
  if (!ocs) f.fail('INVALID_ENTITY', `not drawn in the xy-plane (extrusion direction ${n.x}, ${n.y}, ${n.z})`);
  const [c, sn] = [Math.cos(rot), Math.sin(rot)];
  const copies: Affine[] = [];
  // rows × columns was checked against the segment budget before any block was expanded.
  for (let i = 0; i < rows; i++)
    for (let j = 0; j < cols; j++) {
      const ox = j * dc - sx * base.x;
      const oy = i * dr - sy * base.y;
      const local: Affine = { a: c * sx, b: -sn * sy, c: sn * sx, d: c * sy, tx: p.x + c * ox - sn * oy, ty: p.y + sn * ox + c * oy };
      copies.push(compose(ocs, local));
    }
  return { block, copies };
}

function arrayCount(s: DxfStructure, rec: EntityRecord): number {
  let cols = 1;
  let rows = 1;
  for (let k = rec.at + 1; k < rec.end; k++) {
    const v = Number(s.tags.value(k));
    if (s.tags.codes[k] === 70 && v > 1) cols = v;
    else if (s.tags.codes[k] === 71 && v > 1) rows = v;
  }
  return cols * rows;
}

/**
 * Segments the model space expands to, blocks and arrays multiplied out, without expanding them:
 * each block's cost is computed once. Refuses blocks that insert themselves, undefined blocks are
 * left to the expansion (which names the INSERT).
 */
function expandedSize(s: DxfStructure, file: string): number {
  const cost = new Map<string, number>();
  const visiting: string[] = [];
  const listCost = (list: readonly EntityRecord[]): number => {
    let n = 0;
    for (const e of list) {
      if (e.paperSpace) continue;
      if (e.type !== 'INSERT') {
        n += weight(s, e);
        continue;
      }
      const k = new Fields(s.tags, e.at, e.end, e, file).find(2);
      // Each copy costs at least one unit: an array of an empty block still has to be walked.
      n += arrayCount(s, e) * Math.max(1, blockCost(k >= 0 ? s.tags.value(k).toUpperCase() : ''));
    }
    return n;
  };
  const blockCost = (key: string): number => {
    const known = cost.get(key);
    if (known !== undefined) return known;
    const block = s.blocks.get(key);
    if (!block) return 1;
    if (visiting.includes(key)) {
      const chain = [...visiting.slice(visiting.indexOf(key)), key].map((k) => s.blocks.get(k)!.name).join(' → ');
      throw new DxfError('INVALID_BLOCK', file, `block ${JSON.stringify(block.name)} inserts itself (${chain})`);
    }
    if (visiting.length >= MAX_DEPTH) throw new DxfError('INVALID_BLOCK', file, `blocks nested more than ${MAX_DEPTH} deep (at ${JSON.stringify(block.name)})`);
    visiting.push(key);
    const n = listCost(block.entities);
    visiting.pop();
    cost.set(key, n);
    return n;
  };
  return listCost(s.entities);
}

/**
 * The outline entities and HATCHes of model space, INSERTs expanded through nested blocks with
 * their transforms, each on its effective layer (an entity on layer 0 inside a block takes the
 * INSERT's layer), filtered by the layer selection. An INSERT on a frozen layer hides all of its
 * block, as in CAD programs. Everything else is counted by kind for the warnings.
 */
export function collect(s: DxfStructure, filter: LayerFilter, budget: Budget, file: string): Collected {
  const size = expandedSize(s, file);
  if (size > budget.maxSegments)
    throw new DxfError('TOO_COMPLEX', file, `the drawing expands to about ${size.toExponential(1)} segments (blocks and arrays multiplied out); the limit is ${budget.maxSegments}`);
  budget.limits.reserve(s.tags.text.length, s.tags.count, size);
  const out: Collected = {
    leaves: [],
    inserts: [],
    annotation: new Map(),
    construction: new Map(),
    unsupported: new Map(),
    paperSpace: 0,
    xrefs: new Set(),
  };
  const walk = (list: readonly EntityRecord[], t: Affine | null, parentLayer: string, chain: readonly string[], top: number) => {
    for (const e of list) {
      budget.limits.check();
      const own = e.layer ?? '0';
      const layer = chain.length && own === '0' ? parentLayer : own;
      const src: EntitySource = { type: e.type, handle: e.handle, layer: own, line: e.line, ...(chain.length ? { blocks: chain } : {}) };
      if (e.type === 'INSERT') {
        if (e.children.length) bump(out.annotation, 'ATTRIB', e.children.length);
        if (filter.verdict(layer) === 'frozen') {
          filter.admit(layer);
          continue;
        }
        const { block, copies } = placement(s, e, src, file);
        if (block.flags & 4) {
          out.xrefs.add(block.name);
          continue;
        }
        const index = top >= 0 ? top : out.inserts.push(block.name) - 1;
        for (const copy of copies) walk(block.entities, t ? compose(t, copy) : copy, layer, [...chain, block.name], index);
      } else if (OUTLINE_TYPES.has(e.type) || e.type === 'HATCH') {
        if (filter.admit(layer)) out.leaves.push({ rec: e, t, layer, src, top });
      } else if (ANNOTATION_TYPES.has(e.type)) bump(out.annotation, e.type);
      else if (CONSTRUCTION_TYPES.has(e.type)) bump(out.construction, e.type);
      else bump(out.unsupported, e.type);
    }
  };
  walk(
    s.entities.filter((e) => {
      if (e.paperSpace) out.paperSpace++;
      return !e.paperSpace;
    }),
    null,
    '0',
    [],
    -1,
  );
  return out;
}
