/**
 * Six-node triangle on the reference triangle (ξ, η) with barycentrics λ0 = 1 − ξ − η, λ1 = ξ,
 * λ2 = η: corner functions λi(2λi − 1), edge functions 4λiλj (edges 0–1, 1–2, 2–0), and their
 * derivatives at the points of two symmetric rules (Dunavant, "High degree efficient symmetrical
 * Gaussian quadrature rules for the triangle", IJNME 21, 1985): 3 points exact to degree 2 (the
 * stiffness and load of a straight-sided element), 6 points exact to degree 4 (curved elements,
 * ∫ω², ∫ω·x). Weights include the reference area ½.
 */
export interface Rule {
  readonly points: number;
  readonly w: Float64Array;
  /** Barycentric coordinates of the points, three per point. */
  readonly lam: Float64Array;
  /** Shape values N[6q + k], derivatives dξ[6q + k], dη[6q + k]. */
  readonly N: Float64Array;
  readonly dxi: Float64Array;
  readonly deta: Float64Array;
}

function makeRule(pts: readonly [number, number, number][]): Rule {
  const n = pts.length;
  const w = new Float64Array(n);
  const lam = new Float64Array(3 * n);
  const N = new Float64Array(6 * n);
  const dxi = new Float64Array(6 * n);
  const deta = new Float64Array(6 * n);
  pts.forEach(([xi, eta, weight], q) => {
    const l0 = 1 - xi - eta;
    const l1 = xi;
    const l2 = eta;
    w[q] = weight / 2;
    lam.set([l0, l1, l2], 3 * q);
    N.set([l0 * (2 * l0 - 1), l1 * (2 * l1 - 1), l2 * (2 * l2 - 1), 4 * l0 * l1, 4 * l1 * l2, 4 * l2 * l0], 6 * q);
    dxi.set([-(4 * l0 - 1), 4 * l1 - 1, 0, 4 * (l0 - l1), 4 * l2, -4 * l2], 6 * q);
    deta.set([-(4 * l0 - 1), 0, 4 * l2 - 1, -4 * l1, 4 * l1, 4 * (l0 - l2)], 6 * q);
  });
  return { points: n, w, lam, N, dxi, deta };
}

const orbit = (a: number, w: number): [number, number, number][] => [
  [a, a, w],
  [1 - 2 * a, a, w],
  [a, 1 - 2 * a, w],
];

export const RULE3 = makeRule(orbit(1 / 6, 1 / 3));
export const RULE6 = makeRule([
  ...orbit(0.445948490915965, 0.223381589678011),
  ...orbit(0.091576213509771, 0.109951743655322),
]);

/**
 * Geometry of one element at the points of a rule: weight × |J| (wd), position (px, py) and the
 * shape-function gradients (gx[6q + k], gy[6q + k]) in the element's frame.
 */
export class ElementAt {
  readonly wd = new Float64Array(6);
  readonly px = new Float64Array(6);
  readonly py = new Float64Array(6);
  readonly gx = new Float64Array(36);
  readonly gy = new Float64Array(36);
  rule: Rule = RULE3;

  /** Evaluates the element with node coordinates xs, ys (6 each); returns false if it is inverted. */
  evaluate(xs: Float64Array, ys: Float64Array, rule: Rule): boolean {
    this.rule = rule;
    const { N, dxi, deta, w } = rule;
    for (let q = 0; q < rule.points; q++) {
      let j11 = 0;
      let j12 = 0;
      let j21 = 0;
      let j22 = 0;
      let x = 0;
      let y = 0;
      for (let k = 0; k < 6; k++) {
        const a = dxi[6 * q + k]!;
        const b = deta[6 * q + k]!;
        j11 += xs[k]! * a;
        j12 += xs[k]! * b;
        j21 += ys[k]! * a;
        j22 += ys[k]! * b;
        x += xs[k]! * N[6 * q + k]!;
        y += ys[k]! * N[6 * q + k]!;
      }
      const det = j11 * j22 - j12 * j21;
      if (!(det > 0)) return false;
      this.wd[q] = w[q]! * det;
      this.px[q] = x;
      this.py[q] = y;
      for (let k = 0; k < 6; k++) {
        const a = dxi[6 * q + k]!;
        const b = deta[6 * q + k]!;
        this.gx[6 * q + k] = (j22 * a - j21 * b) / det;
        this.gy[6 * q + k] = (-j12 * a + j11 * b) / det;
      }
    }
    return true;
  }

