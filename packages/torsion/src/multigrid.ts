import { TorsionError } from './errors';
import type { Level } from './levels';
import { assembleRows, entry, permute, reverseCuthillMcKee, type Csr } from './sparse';

/**
 * Dense-profile (envelope) Cholesky factor of a symmetric positive definite matrix in reverse
 * Cuthill–McKee order (George & Liu 1981, ch. 4): row i is stored from its first nonzero column
 * to the diagonal, and the factor fills only inside that envelope. Used for the coarsest level
 * of the multigrid cycle, where it is small; reused for every right-hand side.
 */
export class EnvelopeCholesky {
  private readonly perm: Int32Array;
  private readonly first: Int32Array;
  private readonly start: Int32Array;
  private readonly L: Float64Array;
  private readonly w: Float64Array;

  constructor(A: Csr) {
    const n = A.n;
    this.perm = reverseCuthillMcKee(A).perm;
    const B = permute(A, this.perm);
    const first = new Int32Array(n);
    const start = new Int32Array(n + 1);
    for (let i = 0; i < n; i++) {
      first[i] = Math.min(i, B.col[B.rowPtr[i]!]!);
      start[i + 1] = start[i]! + (i - first[i]! + 1);
    }
    const L = new Float64Array(start[n]!);
    for (let i = 0; i < n; i++)
      for (let k = B.rowPtr[i]!; k < B.rowPtr[i + 1]!; k++) {
        const j = B.col[k]!;
        if (j <= i) L[start[i]! + j - first[i]!] = B.val[k]!;
      }
    for (let i = 0; i < n; i++) {
      const fi = first[i]!;
      const si = start[i]! - fi; // L[si + j] is entry (i, j)
      for (let j = fi; j < i; j++) {
        const fj = first[j]!;
        const sj = start[j]! - fj;
        let s = L[si + j]!;
        for (let k = Math.max(fi, fj); k < j; k++) s -= L[si + k]! * L[sj + k]!;
        L[si + j] = s / L[sj + j]!;
      }
      let d = L[si + i]!;
      for (let k = fi; k < i; k++) d -= L[si + k]! * L[si + k]!;
      if (!(d > 0)) throw new TorsionError('SOLVER_FAILED', 'coarse matrix is not positive definite');
      L[si + i] = Math.sqrt(d);
    }
    this.first = first;
    this.start = start;
    this.L = L;
    this.w = new Float64Array(n);
  }

  /** x = A⁻¹ b. */
  solve(b: Float64Array, x: Float64Array): void {
    const { perm, first, start, L, w } = this;
    const n = perm.length;
    for (let i = 0; i < n; i++) {
      const si = start[i]! - first[i]!;
      let s = b[perm[i]!]!;
      for (let k = first[i]!; k < i; k++) s -= L[si + k]! * w[k]!;
      w[i] = s / L[si + i]!;
    }
    for (let i = n - 1; i >= 0; i--) {
      const si = start[i]! - first[i]!;
      const wi = w[i]! / L[si + i]!;
      w[i] = wi;
      for (let k = first[i]!; k < i; k++) w[k]! -= L[si + k]! * wi;
    }
    for (let i = 0; i < n; i++) x[perm[i]!] = w[i]!;
  }
}

/** Barycentric coordinates of the corners of the four children of a triangle (order as in `refine`). */
const CHILD = [
  [1, 0, 0], [0.5, 0.5, 0], [0.5, 0, 0.5],
  [0.5, 0.5, 0], [0, 1, 0], [0, 0.5, 0.5],
  [0.5, 0, 0.5], [0, 0.5, 0.5], [0, 0, 1],
  [0.5, 0.5, 0], [0, 0.5, 0.5], [0.5, 0, 0.5],
];

/**
 * Weights of the 12 child edge nodes (4 children × 3 edges) on the parent's six nodes, nonzero
 * ones only: node EDGE_NODE[EDGE_START[m] + q] with weight EDGE_W[…], q < EDGE_START[m + 1] − EDGE_START[m].
 */
