import { describe, expect, it } from 'vitest';
import {
  applyFactor,
  conjugateGradient,
  entry,
  incompleteCholesky,
  multiply,
  patternOf,
  permute,
  reverseCuthillMcKee,
  type Csr,
} from '../src';

/** Five-point Laplacian on an m×m grid with Dirichlet rows folded in (SPD), natural order. */
function laplacian(m: number, shuffle = false): Csr {
  const n = m * m;
  const id = Array.from({ length: n }, (_, i) => i);
  if (shuffle) {
    // Deterministic scramble (LCG): a bad order for RCM to repair.
    let s = 12345;
    for (let i = n - 1; i > 0; i--) {
      s = (s * 1103515245 + 12345) % 2147483648;
      const j = s % (i + 1);
      [id[i], id[j]] = [id[j]!, id[i]!];
    }
  }
  const el: number[] = [];
  for (let j = 0; j < m; j++)
    for (let i = 0; i < m; i++) {
      if (i + 1 < m) el.push(id[j * m + i]!, id[j * m + i + 1]!);
      if (j + 1 < m) el.push(id[j * m + i]!, id[(j + 1) * m + i]!);
    }
  const A = patternOf(el, 2, n);
  for (let k = 0; k < el.length; k += 2) {
    const a = el[k]!;
    const b = el[k + 1]!;
    A.val[entry(A, a, b)] = -1;
    A.val[entry(A, b, a)] = -1;
  }
  for (let i = 0; i < n; i++) A.val[entry(A, i, i)] = 4;
  return A;
}

function dense(A: Csr): number[][] {
  const D = Array.from({ length: A.n }, () => new Array<number>(A.n).fill(0));
  for (let i = 0; i < A.n; i++) for (let k = A.rowPtr[i]!; k < A.rowPtr[i + 1]!; k++) D[i]![A.col[k]!] = A.val[k]!;
  return D;
}

function bandwidth(A: Csr): number {
  let b = 0;
  for (let i = 0; i < A.n; i++) for (let k = A.rowPtr[i]!; k < A.rowPtr[i + 1]!; k++) b = Math.max(b, Math.abs(i - A.col[k]!));
  return b;
}

describe('sparse symmetric solver', () => {
  it('pattern is symmetric, sorted and holds the diagonal', () => {
    const A = laplacian(7, true);
    const D = dense(A);
    for (let i = 0; i < A.n; i++) {
      for (let k = A.rowPtr[i]! + 1; k < A.rowPtr[i + 1]!; k++) expect(A.col[k]!).toBeGreaterThan(A.col[k - 1]!);
      expect(entry(A, i, i)).toBeGreaterThanOrEqual(0);
      for (let j = 0; j < A.n; j++) if (D[i]![j] !== D[j]![i]) expect.unreachable(`asymmetric at ${i}, ${j}`);
    }
  });

  it('reverse Cuthill–McKee is a permutation that shrinks the bandwidth of a scrambled grid', () => {
    const A = laplacian(20, true);
    const { perm, components } = reverseCuthillMcKee(A);
    expect(components).toBe(1);
    expect([...perm].sort((a, b) => a - b)).toEqual(Array.from({ length: A.n }, (_, i) => i));
    const B = permute(A, perm);
    // A 20×20 grid in level order has bandwidth about 20; scrambled it is near n.
    expect(bandwidth(A)).toBeGreaterThan(300);
    expect(bandwidth(B)).toBeLessThanOrEqual(25);
    // P·A·Pᵀ keeps every entry.
    const DA = dense(A);
    const DB = dense(B);
    let mismatches = 0;
    for (let i = 0; i < A.n; i++) for (let j = 0; j < A.n; j++) if (DB[i]![j] !== DA[perm[i]!]![perm[j]!]) mismatches++;
    expect(mismatches).toBe(0);
  });

  it('finds the connected components', () => {
    // Two separate chains 0–1–2 and 3–4.
    const A = patternOf([0, 1, 1, 2, 3, 4], 2, 5);
    const { component, components } = reverseCuthillMcKee(A);
    expect(components).toBe(2);
    expect(component[0]).toBe(component[2]);
    expect(component[3]).toBe(component[4]);
    expect(component[0]).not.toBe(component[3]);
  });

  it('IC(0) of a tridiagonal matrix is its exact Cholesky factor: CG converges in one step', () => {
    const n = 50;
    const el: number[] = [];
    for (let i = 0; i + 1 < n; i++) el.push(i, i + 1);
    const A = patternOf(el, 2, n);
    for (let i = 0; i < n; i++) {
      A.val[entry(A, i, i)] = 2 + i / n;
      if (i + 1 < n) A.val[entry(A, i, i + 1)] = A.val[entry(A, i + 1, i)] = -1;
    }
    const M = incompleteCholesky(A);
    expect(M.shift).toBe(0);
    const b = Float64Array.from({ length: n }, (_, i) => Math.sin(i));
    const x = new Float64Array(n);
    const rep = conjugateGradient(A, M, b, x, 1e-12);
    expect(rep.iterations).toBeLessThanOrEqual(1);
    const r = new Float64Array(n);
    multiply(A, x, r);
    for (let i = 0; i < n; i++) expect(r[i]).toBeCloseTo(b[i]!, 12);
  });

  it('preconditioned CG solves a 2D Laplacian to the asked residual, in fewer steps than unpreconditioned theory', () => {
    const A = permute(laplacian(40, true), reverseCuthillMcKee(laplacian(40, true)).perm);
    const n = A.n;
    const xTrue = Float64Array.from({ length: n }, (_, i) => Math.cos(0.37 * i));
    const b = new Float64Array(n);
    multiply(A, xTrue, b);
    const M = incompleteCholesky(A);
    const x = new Float64Array(n);
    const rep = conjugateGradient(A, M, b, x, 1e-10);
    expect(rep.residual).toBeLessThanOrEqual(1e-10);
    for (let i = 0; i < n; i++) expect(Math.abs(x[i]! - xTrue[i]!)).toBeLessThan(1e-8);
    // Plain CG needs O(m) ≈ 100+ steps on a 40×40 grid for 1e-10; IC(0) about a third of that.
    expect(rep.iterations).toBeLessThan(60);
  });

  it('the preconditioner is symmetric: ⟨M⁻¹u, v⟩ = ⟨u, M⁻¹v⟩', () => {
    const A = laplacian(12);
    const M = incompleteCholesky(A);
    const u = Float64Array.from({ length: A.n }, (_, i) => Math.sin(1 + i));
    const v = Float64Array.from({ length: A.n }, (_, i) => Math.cos(2 * i));
    const Mu = new Float64Array(A.n);
    const Mv = new Float64Array(A.n);
    applyFactor(M, u, Mu);
    applyFactor(M, v, Mv);
    let a = 0;
    let b = 0;
    for (let i = 0; i < A.n; i++) {
      a += Mu[i]! * v[i]!;
      b += u[i]! * Mv[i]!;
    }
    expect(Math.abs(a - b)).toBeLessThan(1e-12 * Math.abs(a));
  });
});
