import {
  GeometryError,
  TAU,
  isRational,
  startPoint,
  type EllipseSegment,
  type Loop,
  type Point,
  type Region,
  type SplineSegment,
} from '@keelson/geometry';

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

/** One vertex of an LWPOLYLINE; `bulge` = tan(sweep/4) of the arc that starts here (0: a straight side). */
export interface DxfVertex {
  readonly x: number;
  readonly y: number;
  readonly bulge: number;
}

/**
 * Entities in drawing coordinates, as the file states them. ARC angles are in degrees and the arc
 * runs counter-clockwise from `startDeg` to `endDeg` (DXF has no clockwise arcs).
 */
export type DxfEntity =
  | { readonly type: 'LINE'; readonly a: Point; readonly b: Point }
  | { readonly type: 'ARC'; readonly c: Point; readonly r: number; readonly startDeg: number; readonly endDeg: number }
  | { readonly type: 'CIRCLE'; readonly c: Point; readonly r: number }
  | { readonly type: 'LWPOLYLINE'; readonly vertices: readonly DxfVertex[] }
  | {
      readonly type: 'ELLIPSE';
      readonly c: Point;
      /** Major semi-axis as a vector from the centre; the minor one is `ratio` times it turned +90°. */
      readonly major: Point;
      readonly ratio: number;
      /** Parameters (radians) of the counter-clockwise run from start to end. */
      readonly startParam: number;
      readonly endParam: number;
    }
  | { readonly type: 'SPLINE'; readonly spline: SplineSegment };

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

/** Shortest decimal that reads back as the same double (ECMAScript Number::toString). */
function num(x: number): string {
  if (!Number.isFinite(x)) throw new GeometryError('NON_FINITE', `cannot write ${x} to DXF`);
  return String(x === 0 ? 0 : x); // no "-0"
}

/** Group code / value pairs, one per line each, as ASCII DXF wants them. */
class Tags {
  private readonly out: string[] = [];
  private handle = 0x20;

  tag(code: number, value: string | number): this {
    this.out.push(String(code), typeof value === 'number' ? num(value) : value);
    return this;
  }

  /** Group 5: a fresh hexadecimal handle. */
  nextHandle(): this {
    return this.tag(5, (this.handle++).toString(16).toUpperCase());
  }

  /** Next free handle, for `$HANDSEED`. */
  get handseed(): string {
    return this.handle.toString(16).toUpperCase();
  }

  point(code: number, p: Point): this {
    return this.tag(code, p.x)
      .tag(code + 10, p.y)
      .tag(code + 20, 0);
  }

  text(): string {
    return this.out.join('\n') + '\n';
  }
}

