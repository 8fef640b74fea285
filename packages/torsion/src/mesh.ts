import Delaunator from 'delaunator';
import { curveLength, curveTangent, curveX, curveY, type Curve } from './frame';
import { SizeField } from './sizing';
import { TorsionError } from './errors';
import { constrainer } from './constrain';

/** Settings of the mesh generator, lengths in the normalised frame (the region fits the unit square). */
export interface MeshParams {
  /** Largest element size. */
  readonly hmax: number;
  /** Elements across a thin wall (the local feature size is divided by this). */
  readonly across: number;
  /**
   * Largest gap allowed between a curved quadratic boundary side and its arc. A side turning
   * through θ on radius r strays by about 0.00195·r·θ⁴ (the quadratic through both ends and the
   * middle of the arc; computed), so arcs are split to θ ≤ (sagitta / 0.00195r)^¼, at most π/4.
   */
  readonly sagitta: number;
  /** Growth of the element size per unit distance from where it is small. */
  readonly grading: number;
  /** Smallest angle wanted in any triangle (degrees), except at input corners sharper than it. */
  readonly minAngle: number;
  /** Element size at a re-entrant corner relative to the size beside it. */
  readonly cornerFactor: number;
}

/**
 * Linear triangulation of a region with its exact boundary description, the base of every mesh
 * level. Boundary edge k runs from vertex ba[k] to bb[k] along curve bc[k] between parameters
 * bt0[k] and bt1[k] (the solid on its left).
 */
export interface TriMesh {
  readonly x: Float64Array;
  readonly y: Float64Array;
  /** Three vertices per triangle, counter-clockwise. */
  readonly tri: Uint32Array;
  readonly ba: Uint32Array;
  readonly bb: Uint32Array;
  readonly bc: Int32Array;
  readonly bt0: Float64Array;
  readonly bt1: Float64Array;
  readonly curves: readonly Curve[];
  /** Interior angle at the sharpest re-entrant corner (radians; π when there is none). */
  readonly reentrant: number;
  /** Smallest input angle between boundary curves (radians): triangles there may be sharper than the bound. */
  readonly sharpest: number;
}

const next3 = (e: number) => (e % 3 === 2 ? e - 2 : e + 1);
const prev3 = (e: number) => (e % 3 === 0 ? e + 2 : e - 1);

/** The boundary as linked subsegments, each on one curve between two parameters. */
class Boundary {
  readonly x: number[] = [];
  readonly y: number[] = [];
  /** Per point: next boundary point along its loop (−1 for interior points), curve and parameters of the subsegment it starts. */
  readonly next: number[] = [];
  readonly curve: number[] = [];
  readonly t0: number[] = [];
  readonly t1: number[] = [];
  /** Size asked for along the subsegment starting at each point. */
  readonly want: number[] = [];
  readonly starts: number[] = [];

  constructor(
    readonly curves: readonly Curve[],
    loops: readonly (readonly number[])[],
    hmax: number,
  ) {
    for (const loop of loops) {
      const first = this.x.length;
      loop.forEach((ci, i) => {
        const c = curves[ci]!;
        const v = this.add(c.ax, c.ay);
        this.curve[v] = ci;
        this.t0[v] = 0;
        this.t1[v] = 1;
        this.want[v] = hmax;
        this.next[v] = i + 1 < loop.length ? v + 1 : first;
        this.starts.push(v);
      });
    }
  }

  add(x: number, y: number): number {
    this.x.push(x);
    this.y.push(y);
    this.next.push(-1);
    this.curve.push(-1);
    this.t0.push(0);
    this.t1.push(0);
    this.want.push(0);
    return this.x.length - 1;
  }

  isSub(a: number, b: number): boolean {
    return this.next[a] === b || this.next[b] === a;
  }

