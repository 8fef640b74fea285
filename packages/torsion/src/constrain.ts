import { createRequire } from 'node:module';

/** The part of constrainautor's interface the mesh generator uses. */
export interface Constrainer {
  constrainOne(p1: number, p2: number): number;
  untriangulatedPoints(): number[];
}

interface Triangulation {
  coords: ArrayLike<number>;
  triangles: Uint32Array;
  halfedges: Int32Array;
  hull: Uint32Array;
}

/**
 * constrainautor (Sloan's edge-flipping algorithm on a delaunator triangulation) is loaded through
 * its CommonJS build: the package points its types at TypeScript sources that do not compile under
 * our strict settings (noUncheckedIndexedAccess), so the interface above stands in for them.
 */
const Constrainautor = createRequire(import.meta.url)('@kninnug/constrainautor') as new (del: Triangulation) => Constrainer;

export function constrainer(del: Triangulation): Constrainer {
  return new Constrainautor(del);
}