  /**
   * The same for a straight-sided element (edge nodes at the midpoints): the Jacobian is constant,
   * taken from the corners once.
   */
  evaluateStraight(xs: Float64Array, ys: Float64Array, rule: Rule): boolean {
    this.rule = rule;
    const { N, dxi, deta, w } = rule;
    const x0 = xs[0]!;
    const y0 = ys[0]!;
    const j11 = xs[1]! - x0;
    const j12 = xs[2]! - x0;
    const j21 = ys[1]! - y0;
    const j22 = ys[2]! - y0;
    const det = j11 * j22 - j12 * j21;
    if (!(det > 0)) return false;
    for (let q = 0; q < rule.points; q++) {
      // Reference position from the linear shape functions: ξ = N-weighted corner 1, η corner 2.
      const o = 6 * q;
      const xi = N[o + 1]! + 0.5 * (N[o + 3]! + N[o + 4]!);
      const eta = N[o + 2]! + 0.5 * (N[o + 4]! + N[o + 5]!);
      this.wd[q] = w[q]! * det;
      this.px[q] = x0 + j11 * xi + j12 * eta;
      this.py[q] = y0 + j21 * xi + j22 * eta;
      for (let k = 0; k < 6; k++) {
        const a = dxi[o + k]!;
        const b = deta[o + k]!;
        this.gx[o + k] = (j22 * a - j21 * b) / det;
        this.gy[o + k] = (-j12 * a + j11 * b) / det;
      }
    }
    return true;
  }

  /** Value at point q of the field with nodal values u (6). */
  value(u: Float64Array, q: number): number {
    const N = this.rule.N;
    let s = 0;
    for (let k = 0; k < 6; k++) s += N[6 * q + k]! * u[k]!;
    return s;
  }
}

/** ∂N_i/∂λ_a at barycentrics l (the six functions as polynomials in three independent λ). */
function dNdLambda(i: number, a: number, l: ArrayLike<number>): number {
  if (i < 3) return a === i ? 4 * l[i]! - 1 : 0;
  const k = i - 3;
  const k1 = (k + 1) % 3;
  return a === k ? 4 * l[k1]! : a === k1 ? 4 * l[k]! : 0;
}

/** (1/A)∫ f dA over a straight triangle, f given at the points of a rule exact for it. */
function mean(rule: Rule, f: (l: Float64Array, q: number) => number): number {
  let s = 0;
  for (let q = 0; q < rule.points; q++) s += 2 * rule.w[q]! * f(rule.lam.subarray(3 * q, 3 * q + 3), q);
  return s;
}

/**
 * Closed forms of the straight-sided six-node triangle (edge nodes at the midpoints, constant
 * Jacobian), per unit area, computed once from the rules above (exact for these polynomial
 * degrees). With ∇λa = (ba, ca)/2A, ba = y(a+1) − y(a+2), ca = x(a+2) − x(a+1), and Σa ∇λa = 0,
 *   K = Σ_{pairs p = (a, a+1)} g_p·STIFF[p],  g_p = A·∇λa·∇λ(a+1) = (ba·b(a+1) + ca·c(a+1))/4A
 * (the cotangent form of the Laplacian: g_p = −½·cot of the angle opposite edge p), with
 * STIFF[p] = Q^{ab} + Q^{ba} − Q^{aa} − Q^{bb}, Q^{ab}_ij = (1/A)∫ ∂Ni/∂λa·∂Nj/∂λb dA. Load and
 * moments: LOAD[i][a][c] = (1/A)∫ ∂Ni/∂λa·λc dA; FIRST[i][c] = (1/A)∫ Ni·λc dA;
 * MASS[i][j] = (1/A)∫ Ni·Nj dA. Evaluating these costs a few dozen operations per element, where
 * quadrature costs several hundred.
 */
export const STIFF = [0, 1, 2].map((p) => {
  const a = p;
  const b = (p + 1) % 3;
  const S = new Float64Array(36);
  for (let i = 0; i < 6; i++)
    for (let j = 0; j < 6; j++) {
      const Q = (u: number, v: number) => mean(RULE3, (l) => dNdLambda(i, u, l) * dNdLambda(j, v, l));
      // The exact entries are thirds: rounding to them clears the quadrature's 1e-16 residue
      // where the entry is zero, so the assembly can leave those pairs out of the pattern.
      S[6 * i + j] = Math.round(3 * (Q(a, b) + Q(b, a) - Q(a, a) - Q(b, b))) / 3;
    }
  return S;
}) as [Float64Array, Float64Array, Float64Array];

export const LOAD = new Float64Array(54);
export const FIRST = new Float64Array(18);
export const MASS = new Float64Array(36);
for (let i = 0; i < 6; i++) {
  for (let c = 0; c < 3; c++) {
    FIRST[3 * i + c] = mean(RULE6, (l, q) => RULE6.N[6 * q + i]! * l[c]!);
    for (let a = 0; a < 3; a++) LOAD[9 * i + 3 * a + c] = mean(RULE3, (l) => dNdLambda(i, a, l) * l[c]!);
  }
  for (let j = 0; j < 6; j++) MASS[6 * i + j] = mean(RULE6, (_, q) => RULE6.N[6 * q + i]! * RULE6.N[6 * q + j]!);
}