  /** Splits the subsegment starting at v into n pieces of equal parameter length. */
  split(v: number, n: number): void {
    const c = this.curves[this.curve[v]!]!;
    const t0 = this.t0[v]!;
    const t1 = this.t1[v]!;
    const end = this.next[v]!;
    let prev = v;
    for (let i = 1; i < n; i++) {
      const t = t0 + ((t1 - t0) * i) / n;
      const u = this.add(curveX(c, t), curveY(c, t));
      this.curve[u] = this.curve[v]!;
      this.t0[u] = t;
      this.t1[prev] = t;
      this.want[u] = this.want[v]!;
      this.next[prev] = u;
      prev = u;
    }
    this.t1[prev] = t1;
    this.next[prev] = end;
  }

  /** Every subsegment's start point (boundary points in storage order). */
  *subsegments(): Generator<number> {
    const n = this.x.length;
    for (let v = 0; v < n; v++) if (this.next[v]! >= 0) yield v;
  }

  length(v: number): number {
    const w = this.next[v]!;
    return Math.hypot(this.x[w]! - this.x[v]!, this.y[w]! - this.y[v]!);
  }
}

/**
 * Distance from the middle of each subsegment to the nearest boundary piece across the solid
 * ("facing": within 60° of the inward normal, and facing back), curves adjacent to its own
 * excluded: the local wall thickness, so thin walls get `across` elements through them.
 */
function facingSizes(B: Boundary, p: MeshParams): number {
  const reach = p.across * p.hmax;
  const subs = [...B.subsegments()];
  // Buckets about two median pieces wide; the search grows ring by ring and stops past the best.
  const lens = subs.map((v) => B.length(v)).sort((a, b) => a - b);
  const cell = Math.max(2 * lens[lens.length >> 1]!, 1 / 1024);
  const n = Math.ceil(1.04 / cell);
  const count = new Int32Array(n * n + 1);
  const ix = (x: number) => Math.min(n - 1, Math.max(0, Math.floor((x + 0.52) / cell)));
  const span = (v: number, f: (k: number) => void) => {
    const w = B.next[v]!;
    const i0 = ix(Math.min(B.x[v]!, B.x[w]!));
    const i1 = ix(Math.max(B.x[v]!, B.x[w]!));
    const j0 = ix(Math.min(B.y[v]!, B.y[w]!));
    const j1 = ix(Math.max(B.y[v]!, B.y[w]!));
    for (let j = j0; j <= j1; j++) for (let i = i0; i <= i1; i++) f(j * n + i);
  };
  for (const v of subs) span(v, (k) => count[k + 1]!++);
  for (let k = 0; k < n * n; k++) count[k + 1]! += count[k]!;
  const fill = count.slice(0, n * n);
  const items = new Int32Array(count[n * n]!);
  for (const v of subs) span(v, (k) => (items[fill[k]!++] = v));

  const stamp = new Int32Array(B.x.length).fill(-1);
  let splits = 0;
  for (const v of subs) {
    const w = B.next[v]!;
    const ax = B.x[v]!;
    const ay = B.y[v]!;
    const dx = B.x[w]! - ax;
    const dy = B.y[w]! - ay;
    const len = Math.hypot(dx, dy);
    const nx = -dy / len;
    const ny = dx / len;
    const mx = ax + dx / 2;
    const my = ay + dy / 2;
    const ci = B.curve[v]!;
    const c = B.curves[ci]!;
    let best = reach;
    const ci0 = ix(mx);
    const cj0 = ix(my);
    const test = (u: number) => {
      if (stamp[u] === v) return;
      stamp[u] = v;
      const cu = B.curve[u]!;
      if (cu === ci || cu === c.prev || cu === c.next) return;
      const z = B.next[u]!;
      const ux = B.x[u]!;
      const uy = B.y[u]!;
      const ex = B.x[z]! - ux;
      const ey = B.y[z]! - uy;
      const l2 = ex * ex + ey * ey;
      let s = ((mx - ux) * ex + (my - uy) * ey) / l2;
      s = s < 0 ? 0 : s > 1 ? 1 : s;
      const qx = ux + s * ex - mx;
      const qy = uy + s * ey - my;
      const d = Math.hypot(qx, qy);
      if (!(d < best)) return;
      // Across the solid: q ahead along our inward normal, and we ahead along its inward normal.
      if (qx * nx + qy * ny < 0.5 * d) return;
      if (-(qx * -ey + qy * ex) < 0) return;
      best = d;
    };
    for (let ring = 0; ring <= n && (ring - 1) * cell < best; ring++) {
      const j0 = cj0 - ring;
      const j1 = cj0 + ring;
      const scan = (i: number, j: number) => {
        if (i < 0 || i >= n || j < 0 || j >= n) return;
        const k = j * n + i;
        for (let q = count[k]!; q < count[k + 1]!; q++) test(items[q]!);
      };
      for (let i = ci0 - ring; i <= ci0 + ring; i++) {
        scan(i, j0);
        if (ring > 0) scan(i, j1);
      }
      for (let j = j0 + 1; j < j1; j++) {
        scan(ci0 - ring, j);
        scan(ci0 + ring, j);
      }
    }
    let want = Math.min(B.want[v]!, best / p.across);
    if (c.arc) want = Math.min(want, c.r * arcStep(c.r, p));
    B.want[v] = want;
    if (len > want * 1.05) {
      B.split(v, Math.ceil(len / want));
      splits++;
    }
  }
  return splits;
}

