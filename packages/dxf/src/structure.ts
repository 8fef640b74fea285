import { DxfError } from './errors';
import { entityLabel, type EntitySource } from './source';
import type { Tags } from './tags';

/** One entity: its pairs are `tags[at + 1 .. end)` (pair `at` is its `0 TYPE`). */
export interface EntityRecord extends EntitySource {
  readonly type: string;
  readonly at: number;
  readonly end: number;
  readonly line: number;
  handle?: string;
  layer?: string;
  paperSpace: boolean;
  /** VERTEX entities of a POLYLINE, ATTRIB entities of an INSERT (their SEQEND dropped). */
  readonly children: EntityRecord[];
}

export interface BlockRecord {
  /** Name as written; blocks are looked up case-insensitively, as CAD programs do. */
  readonly name: string;
  readonly line: number;
  /** Group 70: 4 external reference, 1 anonymous… */
  readonly flags: number;
  /** The BLOCK record's own pairs (`at` its `0 BLOCK`): the base point is read from them when the block is used. */
  readonly head: { readonly at: number; readonly end: number };
  readonly entities: EntityRecord[];
}

export interface LayerRecord {
  readonly name: string;
  /** Group 70 bit 1. */
  readonly frozen: boolean;
  /** Negative colour number (group 62): the layer is switched off. */
  readonly off: boolean;
}

/** What a DXF holds, as far as Keelson reads it. */
export interface DxfStructure {
  readonly tags: Tags;
  readonly insunits?: number;
  /** Keyed by upper-case name. */
  readonly layers: ReadonlyMap<string, LayerRecord>;
  /** Keyed by upper-case name. */
  readonly blocks: ReadonlyMap<string, BlockRecord>;
  /** Top-level entities of the ENTITIES section, in file order. */
  readonly entities: readonly EntityRecord[];
}

/** Cursor over the pairs with the few moves the walk needs. */
class Walk {
  i = 0;
  constructor(
    readonly t: Tags,
    readonly file: string,
  ) {}
  get done(): boolean {
    return this.i >= this.t.count;
  }
  /** At a `0 <value>` pair. */
  atZero(value?: string): boolean {
    if (this.done || this.t.codes[this.i] !== 0) return false;
    return value === undefined || this.t.is(this.i, 0, value);
  }
  /** Moves to the next `0` pair. */
  skipToZero(): void {
    do this.i++;
    while (!this.done && this.t.codes[this.i] !== 0);
  }
}

function readEntity(w: Walk): EntityRecord {
  const t = w.t;
  const at = w.i;
  const rec: EntityRecord = { type: t.value(at), at, end: at, line: t.line(at), paperSpace: false, children: [] };
  w.skipToZero();
  (rec as { end: number }).end = w.i;
  for (let k = at + 1; k < w.i; k++) {
    const c = t.codes[k];
    if (c === 5) rec.handle ??= t.value(k);
    else if (c === 8) rec.layer ??= t.value(k);
    else if (c === 67) rec.paperSpace = t.value(k) !== '0';
  }
  return rec;
}

/**
 * Entities up to (not including) a `0 <stop>` pair or the end of the section. POLYLINE takes the
 * VERTEX entities after it up to its SEQEND, which must come; INSERT takes any ATTRIB entities and
 * their SEQEND.
 */
function readEntities(w: Walk, stop: string, out: EntityRecord[]): void {
  while (!w.done && !w.atZero(stop) && !w.atZero('ENDSEC') && !w.atZero('EOF')) {
    if (w.t.codes[w.i] !== 0) {
      w.skipToZero();
      continue;
    }
    const e = readEntity(w);
    out.push(e);
    if (e.type === 'POLYLINE') {
      while (w.atZero('VERTEX')) e.children.push(readEntity(w));
      if (w.atZero('SEQEND')) readEntity(w);
      else if (!w.done) {
        const found = w.t.value(w.i);
        throw new DxfError('MALFORMED', w.file, `${entityLabel(e)}: POLYLINE not ended by SEQEND (found ${found} at line ${w.t.line(w.i)})`);
      }
    } else if (e.type === 'INSERT') {
      while (w.atZero('ATTRIB')) e.children.push(readEntity(w));
      if (e.children.length && w.atZero('SEQEND')) readEntity(w);
    }
  }
}

