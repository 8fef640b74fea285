import { GeometryError, TAU, startPoint, type EllipseSegment, type Loop, type Point, type Region } from '@keelson/geometry';
import { writeEntity, type DxfEntity } from './write-entity';
import { TagWriter } from './write-tags';

export type { DxfEntity, DxfHatchEdge, DxfHatchPath, DxfNormal, DxfVertex } from './write-entity';

/** Drawing units the writer can declare in `$INSUNITS`. */
export type DxfUnit = 'mm' | 'cm' | 'm' | 'in' | 'ft';

/** `$INSUNITS` codes (AutoCAD DXF Reference, HEADER section: 1 inches, 2 feet, 4 mm, 5 cm, 6 m). */
export const INSUNITS: Readonly<Record<DxfUnit, number>> = { in: 1, ft: 2, mm: 4, cm: 5, m: 6 };

/**
 * How loops become entities: `polyline` writes each loop as one closed LWPOLYLINE with bulges,
 * `entities` as loose LINE and ARC entities. A loop that is one full circle is a CIRCLE either way.
 */
export type DxfStyle = 'polyline' | 'entities';

export interface WriteDxfOptions {
  unit: DxfUnit;
  /** Layer of every entity; default "0". */
  layer?: string;
  style?: DxfStyle;
}

const DEG = 180 / Math.PI;

/** Angle in degrees within [0, 360). */
function degrees(rad: number): number {
  const d = (rad * DEG) % 360;
  const n = d < 0 ? d + 360 : d;
  return n >= 360 ? 0 : n;
}

function fullCircle(loop: Loop): { c: Point; r: number } | null {
  const s = loop[0];
  if (loop.length !== 1 || s?.kind !== 'arc' || Math.abs(Math.abs(s.sweep) - TAU) > 1e-12 * TAU) return null;
  return { c: s.c, r: s.r };
}

/**
 * DXF states an ellipse by its major axis, the minor/major ratio and a counter-clockwise parameter
 * run. Our conjugate semi-diameters must be perpendicular for that; the parameter is shifted a
 * quarter turn when v is the longer one, and negated when the frame is mirrored.
 */
function ellipseEntity(s: EllipseSegment): DxfEntity {
  const lu = Math.hypot(s.u.x, s.u.y);
  const lv = Math.hypot(s.v.x, s.v.y);
  if (Math.abs(s.u.x * s.v.x + s.u.y * s.v.y) > 1e-12 * lu * lv)
    throw new GeometryError('INVALID_SEGMENT', 'DXF ELLIPSE needs perpendicular axes; this elliptical arc is sheared');
  // p = c + u cos t + v sin t = c + v cos(t − π/2) − u sin(t − π/2)
  const [major, minor, shift] = lu >= lv ? [s.u, s.v, 0] : [s.v, { x: -s.u.x, y: -s.u.y }, -Math.PI / 2];
  const mirrored = major.x * minor.y - major.y * minor.x < 0;
  let start = s.start + shift;
  let sweep = s.sweep;
  if (mirrored) {
    start = -start;
    sweep = -sweep;
  }
  if (sweep < 0) {
    start += sweep;
    sweep = -sweep;
  }
  const full = Math.abs(sweep - TAU) <= 1e-12 * TAU;
  const a = full ? 0 : ((start % TAU) + TAU) % TAU;
  return { type: 'ELLIPSE', c: s.c, major, ratio: Math.min(lu, lv) / Math.max(lu, lv), startParam: a, endParam: full ? TAU : a + sweep };
}

function curveEntity(s: Loop[number]): DxfEntity {
  if (s.kind === 'line') return { type: 'LINE', a: s.a, b: s.b };
  if (s.kind === 'ellipse') return ellipseEntity(s);
  if (s.kind === 'spline') return { type: 'SPLINE', spline: s };
  // A clockwise arc is the counter-clockwise arc from its end to its start.
  const [from, to] = s.sweep > 0 ? [s.start, s.start + s.sweep] : [s.start + s.sweep, s.start];
  return { type: 'ARC', c: s.c, r: s.r, startDeg: degrees(from), endDeg: degrees(to) };
}

function loopEntities(loop: Loop, style: DxfStyle): DxfEntity[] {
  const circle = fullCircle(loop);
  if (circle) return [{ type: 'CIRCLE', ...circle }];
  // LWPOLYLINE holds only lines and circular arcs; loops with other curves are written loose.
  if (style === 'polyline' && loop.every((s) => s.kind === 'line' || s.kind === 'arc')) {
    const vertices = loop.map((s) => ({ ...startPoint(s), bulge: s.kind === 'arc' ? Math.tan(s.sweep / 4) : 0 }));
    return [{ type: 'LWPOLYLINE', vertices }];
  }
  return loop.map(curveEntity);
}

/**
 * The entities that draw a region's loops (outer loops first, then each part's holes), in loop
 * order and direction. Exposed so callers can reorder or restyle them before `writeDxfEntities`.
 */
export function regionEntities(region: Region, style: DxfStyle = 'polyline'): DxfEntity[] {
  return region.parts.flatMap((p) => [p.outer, ...p.holes].flatMap((l) => loopEntities(l, style)));
}