const EDGE_START = new Int32Array(13);
const EDGE_NODE: number[] = [];
const EDGE_W: number[] = [];
for (let m = 0; m < 12; m++) {
  const c = (m / 3) | 0;
  const a = CHILD[3 * c + (m % 3)]!;
  const b = CHILD[3 * c + ((m + 1) % 3)]!;
  const l = [(a[0]! + b[0]!) / 2, (a[1]! + b[1]!) / 2, (a[2]! + b[2]!) / 2] as const;
  const w = [l[0] * (2 * l[0] - 1), l[1] * (2 * l[1] - 1), l[2] * (2 * l[2] - 1), 4 * l[0] * l[1], 4 * l[1] * l[2], 4 * l[2] * l[0]];
  w.forEach((v, k) => {
    if (v !== 0) {
      EDGE_NODE.push(k);
      EDGE_W.push(v);
    }
  });
  EDGE_START[m + 1] = EDGE_NODE.length;
}

/**
 * Prolongation from a quadratic level to its uniform refinement: fine corners are the coarse
 * nodes; a fine edge node takes the parent's quadratic interpolant at its barycentric position.
 */
export function quadraticTransfer(coarse: Level, fine: Level): Csr {
  const nc = coarse.quad.x.length;
  const nf = fine.quad.x.length;
  const cel = coarse.quad.el;
  const fel = fine.quad.el;
  const nt = cel.length / 6;
  // Row lengths: one for a corner, the weights' count for an edge node (from its first parent).
  const rowPtr = new Int32Array(nf + 1);
  const from = new Int32Array(nf).fill(-1); // 12·parent + child edge that defines the node
  for (let i = 0; i < nc; i++) rowPtr[i + 1] = 1;
  for (let t = 0; t < nt; t++)
    for (let m = 0; m < 12; m++) {
      const node = fel[6 * (4 * t + ((m / 3) | 0)) + 3 + (m % 3)]!;
      if (node < nc || from[node]! >= 0) continue;
      from[node] = 12 * t + m;
      rowPtr[node + 1] = EDGE_START[m + 1]! - EDGE_START[m]!;
    }
  for (let i = 0; i < nf; i++) rowPtr[i + 1]! += rowPtr[i]!;
  const col = new Int32Array(rowPtr[nf]!);
  const val = new Float64Array(rowPtr[nf]!);
  for (let i = 0; i < nc; i++) {
    col[rowPtr[i]!] = i;
    val[rowPtr[i]!] = 1;
  }
  for (let i = nc; i < nf; i++) {
    const t = (from[i]! / 12) | 0;
    const m = from[i]! - 12 * t;
    for (let q = EDGE_START[m]!, p = rowPtr[i]!; q < EDGE_START[m + 1]!; q++, p++) {
      col[p] = cel[6 * t + EDGE_NODE[q]!]!;
      val[p] = EDGE_W[q]!;
    }
  }
  return { n: nc, rowPtr, col, val };
}

/** P·u for a prolongation P (one row per fine node; P.n counts the coarse ones). */
export function interpolate(P: Csr, u: Float64Array): Float64Array {
  const nf = P.rowPtr.length - 1;
  const out = new Float64Array(nf);
  for (let i = 0; i < nf; i++) {
    let s = 0;
    const e = P.rowPtr[i + 1]!;
    for (let k = P.rowPtr[i]!; k < e; k++) s += P.val[k]! * u[P.col[k]!]!;
    out[i] = s;
  }
  return out;
}