/** Largest angle one boundary side may turn through on an arc of radius r. */
export function arcStep(r: number, p: MeshParams): number {
  return Math.min(Math.PI / 4, Math.pow(p.sagitta / (0.00195 * r), 0.25));
}

/** Interior angle of the solid at the start of curve c (between the previous curve's end and c's start). */
function cornerAngle(curves: readonly Curve[], ci: number): number {
  const c = curves[ci]!;
  const [ax, ay] = curveTangent(curves[c.prev]!, 1);
  const [bx, by] = curveTangent(c, 0);
  const turn = Math.atan2(ax * by - ay * bx, ax * bx + ay * by);
  return Math.PI - turn;
}

/** Classifies triangles as inside (odd number of boundary crossings from the hull) or outside. */
function classify(tri: Uint32Array, half: Int32Array, B: Boundary): Uint8Array {
  const nt = tri.length / 3;
  const depth = new Int32Array(nt).fill(-1);
  let queue: number[] = [];
  let later: number[] = [];
  for (let e = 0; e < tri.length; e++) {
    if (half[e]! !== -1) continue;
    const t = (e / 3) | 0;
    if (B.isSub(tri[e]!, tri[next3(e)]!)) later.push(t);
    else if (depth[t] === -1) {
      depth[t] = 0;
      queue.push(t);
    }
  }
  let level = 0;
  while (queue.length > 0 || later.length > 0) {
    while (queue.length > 0) {
      const t = queue.pop()!;
      for (let k = 0; k < 3; k++) {
        const e = 3 * t + k;
        const o = half[e]!;
        if (o < 0) continue;
        const u = (o / 3) | 0;
        if (depth[u] !== -1) continue;
        if (B.isSub(tri[e]!, tri[next3(e)]!)) later.push(u);
        else {
          depth[u] = level;
          queue.push(u);
        }
      }
    }
    level++;
    queue = later.filter((t) => {
      if (depth[t] !== -1) return false;
      depth[t] = level;
      return true;
    });
    later = [];
  }
  const inside = new Uint8Array(nt);
  for (let t = 0; t < nt; t++) inside[t] = depth[t]! % 2 === 1 ? 1 : 0;
  return inside;
}

function triangulate(B: Boundary): { tri: Uint32Array; half: Int32Array; inside: Uint8Array } {
  const n = B.x.length;
  const coords = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    coords[2 * i] = B.x[i]!;
    coords[2 * i + 1] = B.y[i]!;
  }
  const del = new Delaunator(coords);
  const con = constrainer(del);
  for (const v of B.subsegments()) con.constrainOne(v, B.next[v]!);
  if (con.untriangulatedPoints().length > 0)
    throw new TorsionError('MESH_FAILED', 'mesh generator produced coincident points');
  return { tri: del.triangles, half: del.halfedges, inside: classify(del.triangles, del.halfedges, B) };
}

