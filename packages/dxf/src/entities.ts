import { TAU, arc, arcFromCentre, line, transformSegment, type Point, type Segment } from '@keelson/geometry';
import { DxfError } from './errors';
import { isIdentity, ocsToWorld } from './ocs';
import type { ParsedEntity } from './parse';
import { entityLabel, type EntitySource, type RawEntity } from './scan';

/** A segment in world x, y and the entity it came from. */
export interface Piece {
  readonly seg: Segment;
  readonly src: EntitySource;
}

/** Entity types whose geometry Keelson reads; everything else is counted and reported. */
export const READ_TYPES: ReadonlySet<string> = new Set(['LINE', 'ARC', 'CIRCLE', 'LWPOLYLINE']);

/** Reads one entity's numbers, failing with the entity named. */
class Reader {
  constructor(
    readonly e: ParsedEntity,
    readonly src: EntitySource,
    readonly file: string,
  ) {}

  fail(code: 'NON_FINITE' | 'INVALID_ENTITY', why: string): never {
    throw new DxfError(code, this.file, `${entityLabel(this.src)}: ${why}`);
  }

  num(v: unknown, what: string): number {
    if (typeof v !== 'number') this.fail('INVALID_ENTITY', `${what} is missing`);
    if (!Number.isFinite(v)) this.fail('NON_FINITE', `${what} is ${v}, not a finite number`);
    return v;
  }

  point(p: unknown, what: string): Point {
    const o = (p ?? {}) as { x?: unknown; y?: unknown };
    if (p === undefined) this.fail('INVALID_ENTITY', `${what} is missing`);
    return { x: this.num(o.x, `${what} x`), y: this.num(o.y, `${what} y`) };
  }

  radius(v: unknown): number {
    const r = this.num(v, 'radius');
    if (!(r > 0)) this.fail('INVALID_ENTITY', `radius ${r} is not positive`);
    return r;
  }

  /** OCS → world map; the entity must lie in a plane parallel to the world xy-plane. */
  plane(n: { x?: number; y?: number; z?: number }): (s: Segment) => Segment {
    const t = ocsToWorld(n);
    if (!t)
      this.fail('INVALID_ENTITY', `not drawn in the xy-plane (extrusion direction ${n.x ?? 0}, ${n.y ?? 0}, ${n.z ?? 1})`);
    return isIdentity(t) ? (s) => s : (s) => transformSegment(t, s);
  }
}

/** Counter-clockwise sweep from `start` to `end` (radians) within (0, 2π]: an ARC from 350° to 10° turns 20°. */
export function ccwSweep(start: number, end: number): number {
  const w = (((end - start) % TAU) + TAU) % TAU;
  // Equal angles (0° to 360°) draw the whole circle.
  return w <= 1e-12 ? TAU : w;
}

/**
 * The arc from p to q of a polyline vertex with bulge b = tan(sweep/4), sweep signed
 * (positive counter-clockwise). The centre lies on the chord's perpendicular bisector at
 * d(1 − b²)/(4b) to the left of p→q (AutoCAD DXF Reference, LWPOLYLINE group 42).
 */
export function bulgeSegment(p: Point, q: Point, b: number): Segment {
  if (b === 0 || (p.x === q.x && p.y === q.y)) return line(p, q);
  const dx = q.x - p.x;
  const dy = q.y - p.y;
  const k = (1 - b * b) / (4 * b);
  const c = { x: (p.x + q.x) / 2 - dy * k, y: (p.y + q.y) / 2 + dx * k };
  return arcFromCentre(c, p, 4 * Math.atan(b));
}

interface Vertex {
  x?: unknown;
  y?: unknown;
  bulge?: unknown;
  startWidth?: unknown;
  endWidth?: unknown;
}

function extrusionOf(e: ParsedEntity, raw: RawEntity | undefined): { x?: number; y?: number; z?: number } {
  if (raw) return raw.extrusion;
  const n = (k: string) => (typeof e[k] === 'number' ? (e[k] as number) : undefined);
  return { x: n('extrusionDirectionX'), y: n('extrusionDirectionY'), z: n('extrusionDirectionZ') };
}

/**
 * Segments of one LINE, ARC, CIRCLE or LWPOLYLINE in world coordinates (OCS applied to ARC,
 * CIRCLE and LWPOLYLINE; LINE is stored in world coordinates). Widths are ignored, with a warning.
 */
export function entitySegments(e: ParsedEntity, src: EntitySource, raw: RawEntity | undefined, file: string, warnings: string[]): Segment[] {
  const r = new Reader(e, src, file);
  switch (e.type) {
    case 'LINE': {
      const v = Array.isArray(e.vertices) ? (e.vertices as unknown[]) : [];
      if (v.length !== 2) r.fail('INVALID_ENTITY', 'start or end point is missing');
      return [line(r.point(v[0], 'start point'), r.point(v[1], 'end point'))];
    }
    case 'ARC': {
      const c = r.point(e.center, 'centre');
      const rad = r.radius(e.radius);
      const a0 = r.num(e.startAngle, 'start angle');
      const a1 = r.num(e.endAngle, 'end angle');
      return [r.plane(extrusionOf(e, raw))(arc(c, rad, a0, ccwSweep(a0, a1)))];
    }
    case 'CIRCLE': {
      const c = r.point(e.center, 'centre');
      // dxf-parser drops a CIRCLE's extrusion direction: it comes from the raw scan.
      return [r.plane(extrusionOf(e, raw))(arc(c, r.radius(e.radius), 0, TAU))];
    }
    case 'LWPOLYLINE': {
      const vs = (Array.isArray(e.vertices) ? e.vertices : []) as Vertex[];
      const pts = vs.map((v, i) => r.point(v, `vertex ${i + 1}`));
      const bulges = vs.map((v, i) => (v.bulge === undefined ? 0 : r.num(v.bulge, `bulge of vertex ${i + 1}`)));
      const wide = (typeof e.width === 'number' && e.width !== 0) || vs.some((v) => Boolean(v.startWidth) || Boolean(v.endWidth));
      if (wide) warnings.push(`${entityLabel(src)} has a width: its centreline is used`);
      const closed = e.shape === true;
      const toWorld = r.plane(extrusionOf(e, raw));
      const segs: Segment[] = [];
      const n = closed ? pts.length : pts.length - 1;
      for (let i = 0; i < n; i++) segs.push(toWorld(bulgeSegment(pts[i]!, pts[(i + 1) % pts.length]!, bulges[i]!)));
      return segs;
    }
    default:
      return [];
  }
}
