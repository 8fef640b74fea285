import { isRational, type Point, type SplineSegment } from '@keelson/geometry';
import type { TagWriter } from './write-tags';

/** One vertex of an LWPOLYLINE; `bulge` = tan(sweep/4) of the arc that starts here (0: a straight side). */
export interface DxfVertex {
  readonly x: number;
  readonly y: number;
  readonly bulge: number;
}

/** Extrusion direction (210/220/230) of an entity drawn in an object coordinate system. */
export interface DxfNormal {
  readonly x: number;
  readonly y: number;
  readonly z: number;
}

/** Fields every entity may carry: its layer (default: the file's), and the OCS normal where the type has one. */
interface Common {
  readonly layer?: string;
  readonly extrusion?: DxfNormal;
}

/** Edge of a HATCH edge path (angles in degrees; a clockwise arc stores its angles negated, see hatch.ts). */
export type DxfHatchEdge =
  | { readonly type: 'line'; readonly a: Point; readonly b: Point }
  | { readonly type: 'arc'; readonly c: Point; readonly r: number; readonly startDeg: number; readonly endDeg: number; readonly ccw: boolean }
  | {
      readonly type: 'ellipse';
      readonly c: Point;
      readonly major: Point;
      readonly ratio: number;
      /** Angles seen from the centre, measured from the major axis (not parameters). */
      readonly startDeg: number;
      readonly endDeg: number;
      readonly ccw: boolean;
    }
  | { readonly type: 'spline'; readonly spline: SplineSegment };

export type DxfHatchPath = { readonly kind: 'polyline'; readonly vertices: readonly DxfVertex[] } | { readonly kind: 'edges'; readonly edges: readonly DxfHatchEdge[] };

/**
 * Entities in the coordinates the file states them in (OCS where the type has one). ARC angles are
 * in degrees and the arc runs counter-clockwise from `startDeg` to `endDeg` (DXF has no clockwise arcs).
 */
export type DxfEntity = Common &
  (
    | { readonly type: 'LINE'; readonly a: Point; readonly b: Point }
    | { readonly type: 'ARC'; readonly c: Point; readonly r: number; readonly startDeg: number; readonly endDeg: number }
    | { readonly type: 'CIRCLE'; readonly c: Point; readonly r: number }
    | {
        readonly type: 'LWPOLYLINE';
        readonly vertices: readonly DxfVertex[];
        /** Default true. */
        readonly closed?: boolean;
        /** Constant width (group 43), default 0. */
        readonly width?: number;
        /** Write a vertex identifier (group 91) after each vertex, as AutoCAD 2010+ may. */
        readonly vertexIds?: boolean;
      }
    | {
        readonly type: 'ELLIPSE';
        readonly c: Point;
        /** Major semi-axis as a vector from the centre; the minor one is `ratio` times it turned +90° about the extrusion. */
        readonly major: Point;
        readonly ratio: number;
        /** Parameters (radians) of the counter-clockwise run from start to end. */
        readonly startParam: number;
        readonly endParam: number;
      }
    | { readonly type: 'SPLINE'; readonly spline: SplineSegment }
    | {
        readonly type: 'INSERT';
        readonly block: string;
        readonly at: Point;
        readonly scale?: { readonly x: number; readonly y: number };
        readonly rotationDeg?: number;
        /** Rectangular array: counts and spacings along the rotated x (columns) and y (rows) axes. */
        readonly columns?: { readonly count: number; readonly spacing: number };
        readonly rows?: { readonly count: number; readonly spacing: number };
      }
    | { readonly type: 'HATCH'; readonly paths: readonly DxfHatchPath[] }
  );

function extrusion(t: TagWriter, n: DxfNormal | undefined): void {
  if (n) t.tag(210, n.x).tag(220, n.y).tag(230, n.z);
}

