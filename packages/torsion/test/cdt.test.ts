import { describe, expect, it } from 'vitest';
import Delaunator from 'delaunator';
import { Cdt } from '../src/cdt';

/** Deterministic pseudo-random numbers in [0, 1) (a fixed sequence, so failures reproduce). */
function random(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 1103515245 + 12345) & 0x7fffffff;
    return s / 0x80000000;
  };
}

const next3 = (e: number) => (e % 3 === 2 ? e - 2 : e + 1);

/** A fresh triangulation of the first n points, every triangle inside, and the given edges constrained. */
function start(X: number[], Y: number[], n: number, constrained: (a: number, b: number) => boolean = () => false): Cdt {
  const coords = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    coords[2 * i] = X[i]!;
    coords[2 * i + 1] = Y[i]!;
  }
  const d = new Delaunator(coords);
  return new Cdt(d.triangles, d.halfedges, new Uint8Array(d.triangles.length / 3).fill(1), X, Y, constrained);
}

/**
 * Structural and Delaunay checks: twins point back and join the same two vertices the other way,
 * every triangle turns clockwise with positive area, and across every unconstrained edge the far
 * vertex lies outside the circumcircle (the local test, which implies the global one for the
 * constrained Delaunay triangulation: Lee & Lin, "Generalized Delaunay triangulation for planar
 * graphs", DCG 1, 1986). Returns the worst in-circle violation relative to the circle's size.
 */
function check(c: Cdt, X: number[], Y: number[], constrained: (a: number, b: number) => boolean = () => false): number {
  const { tri, half } = c.view();
  let worst = 0;
  for (let e = 0; e < tri.length; e++) {
    const o = half[e]!;
    if (o >= 0) {
      expect(half[o]).toBe(e);
      expect(tri[o]).toBe(tri[next3(e)]);
      expect(tri[next3(o)]).toBe(tri[e]);
    }
    if (e % 3 === 0) {
      const [a, b, d] = [tri[e]!, tri[e + 1]!, tri[e + 2]!];
      const cross = (X[b]! - X[a]!) * (Y[d]! - Y[a]!) - (Y[b]! - Y[a]!) * (X[d]! - X[a]!);
      expect(cross).toBeLessThan(0);
    }
    if (o < 0 || constrained(tri[e]!, tri[next3(e)]!)) continue;
    // Circumcircle of e's triangle against the vertex across e.
    const t = e - (e % 3);
    const [a, b, d] = [tri[t]!, tri[t + 1]!, tri[t + 2]!];
    const q = tri[next3(next3(o))]!;
    const bx = X[b]! - X[a]!;
    const by = Y[b]! - Y[a]!;
    const dx = X[d]! - X[a]!;
    const dy = Y[d]! - Y[a]!;
    const den = 2 * (bx * dy - by * dx);
    const ux = (dy * (bx * bx + by * by) - by * (dx * dx + dy * dy)) / den;
    const uy = (bx * (dx * dx + dy * dy) - dx * (bx * bx + by * by)) / den;
    const r = Math.hypot(ux, uy);
    const dist = Math.hypot(X[q]! - X[a]! - ux, Y[q]! - Y[a]! - uy);
    worst = Math.max(worst, (r - dist) / r);
  }
  return worst;
}

describe('constrained Delaunay triangulation grown point by point', () => {
  it('inserting random points gives a Delaunay triangulation with as many triangles as a fresh one', () => {
    const rnd = random(7);
    // The square's corners first: insertion takes points inside the hull only.
    const X: number[] = [0, 1, 1, 0];
    const Y: number[] = [0, 0, 1, 1];
    for (let i = 0; i < 2000; i++) {
      X.push(rnd());
      Y.push(rnd());
    }
    const c = start(X, Y, 200);
    for (let p = 200; p < X.length; p++) expect(c.insert(p, c.count - 1)).toBe(true);
    expect(check(c, X, Y)).toBeLessThan(1e-9);
    const fresh = new Delaunator(Float64Array.from(X.flatMap((x, i) => [x, Y[i]!])));
    expect(c.count).toBe(fresh.triangles.length / 3);
  });

  it('points of a regular grid (on edges, cocircular) go in without degenerate triangles', () => {
    const X: number[] = [0, 1, 1, 0];
    const Y: number[] = [0, 0, 1, 1];
    const c = start(X, Y, 4);
    for (let j = 1; j < 10; j++)
      for (let i = 1; i < 10; i++) {
        X.push(i / 10);
        Y.push(j / 10);
        expect(c.insert(X.length - 1, 0)).toBe(true);
      }
    expect(check(c, X, Y)).toBeLessThan(1e-9);
    // Euler: 2n − h − 2 triangles for n points with h on the hull.
    expect(c.count).toBe(2 * X.length - 4 - 2);
  });

  it('never flips a constrained edge, and keeps the rest Delaunay', () => {
    // A long thin diamond whose short diagonal 0–2 is constrained; points inserted near it.
    const X: number[] = [0, 1, 2, 1];
    const Y: number[] = [0, -0.05, 0, 0.05];
    const isDiagonal = (a: number, b: number) => (a === 1 && b === 3) || (a === 3 && b === 1);
    const c = start(X, Y, 4, isDiagonal);
    const hasDiagonal = () => {
      const { tri } = c.view();
      for (let e = 0; e < tri.length; e++) if (isDiagonal(tri[e]!, tri[next3(e)]!)) return true;
      return false;
    };
    expect(hasDiagonal()).toBe(true);
    for (const [x, y] of [[0.9, 0.01], [1.1, -0.01], [0.5, 0], [1.5, 0.001]] as const) {
      X.push(x);
      Y.push(y);
      expect(c.insert(X.length - 1, 0)).toBe(true);
    }
    expect(hasDiagonal()).toBe(true);
    expect(check(c, X, Y, isDiagonal)).toBeLessThan(1e-9);
  });

  it('refuses a point on a vertex, on a constrained edge or outside the hull, leaving the mesh as it was', () => {
    // A kite whose short (Delaunay) diagonal 1–3 is constrained.
    const X: number[] = [0, 1, 2, 1];
    const Y: number[] = [0, -0.3, 0, 0.3];
    const c = start(X, Y, 4, (a, b) => a + b === 4 && a !== b);
    const before = c.count;
    X.push(2, 1, 3);
    Y.push(0, 0, 3);
    expect(c.insert(4, 0)).toBe(false); // on vertex 2
    expect(c.insert(5, 0)).toBe(false); // on the constrained diagonal
    expect(c.insert(6, 0)).toBe(false); // outside the hull
    expect(c.count).toBe(before);
  });
});