/** Prolongation from linear to quadratic elements on the same triangulation (edge node = mean of its ends). */
export function linearTransfer(L: Level): Csr {
  const nv = L.quad.corners;
  const nn = L.quad.x.length;
  const rowPtr = new Int32Array(nn + 1);
  for (let i = 0; i < nn; i++) rowPtr[i + 1] = rowPtr[i]! + (i < nv ? 1 : 2);
  const col = new Int32Array(rowPtr[nn]!);
  const val = new Float64Array(rowPtr[nn]!).fill(0.5);
  for (let i = 0; i < nv; i++) {
    col[i] = i;
    val[i] = 1;
  }
  for (let e = 0; e < nn - nv; e++) {
    col[nv + 2 * e] = L.edges.ea[e]!;
    col[nv + 2 * e + 1] = L.edges.eb[e]!;
  }
  return { n: nv, rowPtr, col, val };
}

/** Cotangent form of the linear triangle: pair p = (a, a+1) contributes E_ab + E_ba − E_aa − E_bb. */
const LINEAR = [0, 1, 2].map((p) => {
  const a = p;
  const b = (p + 1) % 3;
  const S = new Float64Array(9);
  S[3 * a + b] = S[3 * b + a] = 1;
  S[3 * a + a] = S[3 * b + b] = -1;
  return S;
}) as [Float64Array, Float64Array, Float64Array];

/** Stiffness of linear triangles (straight sides) on the corners of a level: the coarsest operator. */
export function linearStiffness(L: Level, held: Uint8Array): Csr {
  const { x, y } = L.quad;
  const tri = L.tri.tri;
  const nt = tri.length / 3;
  // g_p = A·∇λa·∇λb = (ba·bb + ca·cb)/4A for the pair p = (a, a+1), as for the quadratic element.
  const g = new Float64Array(3 * nt);
  for (let t = 0; t < nt; t++) {
    const v0 = tri[3 * t]!;
    const v1 = tri[3 * t + 1]!;
    const v2 = tri[3 * t + 2]!;
    const b0 = y[v1]! - y[v2]!;
    const b1 = y[v2]! - y[v0]!;
    const b2 = y[v0]! - y[v1]!;
    const c0 = x[v2]! - x[v1]!;
    const c1 = x[v0]! - x[v2]!;
    const c2 = x[v1]! - x[v0]!;
    const d = b0 * c1 - b1 * c0;
    g[3 * t] = (b0 * b1 + c0 * c1) / (2 * d);
    g[3 * t + 1] = (b1 * b2 + c1 * c2) / (2 * d);
    g[3 * t + 2] = (b2 * b0 + c2 * c0) / (2 * d);
  }
  const K = assembleRows(tri, 3, L.quad.corners, LINEAR, g, null, null);
  holdRows(K, held);
  return K;
}

/** Rows and columns of held nodes become those of the identity (ω = 0 there). */
export function holdRows(K: Csr, held: Uint8Array): void {
  for (let h = 0; h < K.n; h++) {
    if (!held[h]) continue;
    for (let k = K.rowPtr[h]!; k < K.rowPtr[h + 1]!; k++) {
      const j = K.col[k]!;
      K.val[k] = j === h ? 1 : 0;
      if (j !== h) K.val[entry(K, j, h)] = 0;
    }
  }
}

export interface GridLevel {
  readonly K: Csr;
  /** Reciprocal of each row's diagonal entry (a product in the sweeps, not a division). */
  readonly inv: Float64Array;
  /** Position of each row's diagonal entry (columns ascend: the lower part lies before it). */
  readonly dpos: Int32Array;
  readonly held: Uint8Array;
  /** Prolongation from the next coarser level. */
  readonly P: Csr;
}

/**
 * Multigrid V-cycle used as the preconditioner of conjugate gradients (Hackbusch, "Multi-Grid
 * Methods and Applications", 1985; Briggs, Henson & McCormick, "A Multigrid Tutorial", 2000):
 * one forward Gauss–Seidel sweep before and one backward sweep after the coarse correction,
 * restriction the transpose of prolongation, so the cycle is a symmetric positive definite
 * operator. Levels: linear elements on the coarsest triangulation (solved by `EnvelopeCholesky`),
 * then the quadratic elements of every mesh level. The iteration count stays nearly constant
 * as the mesh is refined, where IC(0) needs about twice as many per halving of h.
 */
