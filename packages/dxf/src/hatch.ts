import { TAU, arc, ellipse, line, type Point, type Segment } from '@keelson/geometry';
import { ccwSweep } from './entities';
import type { Fields } from './fields';
import { planeOf } from './ocs';
import { bulgeSegment } from './polyline';
import { entityLabel } from './source';
import { checkNurbs } from './spline';

const DEG = Math.PI / 180;

/** Reads a HATCH's pairs in order: its group codes repeat (10 is a seed point, a vertex, a centre…), so only position tells them apart. */
class Cursor {
  k: number;
  constructor(
    readonly f: Fields,
    start: number,
    private where = '',
  ) {
    this.k = start;
  }

  /** Code of the next pair, undefined past the entity's end. */
  code(): number | undefined {
    return this.k < this.f.end ? this.f.tags.codes[this.k] : undefined;
  }

  at(where: string): this {
    this.where = where;
    return this;
  }

  take(code: number, what: string): number {
    if (this.code() !== code) {
      const found = this.code() === undefined ? 'the end of the entity' : `group ${this.code()}`;
      this.f.fail('MALFORMED', `${this.where}: expected ${what} (group ${code}) at line ${this.f.tags.line(this.k)}, found ${found}`);
    }
    return this.f.numAt(this.k++);
  }

  count(code: number, what: string): number {
    const n = this.take(code, what);
    if (!Number.isInteger(n) || n < 0) this.f.fail('MALFORMED', `${this.where}: ${what} (group ${code}) is ${n}`);
    return n;
  }

  maybe(code: number): number | undefined {
    return this.code() === code ? this.f.numAt(this.k++) : undefined;
  }

  point(code: number, what: string): Point {
    return { x: this.take(code, `${what} x`), y: this.take(code + 10, `${what} y`) };
  }
}

/**
 * Parameter of the point of an ellipse (minor/major `ratio`) seen at angle θ from its centre,
 * measured from the major axis: tan t = tan θ / ratio. HATCH elliptic edges store angles, where the
 * ELLIPSE entity stores parameters.
 */
const paramOfAngle = (theta: number, ratio: number) => Math.atan2(Math.sin(theta), ratio * Math.cos(theta));

/**
 * Edge of a HATCH edge path (AutoCAD DXF Reference, HATCH "Boundary path data"): 1 line, 2
 * circular arc, 3 elliptic arc, 4 spline. Arcs give angles in degrees with a counter-clockwise
 * flag (73); a clockwise arc is stored with its angles negated, i.e. it runs clockwise from −start
 * to −end (ezdxf 1.4.4 reads and writes them so: "complementary angles", boundary_paths.py; the
 * fixtures in fixtures/import/ezdxf were written by it).
 */
function edge(c: Cursor): Segment {
  const type = c.take(72, 'edge type');
  switch (type) {
    case 1:
      return line(c.point(10, 'line start'), c.point(11, 'line end'));
    case 2: {
      const centre = c.point(10, 'arc centre');
      const r = c.take(40, 'arc radius');
      if (!(r > 0)) c.f.fail('INVALID_ENTITY', `arc edge radius ${r} is not positive`);
      const [a0, a1] = [c.take(50, 'arc start angle') * DEG, c.take(51, 'arc end angle') * DEG];
      const ccw = c.take(73, 'arc direction flag') !== 0;
      const sweep = ccwSweep(a0, a1);
      return ccw ? arc(centre, r, a0, sweep) : arc(centre, r, -a0, -sweep);
    }
    case 3: {
      const centre = c.point(10, 'ellipse centre');
      const m = c.point(11, 'ellipse major axis');
      const ratio = c.take(40, 'ellipse axis ratio');
      if (!(ratio > 0) || !(Math.hypot(m.x, m.y) > 0)) c.f.fail('INVALID_ENTITY', 'elliptic edge has a zero axis');
      const [a0, a1] = [c.take(50, 'ellipse start angle') * DEG, c.take(51, 'ellipse end angle') * DEG];
      const ccw = c.take(73, 'ellipse direction flag') !== 0;
      const v = { x: -ratio * m.y, y: ratio * m.x };
      const t0 = paramOfAngle(a0, ratio);
      const sweep = ccwSweep(a0, a1) === TAU ? TAU : ccwSweep(t0, paramOfAngle(a1, ratio));
      return ccw ? ellipse(centre, m, v, t0, sweep) : ellipse(centre, m, v, -t0, -sweep);
    }
    case 4:
      return splineEdge(c);
    default:
      return c.f.fail('MALFORMED', `unknown boundary edge type ${type}`);
  }
}

