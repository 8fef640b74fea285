import { expect } from 'vitest';

/** |actual − expected| ≤ tol·max(|expected|, scale): relative error, or absolute against a natural size. */
export function expectClose(actual: number, expected: number, tol = 1e-9, scale = 0): void {
  const bound = tol * Math.max(Math.abs(expected), scale);
  if (!(Math.abs(actual - expected) <= bound))
    expect.fail(`expected ${actual} to be within ${bound} of ${expected} (rel ${(actual - expected) / expected})`);
}
