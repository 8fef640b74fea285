import { arcSideNode, curveX, curveY } from './frame';
import type { TriMesh } from './mesh';

/**
 * Six-node (quadratic) triangles. Nodes 0 … nv−1 are the triangle corners, then one node per
 * edge. Element k lists corners v0 v1 v2 (counter-clockwise), then the nodes on edges v0–v1,
 * v1–v2, v2–v0. Corners on a curved boundary lie on the exact arc; the node on a curved boundary
 * edge sits where the quadratic side encloses the arc's area (`arcSideNode`), making the elements
 * beside an arc isoparametric; every other edge node is the edge's midpoint.
 */
export interface QuadMesh {
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly el: Uint32Array;
  /** Per element, 1 when a side is curved (its Jacobian varies). */
  readonly curved: Uint8Array;
  readonly corners: number;
}

/** Numbered edges of a triangulation: ends ea[k] < eb[k]; triEdge[3t + i] is edge (v_i, v_i+1) of triangle t. */
export interface Edges {
  readonly ea: Uint32Array;
  readonly eb: Uint32Array;
  readonly triEdge: Uint32Array;
  /** Edges by smaller end: ids byLo[lo[v] … lo[v + 1]) have ea = v. */
  readonly lo: Uint32Array;
  readonly byLo: Uint32Array;
}

/** Id of the edge between vertices a and b (−1 if none). */
export function findEdge(E: Edges, a: number, b: number): number {
  const v = Math.min(a, b);
  const w = Math.max(a, b);
  for (let s = E.lo[v]!; s < E.lo[v + 1]!; s++) if (E.eb[E.byLo[s]!] === w) return E.byLo[s]!;
  return -1;
}

export function edgesOf(tri: Uint32Array, nv: number): Edges {
  const nt = tri.length / 3;
  // Edges grouped by their smaller end: counting sort, then a short scan per vertex.
  const count = new Uint32Array(nv + 1);
  for (let e = 0; e < 3 * nt; e++) {
    const a = tri[e]!;
    const b = tri[e % 3 === 2 ? e - 2 : e + 1]!;
    count[Math.min(a, b) + 1]!++;
  }
  for (let v = 0; v < nv; v++) count[v + 1]! += count[v]!;
  const slotOther = new Int32Array(3 * nt).fill(-1);
  const slotId = new Uint32Array(3 * nt);
  const fill = count.slice(0, nv);
  const triEdge = new Uint32Array(3 * nt);
  const ea = new Uint32Array(3 * nt);
  const eb = new Uint32Array(3 * nt);
  let ne = 0;
  for (let e = 0; e < 3 * nt; e++) {
    const a = tri[e]!;
    const b = tri[e % 3 === 2 ? e - 2 : e + 1]!;
    const lo = Math.min(a, b);
    const hi = Math.max(a, b);
    let id = -1;
    for (let s = count[lo]!; s < fill[lo]!; s++)
      if (slotOther[s] === hi) {
        id = slotId[s]!;
        break;
      }
    if (id < 0) {
      id = ne++;
      ea[id] = lo;
      eb[id] = hi;
      const s = fill[lo]!++;
      slotOther[s] = hi;
      slotId[s] = id;
    }
    triEdge[e] = id;
  }
  // Compact the per-vertex slots into the lookup table.
  const lo = new Uint32Array(nv + 1);
  for (let v = 0; v < nv; v++) lo[v + 1] = lo[v]! + (fill[v]! - count[v]!);
  const byLo = new Uint32Array(ne);
  for (let v = 0; v < nv; v++) for (let s = count[v]!; s < fill[v]!; s++) byLo[lo[v]! + s - count[v]!] = slotId[s]!;
  return { ea: ea.slice(0, ne), eb: eb.slice(0, ne), triEdge, lo, byLo };
}

/** Per edge, the boundary piece on it (index into the mesh's boundary arrays), or −1. */
function boundaryOfEdges(m: TriMesh, E: Edges): Int32Array {
  const out = new Int32Array(E.ea.length).fill(-1);
  for (let k = 0; k < m.ba.length; k++) {
    const id = findEdge(E, m.ba[k]!, m.bb[k]!);
    if (id >= 0) out[id] = k;
  }
  return out;
}

