import Delaunator from 'delaunator';
import { curveLength, curveTangent, curveX, curveY, type Curve } from './frame';
import { SizeField } from './sizing';
import { TorsionError } from './errors';
import { constrainer } from './constrain';
import { Cdt } from './cdt';

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
  subsegments(): number[] {
    const out: number[] = [];
    for (let v = 0; v < this.x.length; v++) if (this.next[v]! >= 0) out.push(v);
    return out;
  }

  length(v: number): number {
    const w = this.next[v]!;
    const dx = this.x[w]! - this.x[v]!;
    const dy = this.y[w]! - this.y[v]!;
    // √ rather than Math.hypot, here and below: hypot is slower and its result is boxed in V8.
    return Math.sqrt(dx * dx + dy * dy);
  }
}

/**
 * Distance from the middle of each subsegment to the nearest boundary piece across the solid
 * ("facing": within 60° of the inward normal, and facing back), curves adjacent to its own
 * excluded: the local wall thickness, so thin walls get `across` elements through them. Looks at
 * the pieces marked in `changed` (all when null); returns the pieces it split or made, or null.
 */
function facingSizes(B: Boundary, p: MeshParams, changed: Uint8Array | null): Uint8Array | null {
  const subs = B.subsegments();
  // Splits wait for the end of the pass, so every piece is measured against the same boundary;
  // the next pass looks at the pieces split or made only (the others keep their size: a split
  // moves a partner's chords by less than their sagitta).
  const before = B.x.length;
  const splits: number[] = [];
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
  for (const v of subs) {
    if (changed && v < changed.length && !changed[v]) continue;
    const w = B.next[v]!;
    const ax = B.x[v]!;
    const ay = B.y[v]!;
    const dx = B.x[w]! - ax;
    const dy = B.y[w]! - ay;
    const len = Math.sqrt(dx * dx + dy * dy);
    const nx = -dy / len;
    const ny = dx / len;
    const mx = ax + dx / 2;
    const my = ay + dy / 2;
    const ci = B.curve[v]!;
    const c = B.curves[ci]!;
    // Only a wall thinner than `across` times the size already asked for changes it: search no farther.
    let want = B.want[v]!;
    if (c.arc) want = Math.min(want, c.r * arcStep(c.r, p));
    let best = p.across * want;
    const ci0 = ix(mx);
    const cj0 = ix(my);
    // Rings of buckets around the middle, until the ring is farther than the best found.
    for (let ring = 0; ring <= n && (ring - 1) * cell < best; ring++) {
      for (let j = cj0 - ring; j <= cj0 + ring; j++) {
        if (j < 0 || j >= n) continue;
        const step = j === cj0 - ring || j === cj0 + ring ? 1 : 2 * ring;
        for (let i = ci0 - ring; i <= ci0 + ring; i += step) {
          if (i < 0 || i >= n) continue;
          const k = j * n + i;
          for (let q = count[k]!; q < count[k + 1]!; q++) {
            const u = items[q]!;
            if (stamp[u] === v) continue;
            stamp[u] = v;
            const cu = B.curve[u]!;
            if (cu === ci || cu === c.prev || cu === c.next) continue;
            const z = B.next[u]!;
            const ux = B.x[u]!;
            const uy = B.y[u]!;
            const ex = B.x[z]! - ux;
            const ey = B.y[z]! - uy;
            let s = ((mx - ux) * ex + (my - uy) * ey) / (ex * ex + ey * ey);
            s = s < 0 ? 0 : s > 1 ? 1 : s;
            const qx = ux + s * ex - mx;
            const qy = uy + s * ey - my;
            const d = Math.sqrt(qx * qx + qy * qy);
            // Across the solid: q ahead along our inward normal, and we ahead along its inward normal.
            if (d < best && qx * nx + qy * ny >= 0.5 * d && qx * -ey + qy * ex <= 0) best = d;
          }
        }
      }
    }
    want = Math.min(want, best / p.across);
    B.want[v] = want;
    if (len > want * 1.05) splits.push(v, Math.ceil(len / want));
  }
  if (splits.length === 0) return null;
  for (let k = 0; k < splits.length; k += 2) B.split(splits[k]!, splits[k + 1]!);
  const made = new Uint8Array(B.x.length).fill(1, before);
  for (let k = 0; k < splits.length; k += 2) made[splits[k]!] = 1;
  return made;
}

