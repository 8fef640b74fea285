import { expect } from 'vitest';

/**
 * |actual − expected| ≤ tol·max(|expected|, scale): relative error, or absolute error against the
 * quantity's natural size where the exact value is zero.
 */
export function expectClose(actual: number, expected: number, tol = 1e-9, scale = 0): void {
  const bound = tol * Math.max(Math.abs(expected), scale);
  if (!(Math.abs(actual - expected) <= bound))
    expect.fail(`expected ${actual} to be within ${bound} of ${expected} (rel ${(actual - expected) / expected})`);
}