/**
 * Quality mesh of the region bounded by `curves`: the boundary split to the size field (arcs to at
 * most `thetaMax` per edge, thin walls `across` elements through), a constrained Delaunay
 * triangulation (delaunator + constrainautor), then Delaunay refinement in rounds: each round
 * inserts the circumcentres of triangles that are too large or have an angle below `minAngle`,
 * or, when a circumcentre falls across or encroaches upon a boundary subsegment, splits that
 * subsegment at its middle on the exact curve instead (Ruppert, "A Delaunay refinement algorithm
 * for quality 2-dimensional mesh generation", J. Algorithms 18, 1995; Shewchuk, "Delaunay
 * refinement algorithms for triangular mesh generation", CGTA 22, 2002).
 */
export function generateMesh(curves: readonly Curve[], loops: readonly (readonly number[])[], p: MeshParams): TriMesh {
  const B = new Boundary(curves, loops, p.hmax);
  // Arcs first, to the angle bound, so that facing distances are measured between good chords.
  for (const v of [...B.subsegments()]) {
    const c = curves[B.curve[v]!]!;
    const n = Math.max(1, Math.ceil(curveLength(c) / p.hmax - 1e-9), c.arc ? Math.ceil(Math.abs(c.sweep) / arcStep(c.r, p) - 1e-9) : 1);
    if (n > 1) B.split(v, n);
  }
  for (let pass = 0; pass < 8 && facingSizes(B, p) > 0; pass++);

  let reentrant = Math.PI;
  let sharpest = Math.PI;
  const corners: { v: number; alpha: number }[] = [];
  for (const v of B.starts) {
    const alpha = cornerAngle(curves, B.curve[v]!);
    if (alpha > Math.PI + 1e-6) {
      reentrant = Math.max(reentrant, alpha);
      corners.push({ v, alpha });
    }
    if (alpha < Math.PI - 1e-6) sharpest = Math.min(sharpest, alpha);
  }

  let hmin = p.hmax;
  for (const v of B.subsegments()) hmin = Math.min(hmin, B.want[v]!);
  const field = new SizeField(p.hmax, p.grading, Math.min(256, Math.max(32, Math.ceil(1 / hmin))));
  for (const v of B.subsegments()) {
    const w = B.next[v]!;
    field.source((B.x[v]! + B.x[w]!) / 2, (B.y[v]! + B.y[w]!) / 2, B.want[v]!);
  }
  for (const { v } of corners) {
    // Grade towards re-entrant corners, where the warping function is singular.
    field.source(B.x[v]!, B.y[v]!, p.cornerFactor * B.want[v]!);
  }
  field.spread();
  const sizeAt = (x: number, y: number) => field.at(x, y);

  // Boundary to the size field, by bisection so that pieces grade towards small sizes.
  const floor = 1e-3 * hmin;
  const stack = [...B.subsegments()];
  while (stack.length > 0) {
    const v = stack.pop()!;
    const w = B.next[v]!;
    const len = B.length(v);
    const h = Math.min(sizeAt(B.x[v]!, B.y[v]!), sizeAt(B.x[w]!, B.y[w]!), sizeAt((B.x[v]! + B.x[w]!) / 2, (B.y[v]! + B.y[w]!) / 2));
    if (len > 1.05 * h && len > floor) {
      B.split(v, 2);
      stack.push(v, B.next[v]!);
    }
  }

  const sinMin = Math.sin((p.minAngle * Math.PI) / 180);
  let mesh = triangulate(B);
  for (let round = 0; round < 100; round++) {
    const { tri, half, inside } = mesh;
    const nt = tri.length / 3;
    const X = B.x;
    const Y = B.y;
    const splits = new Set<number>();
    const subStart = (a: number, b: number) => (B.next[a] === b ? a : b);
    // Circumcircles of the inside triangles, and those to improve with their priority.
    const ccx = new Float64Array(nt);
    const ccy = new Float64Array(nt);
    const rr = new Float64Array(nt);
    const bad: number[] = [];
    for (let t = 0; t < nt; t++) {
      if (!inside[t]) continue;
      const i0 = tri[3 * t]!;
      const i1 = tri[3 * t + 1]!;
      const i2 = tri[3 * t + 2]!;
      const x0 = X[i0]!;
      const y0 = Y[i0]!;
      const bx = X[i1]! - x0;
      const by = Y[i1]! - y0;
      const cx = X[i2]! - x0;
      const cy = Y[i2]! - y0;
      const l0 = bx * bx + by * by; // edge 0–1
      const l2 = cx * cx + cy * cy; // edge 2–0
      const l1 = (cx - bx) * (cx - bx) + (cy - by) * (cy - by); // edge 1–2
      const d = 2 * (bx * cy - by * cx);
      const area2 = Math.abs(d) / 2; // twice the area
      ccx[t] = x0 + (cy * l0 - by * l2) / d;
      ccy[t] = y0 + (bx * l2 - cx * l0) / d;
      const R = Math.sqrt(l0 * l1 * l2) / (2 * area2);
      rr[t] = R * R;

      // Boundary subsegments seen from the opposite vertex at 90° or more are encroached.
      for (let k = 0; k < 3; k++) {
        const e = 3 * t + k;
        const a = tri[e]!;
        const b = tri[next3(e)]!;
        if (!B.isSub(a, b)) continue;
        const q = tri[prev3(e)]!;
        const dot = (X[a]! - X[q]!) * (X[b]! - X[q]!) + (Y[a]! - Y[q]!) * (Y[b]! - Y[q]!);
        if (dot < 0 && B.next[q] !== a && B.next[b] !== q) splits.add(subStart(a, b));
      }

      // Smallest angle: opposite the shortest edge; its sine is 2·area over the two other edges.
      let sMin: number;
      let corner: number; // vertex at the smallest angle
      if (l0 <= l1 && l0 <= l2) {
        sMin = area2 / Math.sqrt(l1 * l2);
        corner = i2;
      } else if (l1 <= l2) {
        sMin = area2 / Math.sqrt(l0 * l2);
        corner = i0;
      } else {
        sMin = area2 / Math.sqrt(l0 * l1);
        corner = i1;
      }
      const tooBig = R > 0.75 * sizeAt(x0 + (bx + cx) / 3, y0 + (by + cy) / 3);
      let skinny = sMin < sinMin;
      if (skinny && !tooBig) {
        // A sharp input corner cannot be improved: both of its sides are boundary.
        const others = [i0, i1, i2].filter((v) => v !== corner);
        if (B.isSub(corner, others[0]!) && B.isSub(corner, others[1]!)) skinny = false;
      }
      if (tooBig || skinny) bad.push(t);
    }
    // Largest first, each new point's cavity (the triangles whose circumcircle holds it) disjoint
    // from those taken earlier in the round: the batch then acts as sequential Bowyer–Watson insertion.
    bad.sort((a, b) => rr[b]! - rr[a]!);
    const taken = new Uint8Array(nt);
    const cavity: number[] = [];
    const inCavity = new Uint8Array(nt);

    const locate = (t0: number, cx: number, cy: number): number => {
      let t = t0;
      for (let step = 0; step < 10000; step++) {
        let moved = false;
        for (let k = 0; k < 3; k++) {
          const e = 3 * t + k;
          const a = tri[e]!;
          const b = tri[next3(e)]!;
          const o = (X[b]! - X[a]!) * (cy - Y[a]!) - (Y[b]! - Y[a]!) * (cx - X[a]!);
          // Delaunator's triangles turn clockwise with y up: c lies beyond edge a→b when on its left.
          if (o > 0) {
            if (B.isSub(a, b)) {
              splits.add(subStart(a, b));
              return -1;
            }
            const u = half[e]!;
            if (u < 0) return -1;
            t = (u / 3) | 0;
            moved = true;
            break;
          }
        }
        if (!moved) return t;
      }
      return -1;
    };

    let inserted = 0;
    for (const t of bad) {
      if (taken[t]) continue;
      const ux = ccx[t]!;
      const uy = ccy[t]!;
      const at = locate(t, ux, uy);
      if (at < 0 || !inside[at] || taken[at]) continue;
      let encroaches = false;
      for (let k = 0; k < 3; k++) {
        const e = 3 * at + k;
        const a = tri[e]!;
        const b = tri[next3(e)]!;
        if (!B.isSub(a, b)) continue;
        if ((X[a]! - ux) * (X[b]! - ux) + (Y[a]! - uy) * (Y[b]! - uy) <= 0) {
          splits.add(subStart(a, b));
          encroaches = true;
        }
      }
      if (encroaches) continue;
      cavity.length = 0;
      cavity.push(at);
      inCavity[at] = 1;
      let clash = false;
      for (let c = 0; c < cavity.length && !clash; c++) {
        const u = cavity[c]!;
        for (let k = 0; k < 3; k++) {
          const e = 3 * u + k;
          const o = half[e]!;
          if (o < 0 || B.isSub(tri[e]!, tri[next3(e)]!)) continue;
          const v = (o / 3) | 0;
          if (inCavity[v] || !inside[v]) continue;
          const dx = ux - ccx[v]!;
          const dy = uy - ccy[v]!;
          if (dx * dx + dy * dy >= rr[v]!) continue;
          if (taken[v]) {
            clash = true;
            break;
          }
          inCavity[v] = 1;
          cavity.push(v);
        }
      }
      for (const u of cavity) {
        inCavity[u] = 0;
        if (!clash) taken[u] = 1;
      }
      if (clash) continue;
      taken[t] = 1;
      B.add(ux, uy);
      inserted++;
    }
    let split = 0;
    for (const v of splits)
      if (B.length(v) > floor) {
        B.split(v, 2);
        split++;
      }
    if (inserted === 0 && split === 0) break;
    mesh = triangulate(B);
  }

  // Keep the inside triangles, counter-clockwise, on the vertices they use.
  const { tri, inside } = mesh;
  const n = B.x.length;
  const map = new Int32Array(n).fill(-1);
  const keep: number[] = [];
  let nv = 0;
  for (let t = 0; t < inside.length; t++) {
    if (!inside[t]) continue;
    let a = tri[3 * t]!;
    let b = tri[3 * t + 1]!;
    const c = tri[3 * t + 2]!;
    const o = (B.x[b]! - B.x[a]!) * (B.y[c]! - B.y[a]!) - (B.y[b]! - B.y[a]!) * (B.x[c]! - B.x[a]!);
    if (o < 0) [a, b] = [b, a];
    for (const v of [a, b, c]) {
      if (map[v] === -1) map[v] = nv++;
      keep.push(map[v]!);
    }
  }
  const x = new Float64Array(nv);
  const y = new Float64Array(nv);
  for (let v = 0; v < n; v++)
    if (map[v]! >= 0) {
      x[map[v]!] = B.x[v]!;
      y[map[v]!] = B.y[v]!;
    }
  const subs = [...B.subsegments()];
  const ba = new Uint32Array(subs.length);
  const bb = new Uint32Array(subs.length);
  const bc = new Int32Array(subs.length);
  const bt0 = new Float64Array(subs.length);
  const bt1 = new Float64Array(subs.length);
  subs.forEach((v, k) => {
    if (map[v]! < 0 || map[B.next[v]!]! < 0) throw new TorsionError('MESH_FAILED', 'a boundary piece has no triangle');
    ba[k] = map[v]!;
    bb[k] = map[B.next[v]!]!;
    bc[k] = B.curve[v]!;
    bt0[k] = B.t0[v]!;
    bt1[k] = B.t1[v]!;
  });
  return { x, y, tri: Uint32Array.from(keep), ba, bb, bc, bt0, bt1, curves, reentrant, sharpest };
}