/** An arc bulging out of the solid (its centre of curvature on the solid's side, the left). */
function isConvex(c: Curve): boolean {
  return c.arc && (c.ux * c.vy - c.uy * c.vx) * c.sweep > 0;
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
  // Flood of the current depth, and the triangles across a boundary piece for the next one.
  const queue = new Int32Array(nt);
  const later = new Int32Array(3 * nt);
  let nq = 0;
  let nl = 0;
  for (let e = 0; e < tri.length; e++) {
    if (half[e]! !== -1) continue;
    const t = (e / 3) | 0;
    if (B.isSub(tri[e]!, tri[next3(e)]!)) later[nl++] = t;
    else if (depth[t] === -1) {
      depth[t] = 0;
      queue[nq++] = t;
    }
  }
  let level = 0;
  while (nq > 0 || nl > 0) {
    while (nq > 0) {
      const t = queue[--nq]!;
      for (let k = 0; k < 3; k++) {
        const e = 3 * t + k;
        const o = half[e]!;
        if (o < 0) continue;
        const u = (o / 3) | 0;
        if (depth[u] !== -1) continue;
        if (B.isSub(tri[e]!, tri[next3(e)]!)) later[nl++] = u;
        else {
          depth[u] = level;
          queue[nq++] = u;
        }
      }
    }
    level++;
    for (let k = 0; k < nl; k++) {
      const t = later[k]!;
      if (depth[t] !== -1) continue;
      depth[t] = level;
      queue[nq++] = t;
    }
    nl = 0;
  }
  const inside = new Uint8Array(nt);
  for (let t = 0; t < nt; t++) inside[t] = depth[t]! % 2 === 1 ? 1 : 0;
  return inside;
}

/**
 * The boundary and interior points triangulated afresh (delaunator, constrained to the boundary
 * pieces), with which triangles lie inside, ready to take more points one by one.
 */
function triangulate(B: Boundary): Cdt {
  for (let attempt = 0; ; attempt++) {
    const del = new Delaunator(coordinates(B));
    const used = new Uint8Array(B.x.length);
    for (let e = 0; e < del.triangles.length; e++) used[del.triangles[e]!] = 1;
    if (used.includes(0)) throw new TorsionError('MESH_FAILED', 'mesh generator produced coincident points');
    // Boundary pieces that are edges of the Delaunay triangulation already need no work (and no
    // flip made for another piece removes them: pieces do not cross).
    const missing = missingPieces(B, del.triangles);
    if (missing.length > 0)
      try {
        const con = constrainer(del);
        for (const v of missing) con.constrainOne(v, B.next[v]!);
      } catch (e) {
        // constrainautor gives up on some nearly collinear configurations ("edge intersects
        // already constrained edge", "infinite loop"): split the missing pieces at their middle,
        // on their curves, and start again. Pieces short enough against their neighbours are
        // Delaunay edges by themselves (segment recovery by splitting, as in Ruppert 1995).
        if (attempt >= 30) throw new TorsionError('MESH_FAILED', `the boundary could not be recovered in the triangulation: ${(e as Error).message}`);
        for (const v of missing) B.split(v, 2);
        continue;
      }
    const inside = classify(del.triangles, del.halfedges, B);
    return new Cdt(del.triangles, del.halfedges, inside, B.x, B.y, (a, b) => B.isSub(a, b));
  }
}

function coordinates(B: Boundary): Float64Array {
  const n = B.x.length;
  const coords = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    coords[2 * i] = B.x[i]!;
    coords[2 * i + 1] = B.y[i]!;
  }
  return coords;
}

