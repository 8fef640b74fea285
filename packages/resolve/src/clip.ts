import ClipperLib from 'clipper-lib';
import type { Point } from '@keelson/geometry';

/** clipper-lib works on integers and is fastest (and never overflows into its alert path) below ≈4.7e7. */
const INTEGER_RANGE = 4e7;

export interface UnionResult {
  /** Outer rings of the union (counter-clockwise) with their holes (clockwise). */
  readonly parts: { outer: Point[]; holes: Point[][] }[];
  /** Grid step of the integer coordinates, in drawing units: the rounding of every vertex. */
  readonly grid: number;
}

/**
 * Union of closed polygons (all taken as solids, non-zero fill), through clipper-lib on an integer
 * grid scaled from the polygons' extent around their centre. Holes are read from the PolyTree.
 */
export function unionPolygons(polygons: readonly (readonly Point[])[]): UnionResult {
  let xmin = Infinity;
  let xmax = -Infinity;
  let ymin = Infinity;
  let ymax = -Infinity;
  for (const poly of polygons)
    for (const p of poly) {
      xmin = Math.min(xmin, p.x);
      xmax = Math.max(xmax, p.x);
      ymin = Math.min(ymin, p.y);
      ymax = Math.max(ymax, p.y);
    }
  const cx = (xmin + xmax) / 2;
  const cy = (ymin + ymax) / 2;
  const half = Math.max(xmax - xmin, ymax - ymin) / 2 || 1;
  const scale = INTEGER_RANGE / half;
  const toInt = (p: Point) => ({ X: Math.round((p.x - cx) * scale), Y: Math.round((p.y - cy) * scale) });
  const fromInt = (q: { X: number; Y: number }): Point => ({ x: q.X / scale + cx, y: q.Y / scale + cy });

  const clipper = new ClipperLib.Clipper();
  clipper.StrictlySimple = true;
  // Flattened arcs must come back vertex for vertex to be recognised and restored.
  clipper.PreserveCollinear = true;
  // Every ring counter-clockwise, so that non-zero fill makes overlapping solids one.
  const rings = polygons.map((poly) => {
    const ring = poly.map(toInt);
    let a = 0;
    for (let i = 0; i < ring.length; i++) {
      const p = ring[i]!;
      const q = ring[(i + 1) % ring.length]!;
      a += p.X * q.Y - q.X * p.Y;
    }
    return a < 0 ? ring.reverse() : ring;
  });
  clipper.AddPaths(rings, ClipperLib.PolyType.ptSubject, true);
  const tree = new ClipperLib.PolyTree();
  clipper.Execute(ClipperLib.ClipType.ctUnion, tree, ClipperLib.PolyFillType.pftNonZero, ClipperLib.PolyFillType.pftNonZero);

  const parts: UnionResult['parts'] = [];
  const visit = (node: InstanceType<typeof ClipperLib.PolyTree>) => {
    for (const outer of node.Childs()) {
      parts.push({ outer: outer.Contour().map(fromInt), holes: outer.Childs().map((h) => h.Contour().map(fromInt)) });
      for (const hole of outer.Childs()) visit(hole);
    }
  };
  visit(tree);
  return { parts, grid: 1 / scale };
}