function hatchEdge(t: TagWriter, e: DxfHatchEdge): void {
  switch (e.type) {
    case 'line':
      t.tag(72, 1).point2(10, e.a).point2(11, e.b);
      return;
    case 'arc':
      t.tag(72, 2).point2(10, e.c).tag(40, e.r).tag(50, e.startDeg).tag(51, e.endDeg).tag(73, e.ccw ? 1 : 0);
      return;
    case 'ellipse':
      t.tag(72, 3).point2(10, e.c).point2(11, e.major).tag(40, e.ratio).tag(50, e.startDeg).tag(51, e.endDeg).tag(73, e.ccw ? 1 : 0);
      return;
    case 'spline': {
      const { degree, knots, controls } = e.spline;
      const rational = isRational(e.spline);
      t.tag(72, 4).tag(94, degree).tag(73, rational ? 1 : 0).tag(74, 0).tag(95, knots.length).tag(96, controls.length);
      for (const k of knots) t.tag(40, k);
      for (const c of controls) {
        t.point2(10, c);
        if (rational) t.tag(42, c.w);
      }
      return;
    }
  }
}

/** HATCH with solid fill (AutoCAD DXF Reference, HATCH): boundary paths, normal style, no seed points. */
function hatch(t: TagWriter, e: Extract<DxfEntity, { type: 'HATCH' }>): void {
  t.tag(100, 'AcDbHatch').point(10, { x: 0, y: 0 });
  extrusion(t, e.extrusion ?? { x: 0, y: 0, z: 1 });
  t.tag(2, 'SOLID').tag(70, 1).tag(71, 0).tag(91, e.paths.length);
  e.paths.forEach((p, i) => {
    // Path type flags: 1 external (the first path), 2 polyline.
    const external = i === 0 ? 1 : 0;
    if (p.kind === 'polyline') {
      const bulged = p.vertices.some((v) => v.bulge !== 0);
      t.tag(92, external | 2).tag(72, bulged ? 1 : 0).tag(73, 1).tag(93, p.vertices.length);
      for (const v of p.vertices) {
        t.point2(10, v);
        if (bulged) t.tag(42, v.bulge);
      }
    } else {
      t.tag(92, external).tag(93, p.edges.length);
      for (const edge of p.edges) hatchEdge(t, edge);
    }
    t.tag(97, 0);
  });
  t.tag(75, 0).tag(76, 1).tag(98, 0);
}

/** One entity, on `layer` unless it names its own. */
export function writeEntity(t: TagWriter, e: DxfEntity, layer: string): void {
  t.tag(0, e.type).nextHandle().tag(100, 'AcDbEntity').tag(8, e.layer ?? layer);
  switch (e.type) {
    case 'LINE':
      t.tag(100, 'AcDbLine').point(10, e.a).point(11, e.b);
      return;
    case 'CIRCLE':
      t.tag(100, 'AcDbCircle').point(10, e.c).tag(40, e.r);
      extrusion(t, e.extrusion);
      return;
    case 'ARC':
      t.tag(100, 'AcDbCircle').point(10, e.c).tag(40, e.r);
      extrusion(t, e.extrusion);
      t.tag(100, 'AcDbArc').tag(50, e.startDeg).tag(51, e.endDeg);
      return;
    case 'LWPOLYLINE':
      t.tag(100, 'AcDbPolyline')
        .tag(90, e.vertices.length)
        .tag(70, e.closed === false ? 0 : 1)
        .tag(43, e.width ?? 0);
      extrusion(t, e.extrusion);
      e.vertices.forEach((v, i) => {
        t.tag(10, v.x).tag(20, v.y);
        if (e.vertexIds) t.tag(91, i + 1);
        if (v.bulge !== 0) t.tag(42, v.bulge);
      });
      return;
    case 'ELLIPSE':
      t.tag(100, 'AcDbEllipse').point(10, e.c).point(11, e.major);
      extrusion(t, e.extrusion);
      t.tag(40, e.ratio).tag(41, e.startParam).tag(42, e.endParam);
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
    case 'INSERT':
      t.tag(100, 'AcDbBlockReference').tag(2, e.block).point(10, e.at);
      if (e.scale) t.tag(41, e.scale.x).tag(42, e.scale.y).tag(43, 1);
      if (e.rotationDeg) t.tag(50, e.rotationDeg);
      if (e.columns) t.tag(70, e.columns.count);
      if (e.rows) t.tag(71, e.rows.count);
      if (e.columns) t.tag(44, e.columns.spacing);
      if (e.rows) t.tag(45, e.rows.spacing);
      extrusion(t, e.extrusion);
      return;
    case 'HATCH':
      hatch(t, e);
      return;
  }
}
