/**
 * Neumaier's compensated summation: keeps the rounding error of a long sum of terms of mixed
 * sign (Green's-theorem contributions cancel heavily) near one unit in the last place.
 */
export class CompensatedSum {
  private s = 0;
  private c = 0;

  add(v: number): void {
    const t = this.s + v;
    this.c += Math.abs(this.s) >= Math.abs(v) ? this.s - t + v : v - t + this.s;
    this.s = t;
  }

  get value(): number {
    return this.s + this.c;
  }
}
