import { DxfError } from './errors';

/** Where an entity comes from, for messages: type, handle (group 5), layer (group 8), line of its "0" group. */
export interface EntitySource {
  readonly type: string;
  readonly handle?: string;
  readonly layer?: string;
  readonly line?: number;
}

/** "LINE (handle 1F, layer 0, line 42)". */
export function entityLabel(s: EntitySource): string {
  const bits = [
    s.handle !== undefined ? `handle ${s.handle}` : '',
    s.layer !== undefined ? `layer ${s.layer}` : '',
    s.line !== undefined ? `line ${s.line}` : '',
  ].filter(Boolean);
  return bits.length ? `${s.type} (${bits.join(', ')})` : s.type;
}

/** What the raw scan saw of one entity of the ENTITIES section (the parser drops some of it). */
export interface RawEntity extends EntitySource {
  readonly line: number;
  handle?: string;
  layer?: string;
  paperSpace: boolean;
  /** Extrusion direction, groups 210/220/230 (dxf-parser drops it for CIRCLE). */
  extrusion: { x?: number; y?: number; z?: number };
  /** Number of group-10 points (LWPOLYLINE vertices). */
  points: number;
  /** Group 90 (LWPOLYLINE vertex count), if present. */
  count?: number;
  /** Group 91 present: vertex identifiers, which dxf-parser mishandles. */
  vertexIds: boolean;
}

export interface RawScan {
  /** Top-level entities of ENTITIES in file order (VERTEX and SEQEND folded into their POLYLINE). */
  readonly entities: RawEntity[];
  readonly sections: string[];
  /** `$INSUNITS` from the HEADER section, if present. */
  readonly insunits?: number;
}

/** Entity types whose coordinates Keelson reads: their numbers must be finite. */
const GEOMETRY_TYPES = new Set(['LINE', 'ARC', 'CIRCLE', 'LWPOLYLINE']);

const isFloatCode = (c: number) => (c >= 10 && c <= 59) || (c >= 110 && c <= 149) || (c >= 210 && c <= 239);

function printable(s: string): string {
  const t = s.slice(0, 24).replace(/[^\x20-\x7e]/g, '?');
  return JSON.stringify(s.length > 24 ? t + '…' : t);
}

/**
 * One linear pass over the group-code/value pairs of an ASCII DXF, before the parser sees it:
 * refuses what is not DXF, binary DXF, truncated files, non-integer group codes, non-finite numbers
 * in the entities Keelson reads, and a POLYLINE not followed by VERTEX/SEQEND (dxf-parser loops
 * forever on it); lists the entities of the ENTITIES section with what the parser drops.
 */