/** Boundary pieces (by start point) that are not edges of the triangulation. */
function missingPieces(B: Boundary, triangles: Uint32Array): number[] {
  const present = new Uint8Array(B.x.length);
  for (let e = 0; e < triangles.length; e++) {
    const a = triangles[e]!;
    const b = triangles[next3(e)]!;
    if (B.next[a] === b) present[a] = 1;
    else if (B.next[b] === a) present[b] = 1;
  }
  return B.subsegments().filter((v) => !present[v]);
}

/**
 * The boundary pieces by the cells of a grid their diametral circles cover, to find every piece a
 * point encroaches on (lies in the closed circle on the piece as diameter). Ruppert's algorithm
 * rejects such a point and splits the piece; testing only the edges of the triangle that holds the
 * point misses pieces a sliver away, and a point let in beside one of them starts a cascade of
 * ever smaller splits.
 */
class Encroachment {
  private readonly n: number;
  private readonly cell: number;
  private readonly start: Int32Array;
  private items = new Int32Array(0);

  constructor(private readonly B: Boundary) {
    // Cells about twice the mean piece: a few pieces per cell, long pieces over several cells
    // (at most about 33 × 33 for the longest).
    let total = 0;
    let longest = 0;
    let pieces = 0;
    for (let v = 0; v < B.x.length; v++)
      if (B.next[v]! >= 0) {
        const len = B.length(v);
        total += len;
        longest = Math.max(longest, len);
        pieces++;
      }
    this.cell = Math.max((2 * total) / pieces, longest / 32, 1 / 1024);
    const n = (this.n = Math.ceil(1.04 / this.cell));
    const count = new Int32Array(n * n + 1);
    for (let pass = 0; pass < 2; pass++) {
      const fill = pass === 0 ? count : count.slice(0, n * n);
      if (pass === 1) this.items = new Int32Array(count[n * n]!);
      for (let v = 0; v < B.x.length; v++) {
        const w = B.next[v]!;
        if (w < 0) continue;
        const mx = (B.x[v]! + B.x[w]!) / 2;
        const my = (B.y[v]! + B.y[w]!) / 2;
        const r = B.length(v) / 2;
        const i0 = this.index(mx - r);
        const i1 = this.index(mx + r);
        const j1 = this.index(my + r);
        for (let j = this.index(my - r); j <= j1; j++)
          for (let i = i0; i <= i1; i++) {
            if (pass === 0) count[j * n + i + 1]!++;
            else this.items[fill[j * n + i]!++] = v;
          }
      }
      if (pass === 0) for (let k = 0; k < n * n; k++) count[k + 1]! += count[k]!;
    }
    this.start = count;
  }

  private index(x: number): number {
    return Math.min(this.n - 1, Math.max(0, Math.floor((x + 0.52) / this.cell)));
  }

  /** Calls `hit` with every piece (by start point) that (x, y) encroaches on; returns whether there was one. */
  find(x: number, y: number, hit: (v: number) => void): boolean {
    const { B } = this;
    const k = this.index(y) * this.n + this.index(x);
    let any = false;
    for (let q = this.start[k]!; q < this.start[k + 1]!; q++) {
      const v = this.items[q]!;
      const w = B.next[v]!;
      if ((B.x[v]! - x) * (B.x[w]! - x) + (B.y[v]! - y) * (B.y[w]! - y) <= 0) {
        hit(v);
        any = true;
      }
    }
    return any;
  }
}

/**
 * Interior points from the size field before refinement: the field's grid visited in strides of
 * about the local size, a point kept when it falls inside the domain, no kept point lies within
 * 1.2 times the size there (about the spacing refinement itself leaves, so the element count
 * stays that of refinement alone), no vertex of its triangle within half that, and it encroaches
 * on no boundary piece. Refinement then mostly repairs angles and encroachment instead of growing
 * the interior inwards from the boundary round by round, each round triangulating afresh
 * (heat sink: 6 rounds instead of 8, a quarter less meshing time, 1 % more elements).
 */
