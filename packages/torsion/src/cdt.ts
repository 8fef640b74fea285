/**
 * A constrained Delaunay triangulation that grows point by point: a point inside a triangle splits
 * it in three, a point on an edge splits the two triangles beside it, and Lawson's flips restore
 * the Delaunay property everywhere except across constrained edges, which are never flipped
 * (Lawson, "Software for C¹ surface interpolation", 1977; for the constrained case Chew,
 * "Constrained Delaunay triangulations", Algorithmica 4, 1989). The result is the constrained
 * Delaunay triangulation of all points so far, as a fresh triangulation would give (up to the
 * choice of diagonal among cocircular points), at a cost per point that does not grow with the mesh.
 *
 * Layout as delaunator's: half-edge e runs from tri[e] to tri[next(e)], half[e] is its twin in the
 * neighbouring triangle (−1 on the hull), and triangles turn clockwise with y up.
 */
export class Cdt {
  tri: Uint32Array;
  half: Int32Array;
  inside: Uint8Array;
  /** Triangles in use. */
  count: number;
  private readonly stack: number[] = [];
  private seed = 1;
  /** Triangles made or changed since `takeTouched` was last called. */
  private touched: number[] = [];

  constructor(
    tri: Uint32Array,
    half: Int32Array,
    inside: Uint8Array,
    private readonly X: readonly number[],
    private readonly Y: readonly number[],
    /** Whether the edge between two vertices is constrained (never flipped, never split here). */
    private readonly constrained: (a: number, b: number) => boolean,
  ) {
    this.count = tri.length / 3;
    const cap = Math.ceil(this.count * 1.5) + 16;
    this.tri = new Uint32Array(3 * cap);
    this.half = new Int32Array(3 * cap);
    this.inside = new Uint8Array(cap);
    this.tri.set(tri);
    this.half.set(half);
    this.inside.set(inside);
  }

  /** The triangles made or changed since the last call (repeats possible), and a fresh list. */
  takeTouched(): number[] {
    const out = this.touched;
    this.touched = [];
    return out;
  }

  /** The triangles in use, as views (valid until the next insertion). */
  view(): { tri: Uint32Array; half: Int32Array; inside: Uint8Array } {
    return {
      tri: this.tri.subarray(0, 3 * this.count),
      half: this.half.subarray(0, 3 * this.count),
      inside: this.inside.subarray(0, this.count),
    };
  }

  /**
   * Inserts vertex p (its coordinates already in X, Y), searching from triangle `near`. Returns
   * false, leaving the triangulation as it was, when p falls outside the hull, on a vertex, or on
   * a constrained edge: refinement never asks for those, so a point there is dropped.
   */
  insert(p: number, near: number): boolean {
    const px = this.X[p]!;
    const py = this.Y[p]!;
    const found = this.locate(px, py, Math.min(Math.max(near, 0), this.count - 1));
    if (found < 0) return false;
    const t = found >> 2;
    const edge = found & 3;
    if (edge === 3) this.splitTriangle(t, p);
    else {
      const e = 3 * t + edge;
      const a = this.tri[e]!;
      const b = this.tri[next3(e)]!;
      if (this.half[e]! < 0 || this.constrained(a, b)) return false;
      if (this.onVertex(px, py, a) || this.onVertex(px, py, b)) return false;
      this.splitEdge(e, p);
    }
    return true;
  }

  private onVertex(px: number, py: number, v: number): boolean {
    return px === this.X[v] && py === this.Y[v];
  }