function checkName(what: string, name: string): void {
  // Symbol names may not contain < > / \ " : ; ? * | = ` (AutoCAD symbol-table naming rules) nor line breaks.
  if (name === '' || /[<>/\\":;?*|=`\r\n]/.test(name)) throw new RangeError(`invalid DXF ${what} name ${JSON.stringify(name)}`);
}

/** A layer of the LAYER table: frozen (group 70 bit 1) or switched off (negative colour). */
export interface DxfLayer {
  readonly name: string;
  readonly frozen?: boolean;
  readonly off?: boolean;
}

/** A block definition: its entities in block coordinates, inserted relative to `base`. */
export interface DxfBlock {
  readonly name: string;
  readonly base?: Point;
  readonly entities: readonly DxfEntity[];
}

export interface DxfDrawing {
  readonly unit: DxfUnit;
  /** `$INSUNITS` written as this code instead (0 unitless), or left out (null); default the unit's code. */
  readonly insunits?: number | null;
  /** Layers beyond "0", with their state; every layer an entity names should be listed. */
  readonly layers?: readonly DxfLayer[];
  readonly blocks?: readonly DxfBlock[];
  /** Entities of model space; entities without a layer go on "0". */
  readonly entities: readonly DxfEntity[];
}

/**
 * ASCII DXF (AutoCAD 2000, AC1015): HEADER with `$ACADVER`, `$INSUNITS`, `$MEASUREMENT` and
 * `$HANDSEED`; TABLES with the CONTINUOUS line type, the layers and (when there are blocks) their
 * BLOCK_RECORD entries; BLOCKS; ENTITIES; EOF. Numbers are written in the shortest form that reads
 * back exactly.
 */
export function writeDxfDrawing(d: DxfDrawing): string {
  const layers: DxfLayer[] = [{ name: '0' }, ...(d.layers ?? []).filter((l) => l.name !== '0')];
  layers.forEach((l) => checkName('layer', l.name));
  const blocks = d.blocks ?? [];
  blocks.forEach((b) => checkName('block', b.name));
  const body = new TagWriter();
  if (blocks.length) {
    body.tag(0, 'SECTION').tag(2, 'BLOCKS');
    for (const b of blocks) {
      body.tag(0, 'BLOCK').nextHandle().tag(100, 'AcDbEntity').tag(8, '0').tag(100, 'AcDbBlockBegin');
      body.tag(2, b.name).tag(70, 0).point(10, b.base ?? { x: 0, y: 0 }).tag(3, b.name).tag(1, '');
      for (const e of b.entities) writeEntity(body, e, '0');
      body.tag(0, 'ENDBLK').nextHandle().tag(100, 'AcDbEntity').tag(8, '0').tag(100, 'AcDbBlockEnd');
    }
    body.tag(0, 'ENDSEC');
  }
  body.tag(0, 'SECTION').tag(2, 'ENTITIES');
  for (const e of d.entities) writeEntity(body, e, '0');

  const t = new TagWriter();
  t.tag(0, 'SECTION').tag(2, 'HEADER');
  t.tag(9, '$ACADVER').tag(1, 'AC1015');
  const insunits = d.insunits === undefined ? INSUNITS[d.unit] : d.insunits;
  if (insunits !== null) t.tag(9, '$INSUNITS').tag(70, insunits);
  t.tag(9, '$MEASUREMENT').tag(70, d.unit === 'in' || d.unit === 'ft' ? 0 : 1);
  t.tag(9, '$HANDSEED').tag(5, body.handseed);
  t.tag(0, 'ENDSEC');

  t.tag(0, 'SECTION').tag(2, 'TABLES');
  t.tag(0, 'TABLE').tag(2, 'LTYPE').tag(5, '5').tag(100, 'AcDbSymbolTable').tag(70, 1);
  t.tag(0, 'LTYPE').tag(5, '14').tag(100, 'AcDbSymbolTableRecord').tag(100, 'AcDbLinetypeTableRecord');
  t.tag(2, 'CONTINUOUS').tag(70, 0).tag(3, 'Solid line').tag(72, 65).tag(73, 0).tag(40, 0);
  t.tag(0, 'ENDTAB');
  t.tag(0, 'TABLE').tag(2, 'LAYER').tag(5, '2').tag(100, 'AcDbSymbolTable').tag(70, layers.length);
  layers.forEach((l, i) => {
    t.tag(0, 'LAYER').tag(5, (0x10 + i).toString(16).toUpperCase());
    t.tag(100, 'AcDbSymbolTableRecord').tag(100, 'AcDbLayerTableRecord');
    // Frozen: flag 70 bit 1; off: a negative colour number.
    t.tag(2, l.name).tag(70, l.frozen ? 1 : 0).tag(62, l.off ? -7 : 7).tag(6, 'CONTINUOUS');
  });
  t.tag(0, 'ENDTAB');
  if (blocks.length) {
    t.tag(0, 'TABLE').tag(2, 'BLOCK_RECORD').tag(5, '1').tag(100, 'AcDbSymbolTable').tag(70, blocks.length);
    blocks.forEach((b, i) => {
      t.tag(0, 'BLOCK_RECORD').tag(5, (0x18 + i).toString(16).toUpperCase());
      t.tag(100, 'AcDbSymbolTableRecord').tag(100, 'AcDbBlockTableRecord').tag(2, b.name);
    });
    t.tag(0, 'ENDTAB');
  }
  t.tag(0, 'ENDSEC');
  return t.text() + body.text() + new TagWriter().tag(0, 'ENDSEC').tag(0, 'EOF').text();
}

/** ASCII DXF holding the given entities on one layer (see `writeDxfDrawing`). */
export function writeDxfEntities(entities: readonly DxfEntity[], opts: Omit<WriteDxfOptions, 'style'>): string {
  const layer = opts.layer ?? '0';
  checkName('layer', layer);
  return writeDxfDrawing({ unit: opts.unit, layers: [{ name: layer }], entities: entities.map((e) => ({ ...e, layer: e.layer ?? layer })) });
}

/** ASCII DXF of a region: see `regionEntities` for the drawing style, `writeDxfEntities` for the file. */
export function writeDxf(region: Region, opts: WriteDxfOptions): string {
  return writeDxfEntities(regionEntities(region, opts.style ?? 'polyline'), opts);
}