/** Spline edge: degree, rational and periodic flags, knots, control points with weights (42) when rational, then optional fit data. */
function splineEdge(c: Cursor): Segment {
  const degree = c.take(94, 'spline degree');
  const rational = c.take(73, 'spline rational flag') !== 0;
  c.take(74, 'spline periodic flag');
  const nk = c.count(95, 'knot count');
  const nc = c.count(96, 'control point count');
  const knots: number[] = [];
  for (let i = 0; i < nk; i++) knots.push(c.take(40, 'knot'));
  const controls = [];
  for (let i = 0; i < nc; i++) {
    const p = c.point(10, 'control point');
    controls.push({ ...p, w: (rational ? c.maybe(42) : undefined) ?? 1 });
  }
  // Fit data (since AutoCAD 2010): its count shares group 97 with the path's source-object count
  // that follows the last edge; a fit count is followed by fit points, tangents or the next edge.
  const next = c.f.tags.codes[c.k + 1];
  if (c.code() === 97 && (next === 11 || next === 12 || next === 13 || next === 97 || next === 72)) {
    const nf = c.count(97, 'fit point count');
    for (let i = 0; i < nf; i++) c.point(11, 'fit point');
    if (c.code() === 12) c.point(12, 'start tangent');
    if (c.code() === 13) c.point(13, 'end tangent');
  }
  return checkNurbs(c.f, 'spline edge', degree, knots, controls);
}

export interface HatchBoundary {
  /** Segments of each boundary path, world (or block) coordinates, in path order. */
  readonly paths: Segment[][];
}

/**
 * Boundary paths of a HATCH, read from its pairs (dxf-parser has no HATCH): polyline paths
 * (flag 2) with bulges, and edge paths of lines, circular and elliptic arcs and splines, all in
 * the hatch's OCS. Text-box paths (flag 8) are outlines around text inside a hatch, not section
 * boundaries: left out with a warning. Styles other than "normal" (odd parity) are read as normal.
 */
export function hatchBoundary(f: Fields, warnings: string[]): HatchBoundary {
  const start = f.find(91);
  if (start < 0) f.fail('INVALID_ENTITY', 'has no boundary path count (group 91)');
  const c = new Cursor(f, start, 'boundary');
  const n = c.count(91, 'boundary path count');
  const toWorld = planeOf(f);
  const paths: Segment[][] = [];
  let textBoxes = 0;
  for (let p = 1; p <= n; p++) {
    c.at(`boundary path ${p}`);
    const flags = c.take(92, 'path type flags');
    const segs: Segment[] = [];
    if (flags & 2) {
      const bulged = c.take(72, 'has-bulge flag') !== 0;
      c.take(73, 'closed flag');
      const nv = c.count(93, 'vertex count');
      const vs: { p: Point; b: number }[] = [];
      for (let i = 0; i < nv; i++) vs.push({ p: c.point(10, 'vertex'), b: (bulged ? c.maybe(42) : undefined) ?? 0 });
      // A polyline path always bounds an area: its last vertex joins its first.
      vs.forEach((v, i) => segs.push(bulgeSegment(v.p, vs[(i + 1) % vs.length]!.p, v.b)));
    } else {
      const ne = c.count(93, 'edge count');
      for (let e = 0; e < ne; e++) segs.push(edge(c));
    }
    if (c.code() === 97) {
      const sources = c.count(97, 'source object count');
      for (let i = 0; i < sources && c.code() === 330; i++) c.k++;
    }
    if (flags & 8) textBoxes++;
    else paths.push(segs.map(toWorld));
  }
  if (textBoxes) warnings.push(`${entityLabel(f.src)}: ${textBoxes} text-box boundary path(s) left out`);
  const style = f.find(75, c.k);
  if (style >= 0 && f.numAt(style) !== 0) warnings.push(`${entityLabel(f.src)}: hatch style ${f.numAt(style)} read as normal (odd parity) nesting`);
  return { paths };
}