  /**
   * The triangle holding (px, py), walking from t0 across the edges the point lies beyond,
   * starting each triangle's test at a varying edge (a walk that always tries edges in the same
   * order can circle forever in a non-Delaunay triangulation; Devillers, Pion & Teillaud,
   * "Walking in a triangulation", IJFCS 13, 2002). Returns 4t + 3 when the point lies inside
   * triangle t, 4t + i when it lies on its edge i, −1 outside the hull.
   */
  private locate(px: number, py: number, t0: number): number {
    let t = t0;
    for (let step = 0, limit = 4 * this.count + 16; step < limit; step++) {
      let moved = false;
      let on = 3;
      this.seed = (this.seed * 1103515245 + 12345) & 0x7fffffff;
      const r = this.seed % 3;
      for (let k = 0; k < 3; k++) {
        const i = (r + k) % 3;
        const e = 3 * t + i;
        const side = this.side(e, px, py);
        if (side > 0) {
          const u = this.half[e]!;
          if (u < 0) return -1;
          t = (u / 3) | 0;
          moved = true;
          break;
        }
        if (side === 0) on = i;
      }
      if (!moved) return 4 * t + on;
    }
    // The walk did not settle (rounding on a degenerate configuration): search every triangle.
    for (let s = 0; s < this.count; s++) {
      let on = 3;
      let out = false;
      for (let i = 0; i < 3 && !out; i++) {
        const side = this.side(3 * s + i, px, py);
        if (side > 0) out = true;
        else if (side === 0) on = i;
      }
      if (!out) return 4 * s + on;
    }
    return -1;
  }

  /**
   * Where (px, py) lies against half-edge e = a→b: 1 beyond it (on its left: triangles turn
   * clockwise), 0 on it within rounding, −1 on the triangle's side.
   */
  private side(e: number, px: number, py: number): number {
    const { tri, X, Y } = this;
    const a = tri[e]!;
    const b = tri[next3(e)]!;
    const ex = X[b]! - X[a]!;
    const ey = Y[b]! - Y[a]!;
    const o = ex * (py - Y[a]!) - ey * (px - X[a]!);
    const tol = 1e-13 * (ex * ex + ey * ey);
    return o > tol ? 1 : o >= -tol ? 0 : -1;
  }

  private grow(extra: number): void {
    if (this.count + extra <= this.inside.length) return;
    const cap = 2 * (this.count + extra);
    const tri = new Uint32Array(3 * cap);
    const half = new Int32Array(3 * cap);
    const inside = new Uint8Array(cap);
    tri.set(this.tri.subarray(0, 3 * this.count));
    half.set(this.half.subarray(0, 3 * this.count));
    inside.set(this.inside.subarray(0, this.count));
    this.tri = tri;
    this.half = half;
    this.inside = inside;
  }

  private link(e: number, f: number): void {
    this.half[e] = f;
    if (f >= 0) this.half[f] = e;
  }

  /** p inside triangle t = (a, b, c): t becomes (a, b, p), and (b, c, p), (c, a, p) are added. */
  private splitTriangle(t: number, p: number): void {
    this.grow(2);
    const { tri } = this;
    const e = 3 * t;
    const a = tri[e]!;
    const b = tri[e + 1]!;
    const c = tri[e + 2]!;
    const hbc = this.half[e + 1]!;
    const hca = this.half[e + 2]!;
    const t1 = 3 * this.count;
    const t2 = t1 + 3;
    this.count += 2;
    this.inside[t1 / 3] = this.inside[t2 / 3] = this.inside[t]!;
    tri[e + 2] = p;
    tri[t1] = b;
    tri[t1 + 1] = c;
    tri[t1 + 2] = p;
    tri[t2] = c;
    tri[t2 + 1] = a;
    tri[t2 + 2] = p;
    this.link(t1, hbc);
    this.link(t2, hca);
    this.link(e + 1, t1 + 2);
    this.link(t1 + 1, t2 + 2);
    this.link(t2 + 1, e + 2);
    this.touched.push(t, t1 / 3, t2 / 3);
    this.legalize(e);
    this.legalize(t1);
    this.legalize(t2);
  }