function readBlock(w: Walk, blocks: Map<string, BlockRecord>): void {
  const t = w.t;
  const head = w.i;
  w.skipToZero();
  let name = '';
  let flags = 0;
  for (let k = head + 1; k < w.i; k++) {
    if (t.codes[k] === 2 || (t.codes[k] === 3 && !name)) name = t.value(k);
    else if (t.codes[k] === 70) flags = Number.parseInt(t.value(k), 10) || 0;
  }
  const block: BlockRecord = { name, line: t.line(head), flags, head: { at: head, end: w.i }, entities: [] };
  readEntities(w, 'ENDBLK', block.entities);
  if (!w.atZero('ENDBLK')) {
    if (w.done) return; // truncated: reported by the caller
    throw new DxfError('MALFORMED', w.file, `BLOCK ${JSON.stringify(name)} (line ${block.line}) not ended by ENDBLK`);
  }
  w.skipToZero();
  const key = name.toUpperCase();
  // A name defined twice: the first definition is the one CAD programs keep.
  if (name && !blocks.has(key)) blocks.set(key, block);
}

function readLayer(w: Walk, layers: Map<string, LayerRecord>): void {
  const t = w.t;
  const head = w.i;
  w.skipToZero();
  let name: string | undefined;
  let flags = 0;
  let colour = 7;
  for (let k = head + 1; k < w.i; k++) {
    if (t.codes[k] === 2) name ??= t.value(k);
    else if (t.codes[k] === 70) flags = Number.parseInt(t.value(k), 10) || 0;
    else if (t.codes[k] === 62) colour = Number.parseInt(t.value(k), 10) || 0;
  }
  if (name !== undefined) layers.set(name.toUpperCase(), { name, frozen: (flags & 1) !== 0, off: colour < 0 });
}

/**
 * Sections of the file: `$INSUNITS` from HEADER, LAYER records from TABLES, block definitions from
 * BLOCKS, entities from ENTITIES; other sections skipped. Refuses a SECTION without a name, a
 * POLYLINE without SEQEND, a BLOCK without ENDBLK, and a file cut before `0 EOF`.
 */
export function readStructure(tags: Tags, complete: boolean, file: string): DxfStructure {
  const w = new Walk(tags, file);
  const layers = new Map<string, LayerRecord>();
  const blocks = new Map<string, BlockRecord>();
  const entities: EntityRecord[] = [];
  let insunits: number | undefined;
  let section = '';

  while (!w.done && !w.atZero('EOF')) {
    if (!w.atZero('SECTION')) {
      w.skipToZero();
      continue;
    }
    const at = w.i;
    w.i++;
    if (w.done || tags.codes[w.i] !== 2) throw new DxfError('MALFORMED', file, `line ${tags.line(at)}: SECTION without a name`);
    section = tags.value(w.i);
    w.i++;
    while (!w.done && !w.atZero('ENDSEC') && !w.atZero('EOF')) {
      if (section === 'HEADER') {
        // $INSUNITS is `9 $INSUNITS` then `70 <code>`.
        if (tags.is(w.i, 9, '$INSUNITS') && tags.codes[w.i + 1] === 70) insunits = Number.parseInt(tags.value(w.i + 1), 10);
        w.i++;
      } else if (section === 'TABLES' && w.atZero('LAYER')) readLayer(w, layers);
      else if (section === 'BLOCKS' && w.atZero('BLOCK')) readBlock(w, blocks);
      else if (section === 'ENTITIES') readEntities(w, 'ENDSEC', entities);
      else w.skipToZero();
    }
    if (w.atZero('ENDSEC')) {
      section = '';
      w.i++;
    }
  }
  if (!complete) {
    const where = section ? `inside the ${section} section` : 'after the last section';
    throw new DxfError('TRUNCATED', file, `file ends at line ${tags.line(tags.count)} ${where} without the EOF marker: truncated?`);
  }
  return { tags, insunits, layers, blocks, entities };
}
