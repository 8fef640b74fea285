import { TAU, arc, line, type Affine, type Segment } from '@keelson/geometry';
import { ellipseSegment } from './ellipse';
import type { Fields } from './fields';
import { planeOf } from './ocs';
import { lwpolylineSegments, polylineSegments } from './polyline';
import { splineSegment } from './spline';

/** Entity types that draw outlines. */
export const OUTLINE_TYPES: ReadonlySet<string> = new Set(['LINE', 'ARC', 'CIRCLE', 'ELLIPSE', 'LWPOLYLINE', 'POLYLINE', 'SPLINE']);

/** Text, dimensions and the like: never part of a section, counted in the warnings. */
export const ANNOTATION_TYPES: ReadonlySet<string> = new Set([
  'TEXT',
  'MTEXT',
  'ATTRIB',
  'ATTDEF',
  'DIMENSION',
  'ARC_DIMENSION',
  'LARGE_RADIAL_DIMENSION',
  'LEADER',
  'MLEADER',
  'MULTILEADER',
  'TOLERANCE',
  'ACAD_TABLE',
  'RTEXT',
  'ARCALIGNEDTEXT',
]);

/** Points and infinite construction lines: helpers of the drafter, not outlines. */
export const CONSTRUCTION_TYPES: ReadonlySet<string> = new Set(['POINT', 'XLINE', 'RAY']);

const DEG = Math.PI / 180;

/** Counter-clockwise sweep from `start` to `end` (radians) within (0, 2π]: an ARC from 350° to 10° turns 20°. */
export function ccwSweep(start: number, end: number): number {
  const w = (((end - start) % TAU) + TAU) % TAU;
  // Equal angles (0° to 360°) draw the whole circle.
  return w <= 1e-12 ? TAU : w;
}

export function radius(f: Fields, code = 40): number {
  const r = f.num(code, 'radius');
  if (!(r > 0)) f.fail('INVALID_ENTITY', `radius ${r} is not positive`);
  return r;
}

/**
 * Segments of one outline entity in the coordinates it is placed in (the world, or its block's),
 * the entity's OCS applied: LINE, SPLINE and ELLIPSE are stored in world coordinates, ARC, CIRCLE
 * and the polylines in their OCS (AutoCAD DXF Reference, "Object Coordinate Systems").
 * Null for a POLYLINE kind that is not an outline (3D polylines, meshes).
 */
export function outlineSegments(f: Fields, type: string, children: readonly Fields[], warnings: string[]): Segment[] | null {
  switch (type) {
    case 'LINE':
      return [line(f.point(10, 'start point'), f.point(11, 'end point'))];
    case 'ARC': {
      const c = f.point(10, 'centre');
      const r = radius(f);
      const a0 = f.num(50, 'start angle') * DEG;
      const a1 = f.num(51, 'end angle') * DEG;
      return [planeOf(f)(arc(c, r, a0, ccwSweep(a0, a1)))];
    }
    case 'CIRCLE':
      return [planeOf(f)(arc(f.point(10, 'centre'), radius(f), 0, TAU))];
    case 'ELLIPSE':
      return [ellipseSegment(f)];
    case 'SPLINE':
      return [splineSegment(f)];
    case 'LWPOLYLINE':
      return lwpolylineSegments(f, warnings);
    case 'POLYLINE':
      return polylineSegments(f, children, warnings);
    default:
      throw new RangeError(`not an outline entity type: ${type}`);
  }
}

/** x' = M·x + t of `a` after `b`. */
export function compose(a: Affine, b: Affine): Affine {
  return {
    a: a.a * b.a + a.b * b.c,
    b: a.a * b.b + a.b * b.d,
    c: a.c * b.a + a.d * b.c,
    d: a.c * b.b + a.d * b.d,
    tx: a.a * b.tx + a.b * b.ty + a.tx,
    ty: a.c * b.tx + a.d * b.ty + a.ty,
  };
}