export function scanDxf(text: string, file: string): RawScan {
  if (/^\s*$/.test(text)) throw new DxfError('EMPTY_FILE', file, 'file is empty');
  if (text.startsWith('AutoCAD Binary DXF'))
    throw new DxfError('BINARY_DXF', file, 'binary DXF is not supported: save the drawing as ASCII DXF');
  const head = text.slice(0, 4096);
  const firstLine = head.trimStart().split(/\r\n|\r|\n/, 1)[0]!.trim();
  if (head.includes('\0') || !/^-?\d+$/.test(firstLine))
    throw new DxfError('NOT_DXF', file, `not a DXF file: it starts with ${printable(firstLine)}, not a group code`);

  const entities: RawEntity[] = [];
  const sections: string[] = [];
  const eol = /\r\n|\r|\n/g;
  let pos = 0;
  let lineNo = 0;
  const nextLine = (): string | undefined => {
    if (pos > text.length) return undefined;
    eol.lastIndex = pos;
    const m = eol.exec(text);
    const end = m ? m.index : text.length;
    const s = text.slice(pos, end);
    pos = m ? end + m[0].length : text.length + 1;
    lineNo++;
    return s;
  };

  let section: string | null = null;
  let expectSectionName = false;
  let inPolyline = false; // after POLYLINE or VERTEX: the next "0" must be VERTEX or SEQEND
  let polyline: EntitySource | null = null;
  let current: RawEntity | null = null;
  let eof = false;
  let insunits: number | undefined;
  let headerVar = '';

  for (;;) {
    const codeLine = nextLine();
    if (codeLine === undefined || (codeLine.trim() === '' && pos > text.length)) break;
    const codeAt = lineNo;
    const value = nextLine();
    if (value === undefined) break;
    const codeText = codeLine.trim();
    if (!/^-?\d+$/.test(codeText))
      throw new DxfError(
        sections.length ? 'MALFORMED' : 'NOT_DXF',
        file,
        `line ${codeAt}: expected a group code, found ${printable(codeText)}`,
      );
    const code = Number(codeText);
    const v = value.trim();

    if (code === 0) {
      if (expectSectionName) throw new DxfError('MALFORMED', file, `line ${codeAt}: SECTION without a name`);
      if (inPolyline && v !== 'VERTEX' && v !== 'SEQEND')
        throw new DxfError('MALFORMED', file, `${entityLabel(polyline!)}: POLYLINE not ended by SEQEND (found ${v} at line ${codeAt})`);
      inPolyline = (section === 'ENTITIES' || section === 'BLOCKS') && (v === 'POLYLINE' || (inPolyline && v === 'VERTEX'));
      current = null;
      if (v === 'EOF') {
        eof = true;
        break;
      }
      if (v === 'SECTION') expectSectionName = true;
      else if (v === 'ENDSEC') section = null;
      else if (section === 'ENTITIES' && v !== 'VERTEX' && v !== 'SEQEND') {
        current = { type: v, line: codeAt, paperSpace: false, extrusion: {}, points: 0, vertexIds: false };
        entities.push(current);
      }
      if (v === 'POLYLINE') polyline = current ?? { type: v, line: codeAt };
      continue;
    }
    if (expectSectionName) {
      if (code !== 2) throw new DxfError('MALFORMED', file, `line ${codeAt}: SECTION without a name`);
      section = v;
      sections.push(v);
      expectSectionName = false;
      continue;
    }
    if (section === 'HEADER') {
      if (code === 9) headerVar = v;
      else if (headerVar === '$INSUNITS' && code === 70) insunits = Number.parseInt(v, 10);
      continue;
    }
    if (!current) continue;
    if (code === 5) current.handle ??= v;
    else if (code === 8) current.layer ??= v;
    else if (code === 67) current.paperSpace = Number(v) !== 0;
    else if (code === 210) current.extrusion.x = Number.parseFloat(v);
    else if (code === 220) current.extrusion.y = Number.parseFloat(v);
    else if (code === 230) current.extrusion.z = Number.parseFloat(v);
    else if (code === 10) current.points++;
    else if (code === 90) current.count = Number.parseInt(v, 10);
    else if (code === 91) current.vertexIds = true;
    if (GEOMETRY_TYPES.has(current.type) && isFloatCode(code) && !Number.isFinite(Number.parseFloat(v)))
      throw new DxfError('NON_FINITE', file, `${entityLabel(current)}: group ${code} at line ${codeAt + 1} is ${printable(v)}, not a finite number`);
  }

  if (!sections.length) throw new DxfError('NOT_DXF', file, 'not a DXF file: no SECTION found');
  if (!eof) {
    const where = section ? `inside the ${section} section` : 'after the last section';
    throw new DxfError('TRUNCATED', file, `file ends at line ${lineNo} ${where} without the EOF marker: truncated?`);
  }
  for (const e of entities) if (e.type === 'LWPOLYLINE') checkLwpolyline(e, file);
  return { entities, sections, insunits };
}

/** dxf-parser keeps only the last vertex when vertex ids (91) are present and throws without a count (90). */
function checkLwpolyline(e: RawEntity, file: string): void {
  const why = e.vertexIds
    ? 'vertex identifiers (group 91) are not supported'
    : e.count === undefined
      ? 'no vertex count (group 90)'
      : e.count !== e.points
        ? `vertex count (group 90) is ${e.count} but ${e.points} vertices follow`
        : '';
  if (why) throw new DxfError('MALFORMED', file, `${entityLabel(e)}: ${why}`);
}
