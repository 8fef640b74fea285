import { arcFromCentre, line, type Point, type Segment } from '@keelson/geometry';
import type { Fields } from './fields';
import { planeOf } from './ocs';
import { entityLabel } from './source';

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
  readonly p: Point;
  readonly bulge: number;
}

function sides(vs: readonly Vertex[], closed: boolean, toWorld: (s: Segment) => Segment): Segment[] {
  const n = closed ? vs.length : vs.length - 1;
  const out: Segment[] = [];
  for (let i = 0; i < n; i++) out.push(toWorld(bulgeSegment(vs[i]!.p, vs[(i + 1) % vs.length]!.p, vs[i]!.bulge)));
  return out;
}

/**
 * LWPOLYLINE: vertices read pair by pair, each starting at its group 10 and holding the 20, 40, 41,
 * 42 and 91 after it (dxf-parser keeps only the last vertex when vertex identifiers, group 91, are
 * present). Closed by flag 70 bit 1; widths ignored with a warning; OCS applied.
 */
export function lwpolylineSegments(f: Fields, warnings: string[]): Segment[] {
  const { tags } = f;
  const vs: Vertex[] = [];
  let wide = f.num(43, 'constant width', 0) !== 0;
  for (let k = f.find(10); k >= 0 && k < f.end; k++) {
    const code = tags.codes[k];
    if (code === 10) {
      const y = tags.codes[k + 1] === 20 && k + 1 < f.end ? f.numAt(k + 1) : f.fail('INVALID_ENTITY', `vertex ${vs.length + 1} has no y (group 20) after line ${tags.line(k) + 1}`);
      vs.push({ p: { x: f.numAt(k), y }, bulge: 0 });
    } else if (code === 42 && vs.length) vs[vs.length - 1] = { ...vs[vs.length - 1]!, bulge: f.numAt(k) };
    else if ((code === 40 || code === 41) && vs.length && f.numAt(k) !== 0) wide = true;
  }
  const count = f.int(90, vs.length);
  if (count !== vs.length) f.fail('MALFORMED', `vertex count (group 90) is ${count} but ${vs.length} vertices follow`);
  if (wide) warnings.push(`${entityLabel(f.src)} has a width: its centreline is used`);
  return sides(vs, (f.int(70, 0) & 1) !== 0, planeOf(f));
}

/**
 * Old-style POLYLINE with VERTEX entities. 2D polylines read like LWPOLYLINE; smoothed ones (flag
 * 2 curve fit, 4 spline fit) as the vertices CAD programs draw them through, skipping the spline
 * frame's control points (VERTEX flag 16), with a warning. 3D polylines and meshes (flags 8, 16,
 * 64) are not outlines: null.
 */
export function polylineSegments(f: Fields, vertices: readonly Fields[], warnings: string[]): Segment[] | null {
  const flags = f.int(70, 0);
  if (flags & (8 | 16 | 64)) return null;
  let wide = f.num(40, 'default start width', 0) !== 0 || f.num(41, 'default end width', 0) !== 0;
  const vs: Vertex[] = [];
  for (const v of vertices) {
    if (v.int(70, 0) & 16) continue;
    vs.push({ p: v.point(10, 'vertex'), bulge: v.num(42, 'bulge', 0) });
    if (v.num(40, 'start width', 0) !== 0 || v.num(41, 'end width', 0) !== 0) wide = true;
  }
  if (flags & 6) warnings.push(`${entityLabel(f.src)} is ${flags & 4 ? 'spline' : 'curve'}-fit: read through the vertices it is drawn with`);
  if (wide) warnings.push(`${entityLabel(f.src)} has a width: its centreline is used`);
  return sides(vs, (flags & 1) !== 0, planeOf(f));
}