function checkLayerName(layer: string): void {
  // Layer names may not contain < > / \ " : ; ? * | = ` (AutoCAD symbol-table naming rules) nor line breaks.
  if (layer === '' || /[<>/\\":;?*|=`\r\n]/.test(layer))
    throw new RangeError(`invalid DXF layer name ${JSON.stringify(layer)}`);
}

function writeEntity(t: Tags, e: DxfEntity, layer: string): void {
  t.tag(0, e.type).nextHandle().tag(100, 'AcDbEntity').tag(8, layer);
  switch (e.type) {
    case 'LINE':
      t.tag(100, 'AcDbLine').point(10, e.a).point(11, e.b);
      return;
    case 'CIRCLE':
      t.tag(100, 'AcDbCircle').point(10, e.c).tag(40, e.r);
      return;
    case 'ARC':
      t.tag(100, 'AcDbCircle').point(10, e.c).tag(40, e.r).tag(100, 'AcDbArc').tag(50, e.startDeg).tag(51, e.endDeg);
      return;
    case 'LWPOLYLINE':
      t.tag(100, 'AcDbPolyline').tag(90, e.vertices.length).tag(70, 1).tag(43, 0);
      for (const v of e.vertices) {
        t.tag(10, v.x).tag(20, v.y);
        if (v.bulge !== 0) t.tag(42, v.bulge);
      }
      return;
    case 'ELLIPSE':
      t.tag(100, 'AcDbEllipse').point(10, e.c).point(11, e.major).tag(40, e.ratio).tag(41, e.startParam).tag(42, e.endParam);
      return;
    case 'SPLINE': {
      const { degree, knots, controls } = e.spline;
      const rational = isRational(e.spline);
      // Flags: 8 planar, 4 rational.
      t.tag(100, 'AcDbSpline').tag(70, 8 + (rational ? 4 : 0)).tag(71, degree).tag(72, knots.length).tag(73, controls.length).tag(74, 0);
      for (const k of knots) t.tag(40, k);
      for (const c of controls) {
        t.point(10, c);
        if (rational) t.tag(41, c.w);
      }
      return;
    }
  }
}

/**
 * ASCII DXF (AutoCAD 2000, AC1015) holding the given entities on one layer: HEADER with
 * `$ACADVER`, `$INSUNITS` and `$MEASUREMENT`, TABLES with the CONTINUOUS line type and the
 * layers, ENTITIES, EOF. Numbers are written in the shortest form that reads back exactly.
 */
export function writeDxfEntities(entities: readonly DxfEntity[], opts: Omit<WriteDxfOptions, 'style'>): string {
  const layer = opts.layer ?? '0';
  checkLayerName(layer);
  const t = new Tags();
  const body = new Tags();
  for (const e of entities) writeEntity(body, e, layer);

  t.tag(0, 'SECTION').tag(2, 'HEADER');
  t.tag(9, '$ACADVER').tag(1, 'AC1015');
  t.tag(9, '$INSUNITS').tag(70, INSUNITS[opts.unit]);
  t.tag(9, '$MEASUREMENT').tag(70, opts.unit === 'in' || opts.unit === 'ft' ? 0 : 1);
  t.tag(9, '$HANDSEED').tag(5, body.handseed);
  t.tag(0, 'ENDSEC');

  t.tag(0, 'SECTION').tag(2, 'TABLES');
  t.tag(0, 'TABLE').tag(2, 'LTYPE').tag(5, '5').tag(100, 'AcDbSymbolTable').tag(70, 1);
  t.tag(0, 'LTYPE').tag(5, '14').tag(100, 'AcDbSymbolTableRecord').tag(100, 'AcDbLinetypeTableRecord');
  t.tag(2, 'CONTINUOUS').tag(70, 0).tag(3, 'Solid line').tag(72, 65).tag(73, 0).tag(40, 0);
  t.tag(0, 'ENDTAB');
  const layers = layer === '0' ? ['0'] : ['0', layer];
  t.tag(0, 'TABLE').tag(2, 'LAYER').tag(5, '2').tag(100, 'AcDbSymbolTable').tag(70, layers.length);
  layers.forEach((name, i) => {
    t.tag(0, 'LAYER').tag(5, (0x10 + i).toString(16).toUpperCase());
    t.tag(100, 'AcDbSymbolTableRecord').tag(100, 'AcDbLayerTableRecord');
    t.tag(2, name).tag(70, 0).tag(62, 7).tag(6, 'CONTINUOUS');
  });
  t.tag(0, 'ENDTAB');
  t.tag(0, 'ENDSEC');

  t.tag(0, 'SECTION').tag(2, 'ENTITIES');
  const head = t.text();
  const tail = new Tags().tag(0, 'ENDSEC').tag(0, 'EOF').text();
  return head + (entities.length > 0 ? body.text() : '') + tail;
}

/** ASCII DXF of a region: see `regionEntities` for the drawing style, `writeDxfEntities` for the file. */
export function writeDxf(region: Region, opts: WriteDxfOptions): string {
  return writeDxfEntities(regionEntities(region, opts.style ?? 'polyline'), opts);
}
