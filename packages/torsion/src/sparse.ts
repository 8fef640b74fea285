import { TorsionError } from './errors';

/**
 * Symmetric sparse matrix in compressed sparse row form, both triangles stored, column indices
 * ascending within each row.
 */
export interface Csr {
  readonly n: number;
  readonly rowPtr: Int32Array;
  readonly col: Int32Array;
  readonly val: Float64Array;
}

/**
 * Sparsity pattern of a finite-element matrix, values zero: rows i and j couple when nodes i and j
 * share an element. `el` lists `per` node numbers for each element.
 */
export function patternOf(el: ArrayLike<number>, per: number, n: number): Csr {
  // Every local pair couples (the fixed matrices are all ones), with weights zero.
  const one = new Float64Array(per * per).fill(1);
  return assembleRows(Uint32Array.from(el), per, n, [one, one, one], new Float64Array((3 * el.length) / per), null, null);
}

/**
 * Assembled finite-element matrix, row by row: the elements around a node add their rows into a
 * dense scratch row, whose columns are then written out in ascending order (pattern and values
 * in one sweep, no search for an entry's position). Element e's matrix is
 * g[3e]·S[0] + g[3e + 1]·S[1] + g[3e + 2]·S[2] with fixed per × per matrices S (the cotangent form
 * of a straight-sided element: three numbers to store per element, not per²), or, where
 * own[e] ≥ 0, its own matrix ke[per²·own[e] …] (row-major; elements with a curved side).
 * A local pair that is zero in all three fixed matrices is left out of the pattern unless an
 * element with its own matrix couples the two nodes: in the straight quadratic triangle a corner
 * and the node on the opposite side do not couple, and leaving those pairs out saves about 30 %
 * of the entries of a quadratic mesh's matrix (and of the time of every product with it).
 */
export function assembleRows(
  el: Uint32Array,
  per: number,
  n: number,
  S: readonly [Float64Array, Float64Array, Float64Array],
  g: Float64Array,
  own: Int32Array | null,
  ke: Float64Array | null,
): Csr {
  const [S0, S1, S2] = S;
  const pp = per * per;
  const ne = el.length / per;
  // Per local row l, the local columns coupled in the fixed matrices: pairs[pairStart[l] …].
  const pairStart = new Int32Array(per + 1);
  const pairs = new Int32Array(pp);
  for (let l = 0, q = 0; l < per; l++, pairStart[l] = q)
    for (let j = 0; j < per; j++) if (S0[l * per + j] !== 0 || S1[l * per + j] !== 0 || S2[l * per + j] !== 0) pairs[q++] = j;
  // Each node's (element, local index) pairs, by counting sort.
  const start = new Int32Array(n + 1);
  for (let k = 0; k < el.length; k++) start[el[k]! + 1]!++;
  for (let i = 0; i < n; i++) start[i + 1]! += start[i]!;
  const slotE = new Int32Array(el.length);
  const slotL = new Uint8Array(el.length);
  const fill = start.slice(0, n);
  for (let e = 0, k = 0; e < ne; e++)
    for (let l = 0; l < per; l++, k++) {
      const s = fill[el[k]!]!++;
      slotE[s] = e;
      slotL[s] = l;
    }
  // Columns of each row: counted first, so the arrays are allocated once at their size.
  const mark = new Int32Array(n).fill(-1);
  const rowPtr = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) {
    let c = 0;
    const s1 = start[i + 1]!;
    for (let s = start[i]!; s < s1; s++) {
      const e = slotE[s]!;
      const o = e * per;
      if (own !== null && own[e]! >= 0) {
        for (let j = 0; j < per; j++) {
          const col = el[o + j]!;
          if (mark[col] !== i) {
            mark[col] = i;
            c++;
          }
        }
        continue;
      }
      const l = slotL[s]!;
      for (let q = pairStart[l]!, qe = pairStart[l + 1]!; q < qe; q++) {
        const col = el[o + pairs[q]!]!;
        if (mark[col] !== i) {
          mark[col] = i;
          c++;
        }
      }
    }
    rowPtr[i + 1] = rowPtr[i]! + c;
  }
  const col = new Int32Array(rowPtr[n]!);
  const val = new Float64Array(rowPtr[n]!);
  const acc = new Float64Array(n);
  mark.fill(-1);
  for (let i = 0; i < n; i++) {
    const r0 = rowPtr[i]!;
    let p = r0;
    const s1 = start[i + 1]!;
    for (let s = start[i]!; s < s1; s++) {
      const e = slotE[s]!;
      const l = slotL[s]!;
      const row = l * per;
      const o = own ? own[e]! : -1;
      const g0 = g[3 * e]!;
      const g1 = g[3 * e + 1]!;
      const g2 = g[3 * e + 2]!;
      const q0 = o >= 0 ? 0 : pairStart[l]!;
      const q1 = o >= 0 ? per : pairStart[l + 1]!;
      for (let t = q0; t < q1; t++) {
        const j = o >= 0 ? t : pairs[t]!;
        const c = el[e * per + j]!;
        if (mark[c] !== i) {
          mark[c] = i;
          acc[c] = 0;
          // Insertion into the sorted row (rows are short).
          let q = p++;
          while (q > r0 && col[q - 1]! > c) {
            col[q] = col[q - 1]!;
            q--;
          }
          col[q] = c;
        }
        const r = row + j;
        acc[c]! += o >= 0 ? ke![o * pp + r]! : g0 * S0[r]! + g1 * S1[r]! + g2 * S2[r]!;
      }
    }
    for (let q = r0; q < p; q++) val[q] = acc[col[q]!]!;
  }
  return { n, rowPtr, col, val };
}

