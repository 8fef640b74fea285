import { describe, expect, it } from 'vitest';
import { circle, rectangle } from '@keelson/shapes';
import {
  EnvelopeCholesky,
  Multigrid,
  assemble,
  baseMesh,
  conjugateGradient,
  entry,
  linearStiffness,
  linearTransfer,
  multiply,
  patternOf,
  quadratic,
  quadraticTransfer,
  refine,
  solveWarping,
  type Level,
} from '../src';

describe('envelope Cholesky (coarsest level)', () => {
  it('solves a scrambled 2D Laplacian exactly (to rounding)', () => {
    const m = 15;
    const n = m * m;
    const id = Array.from({ length: n }, (_, i) => (i * 97) % n); // 97 is prime to 225: a permutation
    const el: number[] = [];
    for (let j = 0; j < m; j++)
      for (let i = 0; i < m; i++) {
        if (i + 1 < m) el.push(id[j * m + i]!, id[j * m + i + 1]!);
        if (j + 1 < m) el.push(id[j * m + i]!, id[(j + 1) * m + i]!);
      }
    const A = patternOf(el, 2, n);
    for (let k = 0; k < el.length; k += 2) A.val[entry(A, el[k]!, el[k + 1]!)] = A.val[entry(A, el[k + 1]!, el[k]!)] = -1;
    for (let i = 0; i < n; i++) A.val[entry(A, i, i)] = 4.5;
    const xTrue = Float64Array.from({ length: n }, (_, i) => Math.sin(i) + 0.1 * i);
    const b = new Float64Array(n);
    multiply(A, xTrue, b);
    const x = new Float64Array(n);
    new EnvelopeCholesky(A).solve(b, x);
    for (let i = 0; i < n; i++) expect(Math.abs(x[i]! - xTrue[i]!)).toBeLessThan(1e-12);
  });
});

describe('multigrid-preconditioned CG on the warping problem', () => {
  /** Iterations to 1e-9 on each of three levels, and the same solve by IC(0)-CG for comparison. */
  function iterations(region: Parameters<typeof baseMesh>[0]): { mg: number[]; ic: number[]; agree: number } {
    const { mesh } = baseMesh(region);
    const levels: Level[] = [quadratic(mesh)];
    const asm0 = assemble(levels[0]!.quad);
    const nv = levels[0]!.quad.corners;
    const held = asm0.held.slice(0, nv);
    const mg = new Multigrid(new EnvelopeCholesky(linearStiffness(levels[0]!, held)), held, nv);
    mg.push(asm0.K, asm0.held, linearTransfer(levels[0]!));
    const out = { mg: [] as number[], ic: [] as number[], agree: 0 };
    let asm = asm0;
    for (let l = 0; l < 3; l++) {
      if (l > 0) {
        const fine = quadratic(refine(levels[l - 1]!));
        asm = assemble(fine.quad);
        mg.push(asm.K, asm.held, quadraticTransfer(levels[l - 1]!, fine));
        levels.push(fine);
      }
      const u = new Float64Array(asm.K.n);
      out.mg.push(conjugateGradient(asm.K, (r, z) => mg.apply(r, z), asm.f, u, 1e-9).iterations);
      const ref = solveWarping(levels[l]!.quad, null, 1e-11);
      out.ic.push(ref.iterations);
      // Same field up to the per-piece constant.
      let d = 0;
      let s = 0;
      const mean = u.reduce((a, v) => a + v, 0) / u.length;
      const meanRef = ref.omega.reduce((a, v) => a + v, 0) / u.length;
      for (let i = 0; i < u.length; i++) {
        d = Math.max(d, Math.abs(u[i]! - mean - (ref.omega[i]! - meanRef)));
        s = Math.max(s, Math.abs(ref.omega[i]!));
      }
      out.agree = Math.max(out.agree, d / s);
    }
    return out;
  }

  it('iteration counts stay flat under refinement (IC(0) roughly doubles), same solution', () => {
    for (const region of [rectangle(10, 1), circle(1)]) {
      // (counts seen on the rectangle: 9, 10, 11 by multigrid; 23, 43, 86 by IC(0))
      const { mg, ic, agree } = iterations(region);
      expect(Math.max(...mg)).toBeLessThanOrEqual(20);
      expect(mg[2]!).toBeLessThanOrEqual(mg[0]! + 5);
      expect(ic[2]!).toBeGreaterThan(2.5 * ic[0]!);
      expect(agree).toBeLessThan(1e-6);
    }
  });
});
