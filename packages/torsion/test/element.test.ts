import { describe, expect, it } from 'vitest';
import { ElementAt, FIRST, LOAD, MASS, RULE6, STIFF } from '../src/element';
import { assembleRows, entry } from '../src/sparse';

// The closed forms of the straight six-node triangle against the six-point rule, which is exact
// for these polynomial degrees (Dunavant 1985), on a few arbitrary triangles.
const triangles = [
  [0, 0, 1, 0, 0, 1],
  [0.3, -0.2, 2.1, 0.4, 0.9, 1.7],
  [-5, 3, -4.2, 3.05, -4.9, 3.4],
];

function nodes(t: number[]): { x: Float64Array; y: Float64Array } {
  const [x0, y0, x1, y1, x2, y2] = t as [number, number, number, number, number, number];
  return {
    x: Float64Array.from([x0, x1, x2, (x0 + x1) / 2, (x1 + x2) / 2, (x2 + x0) / 2]),
    y: Float64Array.from([y0, y1, y2, (y0 + y1) / 2, (y1 + y2) / 2, (y2 + y0) / 2]),
  };
}

describe('straight six-node triangle in closed form', () => {
  for (const t of triangles)
    it(`stiffness, load and moments equal quadrature on (${t.join(', ')})`, () => {
      const { x, y } = nodes(t);
      const E = new ElementAt();
      expect(E.evaluate(x, y, RULE6)).toBe(true);
      const b = [y[1]! - y[2]!, y[2]! - y[0]!, y[0]! - y[1]!];
      const c = [x[2]! - x[1]!, x[0]! - x[2]!, x[1]! - x[0]!];
      const d = b[0]! * c[1]! - b[1]! * c[0]!;
      const g = [0, 1, 2].map((p) => (b[p]! * b[(p + 1) % 3]! + c[p]! * c[(p + 1) % 3]!) / (2 * d));
      const area = d / 2;
      const u = Float64Array.from([0.7, -1.2, 0.4, 2.2, -0.3, 1.1]);
      let scale = 0;
      for (let i = 0; i < 6; i++)
        for (let j = 0; j < 6; j++) {
          let k = 0;
          for (let q = 0; q < 6; q++) k += E.wd[q]! * (E.gx[6 * q + i]! * E.gx[6 * q + j]! + E.gy[6 * q + i]! * E.gy[6 * q + j]!);
          const closed = g[0]! * STIFF[0]![6 * i + j]! + g[1]! * STIFF[1]![6 * i + j]! + g[2]! * STIFF[2]![6 * i + j]!;
          scale = Math.max(scale, Math.abs(k));
          expect(Math.abs(closed - k)).toBeLessThanOrEqual(1e-13 * scale + 1e-15);
        }
      for (let i = 0; i < 6; i++) {
        // f_i = ∫(y·∂Ni/∂x − x·∂Ni/∂y) dA
        let f = 0;
        let fx = 0;
        let m = 0;
        for (let q = 0; q < 6; q++) {
          f += E.wd[q]! * (E.gx[6 * q + i]! * E.py[q]! - E.gy[6 * q + i]! * E.px[q]!);
          fx += E.wd[q]! * RULE6.N[6 * q + i]! * E.px[q]!;
          let v = 0;
          for (let j = 0; j < 6; j++) v += RULE6.N[6 * q + j]! * u[j]!;
          m += E.wd[q]! * RULE6.N[6 * q + i]! * v;
        }
        let closed = 0;
        for (let a = 0; a < 3; a++) for (let k = 0; k < 3; k++) closed += ((b[a]! * y[k]! - c[a]! * x[k]!) * LOAD[9 * i + 3 * a + k]!) / 2;
        expect(closed).toBeCloseTo(f, 12);
        expect(area * (FIRST[3 * i]! * x[0]! + FIRST[3 * i + 1]! * x[1]! + FIRST[3 * i + 2]! * x[2]!)).toBeCloseTo(fx, 12);
        let mm = 0;
        for (let j = 0; j < 6; j++) mm += MASS[6 * i + j]! * u[j]!;
        expect(area * mm).toBeCloseTo(m, 12);
      }
    });
});

describe('row-wise assembly', () => {
  it('sums element matrices into sorted rows: two 3-node elements sharing an edge, one in cotangent form, one with its own matrix', () => {
    const el = Uint32Array.from([0, 1, 2, 2, 1, 3]);
    const S = [0, 1, 2].map((p) => Float64Array.from({ length: 9 }, (_, k) => (k % 4 === 0 ? 2 : 1) * (p + 1) + k)) as [
      Float64Array,
      Float64Array,
      Float64Array,
    ];
    const g = Float64Array.from([0.5, -1.5, 2, 0, 0, 0]);
    const own = Int32Array.from([-1, 0]);
    const ke = Float64Array.from({ length: 9 }, (_, k) => 10 + k * k);
    const K = assembleRows(el, 3, 4, S, g, own, ke);
    const dense = Array.from({ length: 4 }, () => new Array<number>(4).fill(0));
    for (let i = 0; i < 3; i++)
      for (let j = 0; j < 3; j++) {
        dense[el[i]!]![el[j]!]! += g[0]! * S[0][3 * i + j]! + g[1]! * S[1][3 * i + j]! + g[2]! * S[2][3 * i + j]!;
        dense[el[3 + i]!]![el[3 + j]!]! += ke[3 * i + j]!;
      }
    for (let i = 0; i < 4; i++) {
      for (let k = K.rowPtr[i]! + 1; k < K.rowPtr[i + 1]!; k++) expect(K.col[k]!).toBeGreaterThan(K.col[k - 1]!);
      for (let j = 0; j < 4; j++) {
        const p = entry(K, i, j);
        expect(p >= 0 ? K.val[p]! : 0).toBeCloseTo(dense[i]![j]!, 12);
      }
    }
    // Nodes 0 and 3 share no element: outside the pattern.
    expect(entry(K, 0, 3)).toBe(-1);
    expect(entry(K, 3, 0)).toBe(-1);
  });
});
