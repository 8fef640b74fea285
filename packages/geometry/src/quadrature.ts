/** Gauss–Legendre nodes and weights on [−1, 1] by Newton's method on Pₙ (Golub & Welsch give the same). */
function gaussLegendre(n: number): { x: Float64Array; w: Float64Array } {
  const x = new Float64Array(n);
  const w = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let z = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let dp = 0;
    for (let it = 0; it < 100; it++) {
      let p0 = 1;
      let p1 = z;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * z * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      dp = (n * (z * p1 - p0)) / (z * z - 1);
      const dz = p1 / dp;
      z -= dz;
      if (Math.abs(dz) < 1e-16) break;
    }
    x[i] = z;
    w[i] = 2 / ((1 - z * z) * dp * dp);
  }
  return { x, w };
}

/** 16 points integrate polynomials of degree ≤ 31 exactly. */
export const GL16 = gaussLegendre(16);

/** ∫ f over [a, b] with a fixed Gauss–Legendre rule; f may return several integrands at once. */
export function integrate(f: (t: number, out: Float64Array) => void, a: number, b: number, dims: number): Float64Array {
  const sum = new Float64Array(dims);
  const tmp = new Float64Array(dims);
  const h = (b - a) / 2;
  const m = (a + b) / 2;
  for (let i = 0; i < GL16.x.length; i++) {
    f(m + h * GL16.x[i]!, tmp);
    for (let k = 0; k < dims; k++) sum[k]! += GL16.w[i]! * tmp[k]!;
  }
  for (let k = 0; k < dims; k++) sum[k]! *= h;
  return sum;
}

/**
 * Adaptive Gauss–Legendre: halves [a, b] until a piece agrees with its two halves to `rel` of
 * max(|value|, floor[k]) — the floor being the integrand's natural size, so that a component whose
 * exact value is zero does not drive the subdivision. Used where the integrand is smooth but not
 * polynomial (rational splines, elliptic arc length).
 */
export function integrateAdaptive(
  f: (t: number, out: Float64Array) => void,
  a: number,
  b: number,
  dims: number,
  floor: ArrayLike<number>,
  rel = 1e-14,
  depth = 0,
  whole?: Float64Array,
): Float64Array {
  const coarse = whole ?? integrate(f, a, b, dims);
  const m = (a + b) / 2;
  const left = integrate(f, a, m, dims);
  const right = integrate(f, m, b, dims);
  let ok = true;
  for (let k = 0; k < dims; k++) {
    const fine = left[k]! + right[k]!;
    if (Math.abs(fine - coarse[k]!) > rel * Math.max(Math.abs(fine), floor[k]!)) ok = false;
  }
  if (ok || depth >= 16) {
    for (let k = 0; k < dims; k++) left[k]! += right[k]!;
    return left;
  }
  const l = integrateAdaptive(f, a, m, dims, floor, rel, depth + 1, left);
  const r = integrateAdaptive(f, m, b, dims, floor, rel, depth + 1, right);
  for (let k = 0; k < dims; k++) l[k]! += r[k]!;
  return l;
}