  /**
   * p on edge e = a→b of T = (a, b, c), whose twin lies in U = (b, a, d): T becomes (a, p, c),
   * U becomes (b, p, d), and (p, b, c), (p, a, d) are added.
   */
  private splitEdge(e: number, p: number): void {
    this.grow(2);
    const { tri } = this;
    const o = this.half[e]!;
    const en = next3(e);
    const ep = prev3(e);
    const on = next3(o);
    const op = prev3(o);
    const a = tri[e]!;
    const b = tri[en]!;
    const c = tri[ep]!;
    const d = tri[op]!;
    const hbc = this.half[en]!;
    const had = this.half[on]!;
    const t2 = 3 * this.count;
    const u2 = t2 + 3;
    this.count += 2;
    this.inside[t2 / 3] = this.inside[(e / 3) | 0]!;
    this.inside[u2 / 3] = this.inside[(o / 3) | 0]!;
    tri[en] = p; // T: a→p, p→c, c→a
    tri[on] = p; // U: b→p, p→d, d→b
    tri[t2] = p;
    tri[t2 + 1] = b;
    tri[t2 + 2] = c;
    tri[u2] = p;
    tri[u2 + 1] = a;
    tri[u2 + 2] = d;
    this.link(e, u2);
    this.link(en, t2 + 2);
    this.link(t2, o);
    this.link(on, u2 + 2);
    this.link(t2 + 1, hbc);
    this.link(u2 + 1, had);
    this.touched.push((e / 3) | 0, (o / 3) | 0, t2 / 3, u2 / 3);
    this.legalize(ep);
    this.legalize(t2 + 1);
    this.legalize(op);
    this.legalize(u2 + 1);
  }

  /**
   * Flips edge e (and, in turn, the edges it exposes) while the vertex across it lies inside the
   * circumcircle of e's triangle, except across constrained edges.
   */
  private legalize(e0: number): void {
    const { tri, half, X, Y, stack } = this;
    stack.push(e0);
    while (stack.length > 0) {
      const e = stack.pop()!;
      const o = half[e]!;
      if (o < 0) continue;
      const en = next3(e);
      const ep = prev3(e);
      const on = next3(o);
      const op = prev3(o);
      const a = tri[e]!;
      const b = tri[en]!;
      const p = tri[ep]!;
      const q = tri[op]!;
      if (this.constrained(a, b)) continue;
      if (!inCircle(X[a]!, Y[a]!, X[b]!, Y[b]!, X[p]!, Y[p]!, X[q]!, Y[q]!)) continue;
      // (a, b, p) and (b, a, q) become (a, q, p) and (q, b, p).
      const haq = half[on]!;
      const hqb = half[op]!;
      const hbp = half[en]!;
      tri[en] = q;
      tri[o] = q;
      tri[on] = b;
      tri[op] = p;
      this.link(e, haq);
      this.link(en, op);
      this.link(o, hqb);
      this.link(on, hbp);
      this.touched.push((e / 3) | 0, (o / 3) | 0);
      stack.push(e, o);
    }
  }
}

const next3 = (e: number) => (e % 3 === 2 ? e - 2 : e + 1);
const prev3 = (e: number) => (e % 3 === 0 ? e + 2 : e - 1);

/**
 * Whether (px, py) lies inside the circumcircle of the clockwise triangle a, b, c (delaunator's
 * orientation), by more than rounding: a near-tie keeps the present diagonal, so flips cannot
 * cycle on cocircular points.
 */
function inCircle(ax: number, ay: number, bx: number, by: number, cx: number, cy: number, px: number, py: number): boolean {
  const dx = ax - px;
  const dy = ay - py;
  const ex = bx - px;
  const ey = by - py;
  const fx = cx - px;
  const fy = cy - py;
  const ap = dx * dx + dy * dy;
  const bp = ex * ex + ey * ey;
  const cp = fx * fx + fy * fy;
  const det = dx * (ey * cp - bp * fy) - dy * (ex * cp - bp * fx) + ap * (ex * fy - ey * fx);
  const scale = (ap + bp + cp) * (ap + bp + cp);
  return det < -1e-12 * scale;
}