/** Position of entry (i, j) in the matrix's arrays (−1 if outside the pattern). */
export function entry(A: Csr, i: number, j: number): number {
  let lo = A.rowPtr[i]!;
  let hi = A.rowPtr[i + 1]! - 1;
  while (lo <= hi) {
    const m = (lo + hi) >> 1;
    const c = A.col[m]!;
    if (c === j) return m;
    if (c < j) lo = m + 1;
    else hi = m - 1;
  }
  return -1;
}

/** y = A·x. */
export function multiply(A: Csr, x: Float64Array, y: Float64Array): void {
  const { n, rowPtr, col, val } = A;
  for (let i = 0; i < n; i++) {
    let s = 0;
    const e = rowPtr[i + 1]!; // a local bound: the engine would reload it (y might alias it)
    for (let k = rowPtr[i]!; k < e; k++) s += val[k]! * x[col[k]!]!;
    y[i] = s;
  }
}

/**
 * Reverse Cuthill–McKee ordering (Cuthill & McKee 1969; George & Liu, "Computer Solution of Large
 * Sparse Positive Definite Systems", 1981, §4.3): breadth-first from a pseudo-peripheral node,
 * neighbours by increasing degree, reversed. Keeps couplings near the diagonal, so the
 * factor and the vectors stay in cache. Returns perm (new → old) and the connected component of
 * every node (numbered in order of discovery).
 */
export function reverseCuthillMcKee(A: Csr): { perm: Int32Array; component: Int32Array; components: number } {
  const { n, rowPtr, col } = A;
  const degree = (i: number) => rowPtr[i + 1]! - rowPtr[i]!;
  const component = new Int32Array(n).fill(-1);
  const order = new Int32Array(n);
  let filled = 0;
  let components = 0;
  const level = new Int32Array(n);

  // Breadth-first sweep from `root` over its component; returns the last node found (deepest level).
  const sweep = (root: number, into: Int32Array, start: number, tag: number): number => {
    into[start] = root;
    component[root] = tag;
    level[root] = 0;
    let head = start;
    let tail = start + 1;
    while (head < tail) {
      const i = into[head++]!;
      const first = tail;
      for (let k = rowPtr[i]!; k < rowPtr[i + 1]!; k++) {
        const j = col[k]!;
        if (component[j] === tag) continue;
        component[j] = tag;
        level[j] = level[i]! + 1;
        into[tail++] = j;
      }
      // Neighbours in increasing degree (insertion sort: rows are short).
      for (let a = first + 1; a < tail; a++) {
        const v = into[a]!;
        let b = a - 1;
        while (b >= first && degree(into[b]!) > degree(v)) {
          into[b + 1] = into[b]!;
          b--;
        }
        into[b + 1] = v;
      }
    }
    return tail;
  };

  const scratch = new Int32Array(n);
  for (let s = 0; s < n; s++) {
    if (component[s] !== -1) continue;
    // Pseudo-peripheral root: repeat sweeps from the last node of the previous sweep (George & Liu).
    let root = s;
    let depth = -1;
    for (let it = 0; it < 4; it++) {
      const end = sweep(root, scratch, 0, -2);
      const last = scratch[end - 1]!;
      const d = level[last]!;
      for (let k = 0; k < end; k++) component[scratch[k]!] = -1;
      if (d <= depth) break;
      depth = d;
      // Among the deepest level prefer the node of least degree.
      let best = last;
      for (let k = end - 1; k >= 0 && level[scratch[k]!] === d; k--)
        if (degree(scratch[k]!) < degree(best)) best = scratch[k]!;
      root = best;
    }
    const end = sweep(root, order, filled, components);
    filled = end;
    components++;
  }
  const perm = new Int32Array(n);
  for (let k = 0; k < n; k++) perm[k] = order[n - 1 - k]!;
  return { perm, component, components };
}