export class Multigrid {
  readonly levels: GridLevel[] = [];
  private readonly scratch: Float64Array[][] = [];

  constructor(
    private readonly coarse: EnvelopeCholesky,
    private readonly coarseHeld: Uint8Array,
    private readonly coarseSize: number,
  ) {}

  push(K: Csr, held: Uint8Array, P: Csr): void {
    const inv = new Float64Array(K.n);
    const dpos = new Int32Array(K.n);
    for (let i = 0; i < K.n; i++) {
      let k = K.rowPtr[i]!;
      while (K.col[k] !== i) k++;
      dpos[i] = k;
      inv[i] = 1 / K.val[k]!;
    }
    this.levels.push({ K, inv, dpos, held, P });
    const nc = this.levels.length > 1 ? this.levels[this.levels.length - 2]!.K.n : this.coarseSize;
    this.scratch.push([new Float64Array(K.n), new Float64Array(nc), new Float64Array(nc)]);
  }

  /** z ≈ K⁻¹ r on the finest level pushed so far. */
  apply(r: Float64Array, z: Float64Array): void {
    this.cycle(this.levels.length - 1, r, z);
  }

  private cycle(l: number, b: Float64Array, x: Float64Array): void {
    if (l < 0) {
      this.coarse.solve(b, x);
      for (let i = 0; i < x.length; i++) if (this.coarseHeld[i]) x[i] = 0;
      return;
    }
    const { K, inv, dpos, P } = this.levels[l]!;
    const { rowPtr, col, val } = K;
    const n = K.n;
    const [res, bc, xc] = this.scratch[l]!;
    // Forward sweep from x = 0: row i sees only the new values before it. Its residual is then
    // b_i − Σ_{j<i} K_ij·x_j − K_ii·x_i − Σ_{j>i} K_ij·x_j = −Σ_{j>i} K_ij·x_j, so sweep and
    // residual together read each row once. (Loop bounds are read into locals: the engine cannot
    // tell that the arrays written do not alias them, and would reload them at every step.)
    for (let i = 0; i < n; i++) {
      let s = b[i]!;
      const d = dpos[i]!;
      for (let k = rowPtr[i]!; k < d; k++) s -= val[k]! * x[col[k]!]!;
      x[i] = s * inv[i]!;
    }
    for (let i = 0; i < n; i++) {
      let s = 0;
      const e = rowPtr[i + 1]!;
      for (let k = dpos[i]! + 1; k < e; k++) s -= val[k]! * x[col[k]!]!;
      res![i] = s;
    }
    // bc = Pᵀ·res, with the coarse level's held nodes left out.
    const { rowPtr: pr, col: pc, val: pv } = P;
    bc!.fill(0);
    for (let i = 0; i < n; i++) {
      const ri = res![i]!;
      const e = pr[i + 1]!;
      for (let k = pr[i]!; k < e; k++) bc![pc[k]!]! += pv[k]! * ri;
    }
    const heldC = l > 0 ? this.levels[l - 1]!.held : this.coarseHeld;
    for (let i = 0; i < bc!.length; i++) if (heldC[i]) bc![i] = 0;
    this.cycle(l - 1, bc!, xc!);
    for (let i = 0; i < n; i++) {
      let s = 0;
      const e = pr[i + 1]!;
      for (let k = pr[i]!; k < e; k++) s += pv[k]! * xc![pc[k]!]!;
      x[i]! += s;
    }
    for (let i = n - 1; i >= 0; i--) {
      let s = b[i]!;
      const e = rowPtr[i + 1]!;
      for (let k = rowPtr[i]!; k < e; k++) s -= val[k]! * x[col[k]!]!;
      x[i]! += s * inv[i]!;
    }
  }
}
