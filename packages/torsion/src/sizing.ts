/**
 * Element size field h(x, y) on a uniform grid over the normalised frame [−½, ½]²: the smallest of
 * the sizes asked for by sources (boundary pieces, re-entrant corners) grown by `grading` per unit
 * distance, h(p) = min(hmax, minₛ hₛ + g·|p − s|). Such a Lipschitz field keeps neighbouring
 * elements within a bounded size ratio (Persson, "Mesh size functions for implicit geometries and
 * PDE-based gradient limiting", Eng. Comput. 22, 2006). Computed by a two-pass chamfer sweep
 * (8 neighbours), within about 8 % of the Euclidean continuation.
 */
export class SizeField {
  readonly n: number;
  readonly cell: number;
  readonly v: Float64Array;

  constructor(
    readonly hmax: number,
    readonly grading: number,
    n: number,
  ) {
    this.n = n;
    this.cell = 1.02 / n;
    this.v = new Float64Array(n * n).fill(hmax);
  }

  private index(x: number, y: number): number {
    const n = this.n;
    let i = Math.floor((x + 0.51) / this.cell);
    let j = Math.floor((y + 0.51) / this.cell);
    if (i < 0) i = 0;
    else if (i >= n) i = n - 1;
    if (j < 0) j = 0;
    else if (j >= n) j = n - 1;
    return j * n + i;
  }

  /** Asks for elements no larger than h at (x, y). Call `spread` once all sources are in. */
  source(x: number, y: number, h: number): void {
    const k = this.index(x, y);
    if (h < this.v[k]!) this.v[k] = h;
  }

  spread(): void {
    const { n, v } = this;
    const d1 = this.grading * this.cell;
    const d2 = d1 * Math.SQRT2;
    for (let j = 0; j < n; j++)
      for (let i = 0; i < n; i++) {
        const k = j * n + i;
        let m = v[k]!;
        if (i > 0) m = Math.min(m, v[k - 1]! + d1);
        if (j > 0) {
          m = Math.min(m, v[k - n]! + d1);
          if (i > 0) m = Math.min(m, v[k - n - 1]! + d2);
          if (i + 1 < n) m = Math.min(m, v[k - n + 1]! + d2);
        }
        v[k] = m;
      }
    for (let j = n - 1; j >= 0; j--)
      for (let i = n - 1; i >= 0; i--) {
        const k = j * n + i;
        let m = v[k]!;
        if (i + 1 < n) m = Math.min(m, v[k + 1]! + d1);
        if (j + 1 < n) {
          m = Math.min(m, v[k + n]! + d1);
          if (i + 1 < n) m = Math.min(m, v[k + n + 1]! + d2);
          if (i > 0) m = Math.min(m, v[k + n - 1]! + d2);
        }
        v[k] = m;
      }
  }

  at(x: number, y: number): number {
    return this.v[this.index(x, y)]!;
  }
}