/** B = P·A·Pᵀ for perm (new → old): row/column i of B is row/column perm[i] of A. */
export function permute(A: Csr, perm: Int32Array): Csr {
  const { n } = A;
  const inv = new Int32Array(n);
  for (let i = 0; i < n; i++) inv[perm[i]!] = i;
  const rowPtr = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) rowPtr[i + 1] = rowPtr[i]! + (A.rowPtr[perm[i]! + 1]! - A.rowPtr[perm[i]!]!);
  const col = new Int32Array(A.col.length);
  const val = new Float64Array(A.col.length);
  for (let i = 0; i < n; i++) {
    const o = perm[i]!;
    const r0 = rowPtr[i]!;
    let p = r0;
    for (let k = A.rowPtr[o]!; k < A.rowPtr[o + 1]!; k++, p++) {
      // Insertion into the sorted row (rows are short).
      const c = inv[A.col[k]!]!;
      const v = A.val[k]!;
      let q = p;
      while (q > r0 && col[q - 1]! > c) {
        col[q] = col[q - 1]!;
        val[q] = val[q - 1]!;
        q--;
      }
      col[q] = c;
      val[q] = v;
    }
  }
  return { n, rowPtr, col, val };
}

/** Lower-triangular factor L (diagonal last in each row) with A ≈ L·Lᵀ. */
export interface Factor {
  readonly n: number;
  readonly rowPtr: Int32Array;
  readonly col: Int32Array;
  readonly val: Float64Array;
  /** Diagonal shift that made the incomplete factorisation succeed (0 when none was needed). */
  readonly shift: number;
}

/**
 * Incomplete Cholesky factorisation with no fill, IC(0) (Meijerink & van der Vorst, Math. Comp.
 * 31, 1977): L has the pattern of A's lower triangle. Quadratic-element matrices are not
 * M-matrices and a pivot can fail; then the factorisation restarts on A + α·diag(A) with α
 * growing from 10⁻³ (Manteuffel, Math. Comp. 34, 1980).
 */
export function incompleteCholesky(A: Csr): Factor {
  const { n } = A;
  const rowPtr = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) {
    let c = 0;
    for (let k = A.rowPtr[i]!; k < A.rowPtr[i + 1]!; k++) if (A.col[k]! <= i) c++;
    rowPtr[i + 1] = rowPtr[i]! + c;
  }
  const col = new Int32Array(rowPtr[n]!);
  const diagA = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let p = rowPtr[i]!;
    for (let k = A.rowPtr[i]!; k < A.rowPtr[i + 1]!; k++) {
      const j = A.col[k]!;
      if (j <= i) col[p++] = j;
      if (j === i) diagA[i] = A.val[k]!;
    }
    if (col[rowPtr[i + 1]! - 1] !== i) throw new TorsionError('SOLVER_FAILED', `row ${i} has no diagonal entry`);
  }
  const val = new Float64Array(col.length);
  const where = new Int32Array(n).fill(-1);
  for (let alpha = 0; alpha < 1; alpha = alpha === 0 ? 1e-3 : alpha * 4) {
    let ok = true;
    for (let i = 0; i < n && ok; i++) {
      let p = rowPtr[i]!;
      for (let k = A.rowPtr[i]!; k < A.rowPtr[i + 1]!; k++) {
        const j = A.col[k]!;
        if (j < i) val[p++] = A.val[k]!;
        else if (j === i) val[p++] = A.val[k]! * (1 + alpha);
      }
      const r0 = rowPtr[i]!;
      const r1 = rowPtr[i + 1]!;
      for (let q = r0; q < r1; q++) where[col[q]!] = q;
      for (let q = r0; q < r1 - 1; q++) {
        const k = col[q]!;
        // l_ik = (a_ik − Σ_{j<k} l_ij l_kj) / l_kk over the common pattern.
        let s = val[q]!;
        const k1 = rowPtr[k + 1]! - 1;
        for (let t = rowPtr[k]!; t < k1; t++) {
          const w = where[col[t]!]!;
          if (w >= r0 && w < q) s -= val[w]! * val[t]!;
        }
        val[q] = s / val[k1]!;
      }
      let d = val[r1 - 1]!;
      for (let q = r0; q < r1 - 1; q++) d -= val[q]! * val[q]!;
      for (let q = r0; q < r1; q++) where[col[q]!] = -1;
      if (!(d > 1e-12 * diagA[i]!)) ok = false;
      else val[r1 - 1] = Math.sqrt(d);
    }
    if (ok) return { n, rowPtr, col, val, shift: alpha };
  }
  throw new TorsionError('SOLVER_FAILED', 'incomplete Cholesky factorisation failed: the matrix is not positive definite');
}