/** Edge nodes: area-preserving on boundary arcs (`arcSideNode`), straight midpoints otherwise. */
function midpoints(m: TriMesh, E: Edges, bEdge: Int32Array): { mx: Float64Array; my: Float64Array; bent: Uint8Array } {
  const ne = E.ea.length;
  const mx = new Float64Array(ne);
  const my = new Float64Array(ne);
  const bent = new Uint8Array(ne);
  for (let k = 0; k < ne; k++) {
    const a = E.ea[k]!;
    const b = E.eb[k]!;
    mx[k] = (m.x[a]! + m.x[b]!) / 2;
    my[k] = (m.y[a]! + m.y[b]!) / 2;
    const bk = bEdge[k]!;
    if (bk < 0) continue;
    const c = m.curves[m.bc[bk]!]!;
    if (!c.arc) continue;
    [mx[k], my[k]] = arcSideNode(c, m.bt0[bk]!, m.bt1[bk]!);
    bent[k] = 1;
  }
  return { mx, my, bent };
}

export interface Level {
  readonly tri: TriMesh;
  readonly quad: QuadMesh;
  readonly edges: Edges;
}

/** The quadratic mesh on a triangulation. */
export function quadratic(m: TriMesh): Level {
  const nv = m.x.length;
  const E = edgesOf(m.tri, nv);
  const bEdge = boundaryOfEdges(m, E);
  const { mx, my, bent } = midpoints(m, E, bEdge);
  const ne = E.ea.length;
  const x = new Float64Array(nv + ne);
  const y = new Float64Array(nv + ne);
  x.set(m.x);
  y.set(m.y);
  x.set(mx, nv);
  y.set(my, nv);
  const nt = m.tri.length / 3;
  const el = new Uint32Array(6 * nt);
  const curved = new Uint8Array(nt);
  for (let t = 0; t < nt; t++) {
    for (let i = 0; i < 3; i++) {
      el[6 * t + i] = m.tri[3 * t + i]!;
      const e = E.triEdge[3 * t + i]!;
      el[6 * t + 3 + i] = nv + e;
      if (bent[e]) curved[t] = 1;
    }
  }
  return { tri: m, quad: { x, y, el, curved, corners: nv }, edges: E };
}

/**
 * Uniform refinement: every triangle splits into four through its edge nodes; at boundary arcs
 * the new corner moves from the parent's side node onto the exact curve, at the middle
 * parameter. The new corners are numbered as the parent level's quadratic nodes, so a quadratic
 * field on the parent is known at them without interpolation.
 */
export function refine(L: Level): TriMesh {
  const m = L.tri;
  const { quad } = L;
  const nt = m.tri.length / 3;
  const tri = new Uint32Array(12 * nt);
  // Children (v0 m01 m20), (m01 v1 m12), (m20 m12 v2), (m01 m12 m20), from the element's six nodes.
  const CHILDREN = [0, 3, 5, 3, 1, 4, 5, 4, 2, 3, 4, 5];
  const el = quad.el;
  for (let t = 0; t < nt; t++) for (let k = 0; k < 12; k++) tri[12 * t + k] = el[6 * t + CHILDREN[k]!]!;
  const nb = m.ba.length;
  const ba = new Uint32Array(2 * nb);
  const bb = new Uint32Array(2 * nb);
  const bc = new Int32Array(2 * nb);
  const bt0 = new Float64Array(2 * nb);
  const bt1 = new Float64Array(2 * nb);
  const nv = m.x.length;
  const x = quad.x.slice();
  const y = quad.y.slice();
  for (let k = 0; k < nb; k++) {
    const a = m.ba[k]!;
    const b = m.bb[k]!;
    const mid = nv + findEdge(L.edges, a, b);
    const tm = (m.bt0[k]! + m.bt1[k]!) / 2;
    const c = m.curves[m.bc[k]!]!;
    if (c.arc) {
      x[mid] = curveX(c, tm);
      y[mid] = curveY(c, tm);
    }
    ba[2 * k] = a;
    bb[2 * k] = mid;
    ba[2 * k + 1] = mid;
    bb[2 * k + 1] = b;
    bc[2 * k] = bc[2 * k + 1] = m.bc[k]!;
    bt0[2 * k] = m.bt0[k]!;
    bt1[2 * k] = tm;
    bt0[2 * k + 1] = tm;
    bt1[2 * k + 1] = m.bt1[k]!;
  }
  return { ...m, x, y, tri, ba, bb, bc, bt0, bt1 };
}