function seed(B: Boundary, mesh: Cdt, field: SizeField): void {
  const spacing = 1.2;
  const { tri, half, inside } = mesh.view();
  const { n, cell, v } = field;
  const pieces = new Encroachment(B);
  const X = B.x;
  const Y = B.y;
  const head = new Int32Array(n * n).fill(-1);
  const link: number[] = [];
  const sx: number[] = [];
  const sy: number[] = [];
  let t = 0;
  for (let j = 0; j < n; j++)
    for (let i = 0; i < n; i++) {
      const h = v[j * n + i]!;
      const k = Math.max(1, Math.floor((spacing * h) / cell));
      if (i % k !== 0 || j % k !== 0) continue;
      const x = -0.51 + (i + 0.5) * cell;
      const y = -0.51 + (j + 0.5) * cell;
      const r = spacing * h;
      // Spacing from the points kept so far.
      let crowded = false;
      const i0 = Math.max(0, i - k);
      const i1 = Math.min(n - 1, i + k);
      const j0 = Math.max(0, j - k);
      for (let jj = j0; jj <= j && !crowded; jj++)
        for (let ii = i0; ii <= i1 && !crowded; ii++)
          for (let q = head[jj * n + ii]!; q >= 0; q = link[q]!) {
            const dx = sx[q]! - x;
            const dy = sy[q]! - y;
            if (dx * dx + dy * dy < r * r) {
              crowded = true;
              break;
            }
          }
      if (crowded) continue;
      // Containing triangle, walking from the last one found.
      let at = t;
      for (let step = 0; step < 100000 && at >= 0; step++) {
        let moved = false;
        for (let e = 3 * at; e < 3 * at + 3; e++) {
          const a = tri[e]!;
          const b = tri[next3(e)]!;
          if ((X[b]! - X[a]!) * (y - Y[a]!) - (Y[b]! - Y[a]!) * (x - X[a]!) > 0) {
            const u = half[e]!;
            at = u < 0 ? -1 : (u / 3) | 0;
            moved = true;
            break;
          }
        }
        if (!moved) break;
      }
      if (at < 0) continue;
      t = at;
      if (!inside[at]) continue;
      let clear = true;
      for (let e = 3 * at; e < 3 * at + 3 && clear; e++) {
        const a = tri[e]!;
        const b = tri[next3(e)]!;
        const dx = X[a]! - x;
        const dy = Y[a]! - y;
        if (dx * dx + dy * dy < 0.25 * r * r) clear = false;
        else if (B.isSub(a, b) && (X[a]! - x) * (X[b]! - x) + (Y[a]! - y) * (Y[b]! - y) <= 0) clear = false;
      }
      if (!clear || pieces.find(x, y, () => {})) continue;
      link.push(head[j * n + i]!);
      head[j * n + i] = sx.length;
      sx.push(x);
      sy.push(y);
    }
  // Inserted once all are chosen: the choice above reads the triangulation as it was.
  for (let q = 0; q < sx.length; q++) mesh.insert(B.add(sx[q]!, sy[q]!), mesh.count - 1);
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
  for (const v of B.subsegments()) {
    const c = curves[B.curve[v]!]!;
    const n = Math.max(1, Math.ceil(curveLength(c) / p.hmax - 1e-9), c.arc ? Math.ceil(Math.abs(c.sweep) / arcStep(c.r, p) - 1e-9) : 1);
    if (n > 1) B.split(v, n);
  }
  let changed: Uint8Array | null = null;
  for (let pass = 0; pass < 8; pass++) {
    changed = facingSizes(B, p, changed);
    if (!changed) break;
  }

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
    // Convex arcs are split finely only to follow the curve: the warping function is smooth
    // beside them (the shear stress falls towards a rounded convex corner), so they do not shrink
    // the elements inside; the angle bound alone grades the elements beside their short sides.
    // Concave arcs (root fillets) concentrate the stress and keep their small size inside.
    if (isConvex(curves[B.curve[v]!]!)) continue;
    const w = B.next[v]!;
    field.source((B.x[v]! + B.x[w]!) / 2, (B.y[v]! + B.y[w]!) / 2, B.want[v]!);
  }
  for (const { v } of corners) {
    // Grade towards re-entrant corners, where the warping function is singular.
    field.source(B.x[v]!, B.y[v]!, p.cornerFactor * B.want[v]!);
  }
  field.spread();

  // Boundary to the size field, by bisection so that pieces grade towards small sizes.
  const floor = 1e-3 * hmin;
  const stack = B.subsegments();
  while (stack.length > 0) {
    const v = stack.pop()!;
    const w = B.next[v]!;
    const len = B.length(v);
    const h = Math.min(field.at(B.x[v]!, B.y[v]!), field.at(B.x[w]!, B.y[w]!), field.at((B.x[v]! + B.x[w]!) / 2, (B.y[v]! + B.y[w]!) / 2));
    if (len > 1.05 * h && len > floor) {
      B.split(v, 2);
      stack.push(v, B.next[v]!);
    }
  }

  const sinMin = Math.sin((p.minAngle * Math.PI) / 180);
  // Points taken in a round, bucketed on the size field's grid to test their spacing.
  const gn = field.n;
  const bucket = (x: number) => Math.min(gn - 1, Math.max(0, Math.floor((x + 0.51) / field.cell)));
  const head = new Int32Array(gn * gn);
  const link: number[] = [];
  let cdt = triangulate(B);
  seed(B, cdt, field);
  // Triangles to examine in a round: all of them after a fresh triangulation; otherwise those the
  // last round's insertions made or changed and those it found bad (the others are as they were:
  // good). Marked by the round that took them.
  let candidates: number[] | null = null;
  cdt.takeTouched();
  let pieces: Encroachment | null = null;
  let taken = new Int32Array(0);
  for (let round = 0; round < 100; round++) {
    const { tri, half, inside } = cdt.view();
    const nt = tri.length / 3;
    if (taken.length < nt) taken = new Int32Array(2 * nt).fill(-1);
    const X = B.x;
    const Y = B.y;
    // Subsegments to split, by start point.
    const split = new Uint8Array(X.length);
    const splits: number[] = [];
    const markSplit = (a: number, b: number) => {
      const v = B.next[a] === b ? a : b;
      if (!split[v]) {
        split[v] = 1;
        splits.push(v);
      }
    };
    // Circumcircles of the inside triangles, and those to improve with their priority.
    const ccx = new Float64Array(nt);
    const ccy = new Float64Array(nt);
    const rr = new Float64Array(nt);
    const bad: number[] = [];
    const count = candidates ? candidates.length : nt;
    for (let c = 0; c < count; c++) {
      const t = candidates ? candidates[c]! : c;
      if (!inside[t] || taken[t] === round) continue;
      taken[t] = round;
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
        if (dot < 0 && B.next[q] !== a && B.next[b] !== q) markSplit(a, b);
      }

      // Smallest angle: opposite the shortest edge; its sine is 2·area over the two other edges.
      let sMin: number;
      let corner: number; // vertex at the smallest angle
      let o1: number; // the two others
      let o2: number;
      if (l0 <= l1 && l0 <= l2) {
        sMin = area2 / Math.sqrt(l1 * l2);
        corner = i2;
        o1 = i0;
        o2 = i1;
      } else if (l1 <= l2) {
        sMin = area2 / Math.sqrt(l0 * l2);
        corner = i0;
        o1 = i1;
        o2 = i2;
      } else {
        sMin = area2 / Math.sqrt(l0 * l1);
        corner = i1;
        o1 = i0;
        o2 = i2;
      }
      const tooBig = R > 0.75 * field.at(x0 + (bx + cx) / 3, y0 + (by + cy) / 3);
      // A sharp input corner cannot be improved: both of its sides are boundary.
      const skinny = sMin < sinMin && !(B.isSub(corner, o1) && B.isSub(corner, o2));
      if (tooBig || skinny) bad.push(t);
    }

    // Triangle holding (cx, cy), walking from t0; −1 (and the subsegment crossed marked for
    // splitting) when the walk leaves the domain.
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
              markSplit(a, b);
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

    // Largest first. A circumcentre is taken unless a point taken earlier in the round lies
    // within its triangle's circumcircle: then that triangle still exists when the point goes
    // in, so the batch is a sequential Bowyer–Watson insertion (whatever the order of the
    // others) and keeps Ruppert's insertion-radius bound; the whole set is triangulated afresh.
    bad.sort((a, b) => rr[b]! - rr[a]!);
    // The boundary changes only in rounds that split a piece.
    if (!pieces) pieces = new Encroachment(B);
    head.fill(-1);
    link.length = 0;
    const first = X.length;
    let inserted = 0;
    // Per point taken, the triangle that held it: where its insertion starts looking.
    const near: number[] = [];
    for (const t of bad) {
      const ux = ccx[t]!;
      const uy = ccy[t]!;
      const at = locate(t, ux, uy);
      if (at < 0 || !inside[at]) continue;
      let encroaches = false;
      for (let k = 0; k < 3; k++) {
        const e = 3 * at + k;
        const a = tri[e]!;
        const b = tri[next3(e)]!;
        if (!B.isSub(a, b)) continue;
        if ((X[a]! - ux) * (X[b]! - ux) + (Y[a]! - uy) * (Y[b]! - uy) <= 0) {
          markSplit(a, b);
          encroaches = true;
        }
      }
      if (!encroaches) encroaches = pieces.find(ux, uy, (v) => markSplit(v, B.next[v]!));
      if (encroaches) continue;
      const R = Math.sqrt(rr[t]!);
      let crowded = false;
      const i0 = bucket(ux - R);
      const i1 = bucket(ux + R);
      const j0 = bucket(uy - R);
      const j1 = bucket(uy + R);
      for (let j = j0; j <= j1 && !crowded; j++)
        for (let i = i0; i <= i1 && !crowded; i++)
          for (let q = head[j * gn + i]!; q >= 0; q = link[q]!) {
            const dx = X[first + q]! - ux;
            const dy = Y[first + q]! - uy;
            if (dx * dx + dy * dy < rr[t]!) {
              crowded = true;
              break;
            }
          }
      if (crowded) continue;
      const cell = bucket(uy) * gn + bucket(ux);
      link.push(head[cell]!);
      head[cell] = inserted++;
      near.push(at);
      B.add(ux, uy);
    }
    let splitCount = 0;
    for (const v of splits)
      if (B.length(v) > floor) {
        B.split(v, 2);
        splitCount++;
      }
    if (inserted === 0 && splitCount === 0) break;
    // New interior points go into the triangulation one by one; a split boundary piece (its new
    // point lies on the exact curve, off the chord) makes the triangulation start afresh.
    if (splitCount > 0) {
      cdt = triangulate(B);
      candidates = null;
      pieces = null;
    } else {
      for (let q = 0; q < inserted; q++) cdt.insert(first + q, near[q]!);
      candidates = cdt.takeTouched().concat(bad);
    }
  }

  // Keep the inside triangles, counter-clockwise, on the vertices they use.
  const { tri, inside } = cdt.view();
  const n = B.x.length;
  const map = new Int32Array(n).fill(-1);
  const keep = new Uint32Array(tri.length);
  let nk = 0;
  let nv = 0;
  for (let t = 0; t < inside.length; t++) {
    if (!inside[t]) continue;
    const a = tri[3 * t]!;
    const b = tri[3 * t + 1]!;
    const c = tri[3 * t + 2]!;
    const o = (B.x[b]! - B.x[a]!) * (B.y[c]! - B.y[a]!) - (B.y[b]! - B.y[a]!) * (B.x[c]! - B.x[a]!);
    for (let k = 0; k < 3; k++) {
      const v = k === 2 ? c : (k === 0) === o < 0 ? b : a;
      if (map[v] === -1) map[v] = nv++;
      keep[nk++] = map[v]!;
    }
  }
  const x = new Float64Array(nv);
  const y = new Float64Array(nv);
  for (let v = 0; v < n; v++)
    if (map[v]! >= 0) {
      x[map[v]!] = B.x[v]!;
      y[map[v]!] = B.y[v]!;
    }
  const subs = B.subsegments();
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
  return { x, y, tri: keep.slice(0, nk), ba, bb, bc, bt0, bt1, curves, reentrant, sharpest };
}