/** z = (L·Lᵀ)⁻¹ r. */
export function applyFactor(L: Factor, r: Float64Array, z: Float64Array): void {
  const { n, rowPtr, col, val } = L;
  for (let i = 0; i < n; i++) {
    let s = r[i]!;
    const end = rowPtr[i + 1]! - 1;
    for (let k = rowPtr[i]!; k < end; k++) s -= val[k]! * z[col[k]!]!;
    z[i] = s / val[end]!;
  }
  for (let i = n - 1; i >= 0; i--) {
    const end = rowPtr[i + 1]! - 1;
    const zi = z[i]! / val[end]!;
    z[i] = zi;
    for (let k = rowPtr[i]!; k < end; k++) z[col[k]!]! -= val[k]! * zi;
  }
}

export interface SolveReport {
  readonly iterations: number;
  /** Final ‖r‖ / ‖b‖. */
  readonly residual: number;
}

/** A preconditioner: z ≈ A⁻¹ r. */
export type Preconditioner = (r: Float64Array, z: Float64Array) => void;

/**
 * Preconditioned conjugate gradients (Hestenes & Stiefel 1952; Saad, "Iterative Methods for
 * Sparse Linear Systems", 2nd ed., Alg. 9.1) for A·x = b with A symmetric positive definite;
 * x holds the starting guess and receives the solution. Stops when ‖r‖ ≤ tol·‖b‖.
 */
export function conjugateGradient(
  A: Csr,
  M: Factor | Preconditioner,
  b: Float64Array,
  x: Float64Array,
  tol: number,
  maxIter = 5000,
): SolveReport {
  const precondition: Preconditioner = typeof M === 'function' ? M : (r, z) => applyFactor(M, r, z);
  const n = A.n;
  const r = new Float64Array(n);
  const z = new Float64Array(n);
  const p = new Float64Array(n);
  const q = new Float64Array(n);
  multiply(A, x, q);
  let bb = 0;
  let rr = 0;
  for (let i = 0; i < n; i++) {
    r[i] = b[i]! - q[i]!;
    bb += b[i]! * b[i]!;
    rr += r[i]! * r[i]!;
  }
  const stop = tol * tol * bb;
  if (bb === 0) {
    x.fill(0);
    return { iterations: 0, residual: 0 };
  }
  precondition(r, z);
  p.set(z);
  let rz = 0;
  for (let i = 0; i < n; i++) rz += r[i]! * z[i]!;
  let it = 0;
  while (rr > stop && it < maxIter) {
    multiply(A, p, q);
    let pq = 0;
    for (let i = 0; i < n; i++) pq += p[i]! * q[i]!;
    const alpha = rz / pq;
    rr = 0;
    for (let i = 0; i < n; i++) {
      x[i]! += alpha * p[i]!;
      const ri = r[i]! - alpha * q[i]!;
      r[i] = ri;
      rr += ri * ri;
    }
    it++;
    // Converged: the next direction would not be used, so its preconditioning (a whole V-cycle) is skipped.
    if (rr <= stop) break;
    precondition(r, z);
    let rz1 = 0;
    for (let i = 0; i < n; i++) rz1 += r[i]! * z[i]!;
    const beta = rz1 / rz;
    rz = rz1;
    for (let i = 0; i < n; i++) p[i] = z[i]! + beta * p[i]!;
  }
  if (!(rr <= stop)) throw new TorsionError('SOLVER_FAILED', `conjugate gradients did not converge in ${maxIter} iterations`);
  return { iterations: it, residual: Math.sqrt(rr / bb) };
}
