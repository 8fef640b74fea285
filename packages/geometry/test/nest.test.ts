import { describe, expect, it } from 'vitest';
import {
  arc,
  line,
  nestLoops,
  pointInLoop,
  regionMoments,
  reverseLoop,
  sectionProperties,
  signedLoopArea,
  type Loop,
  type Point,
} from '../src';
import { expectClose } from './close';

const P = (x: number, y: number): Point => ({ x, y });
const poly = (pts: Point[]): Loop => pts.map((p, i) => line(p, pts[(i + 1) % pts.length]!));
const square = (cx: number, cy: number, a: number): Loop =>
  poly([P(cx - a / 2, cy - a / 2), P(cx + a / 2, cy - a / 2), P(cx + a / 2, cy + a / 2), P(cx - a / 2, cy + a / 2)]);
const circle = (c: Point, r: number, start = 0, sweep = 2 * Math.PI): Loop => [arc(c, r, start, sweep)];

describe('pointInLoop (half-open ray crossing, exact on arcs)', () => {
  it('agrees with the distance test on a circle drawn from any start, either way round', () => {
    const c = P(3, -2);
    const r = 5;
    for (const [start, sweep] of [
      [0, 2 * Math.PI],
      [1, -2 * Math.PI],
      [-7.5, 2 * Math.PI],
      [Math.PI / 2, 2 * Math.PI],
    ] as const) {
      const loop = circle(c, r, start, sweep);
      for (let i = 0; i < 400; i++) {
        // Deterministic scatter over the box [-3r, 3r]² about the centre (golden-ratio sequence).
        const p = P(c.x + 3 * r * (2 * ((i * 0.618034) % 1) - 1), c.y + 3 * r * (2 * ((i * 0.754878) % 1) - 1));
        const d = Math.hypot(p.x - c.x, p.y - c.y);
        if (Math.abs(d - r) < 1e-9) continue;
        expect(pointInLoop(p, loop)).toBe(d < r);
      }
    }
  });

  it('counts a ray tangent to the top or bottom of an arc as no crossing', () => {
    const loop = circle(P(0, 0), 1);
    expect(pointInLoop(P(-5, 1), loop)).toBe(false);
    expect(pointInLoop(P(-5, -1), loop)).toBe(false);
    expect(pointInLoop(P(0, 0.999999), loop)).toBe(true);
  });

  it('counts a ray through a shared vertex once', () => {
    // Diamond: the ray from the centre passes through the vertex (2, 0) joining two edges.
    const diamond = poly([P(0, -2), P(2, 0), P(0, 2), P(-2, 0)]);
    expect(pointInLoop(P(0, 0), diamond)).toBe(true);
    expect(pointInLoop(P(-3, 0), diamond)).toBe(false);
  });

  it('handles a D shape of a line and a half-circle arc', () => {
    // Right half of the unit circle closed by the diameter on the y-axis.
    const d: Loop = [arc(P(0, 0), 1, -Math.PI / 2, Math.PI), line(P(0, 1), P(0, -1))];
    expect(pointInLoop(P(0.5, 0), d)).toBe(true);
    expect(pointInLoop(P(-0.5, 0), d)).toBe(false);
    expect(pointInLoop(P(0.9, 0.5), d)).toBe(false); // 0.9² + 0.5² > 1
    expect(pointInLoop(P(0.8, 0.5), d)).toBe(true);
  });
});

describe('nestLoops', () => {
  it('disc with a hole, loops in any order and orientation', () => {
    const R = 2;
    const r = 1;
    for (const loops of [
      [circle(P(0, 0), R), circle(P(0, 0), r)],
      [reverseLoop(circle(P(0, 0), r)), circle(P(0, 0), R, 1, -2 * Math.PI)],
    ]) {
      const region = nestLoops(loops);
      expect(region.parts).toHaveLength(1);
      expect(region.parts[0]!.holes).toHaveLength(1);
      expect(signedLoopArea(region.parts[0]!.outer)).toBeGreaterThan(0);
      expect(signedLoopArea(region.parts[0]!.holes[0]!)).toBeLessThan(0);
      // Tube: A = π(R² − r²), I = π(R⁴ − r⁴)/4 — Gere & Goodno, Mechanics of Materials, Appendix D (circle, by difference).
      const p = sectionProperties(region);
      expectClose(p.A, Math.PI * (R * R - r * r));
      expectClose(p.Ix, (Math.PI * (R ** 4 - r ** 4)) / 4);
    }
  });

  it('island inside a hole starts a new part', () => {
    const outer = square(0, 0, 10);
    const hole = square(0, 0, 6);
    const island = square(0, 0, 2);
    const region = nestLoops([island, reverseLoop(outer), hole]);
    expect(region.parts).toHaveLength(2);
    const withHole = region.parts.find((p) => p.holes.length === 1)!;
    const alone = region.parts.find((p) => p.holes.length === 0)!;
    expectClose(Math.abs(signedLoopArea(withHole.outer)), 100);
    expectClose(Math.abs(signedLoopArea(alone.outer)), 4);
    // Areas of squares a²: 10² − 6² + 2² = 68 — common practice.
    expectClose(regionMoments(region).a, 68);
  });

  it('two disjoint parts, and a hole in each', () => {
    const region = nestLoops([square(0, 0, 4), square(10, 0, 4), circle(P(10, 0), 1), square(0, 0, 1)]);
    expect(region.parts).toHaveLength(2);
    expect(region.parts.every((p) => p.holes.length === 1)).toBe(true);
    // Squares a² and circle πr² — common practice.
    expectClose(regionMoments(region).a, 16 - 1 + 16 - Math.PI);
  });

  it('a hole goes to its smallest container, three levels deep', () => {
    // Rings: 20 (outer) ⊃ 16 (hole) ⊃ 12 (island) ⊃ 8 (hole of the island) ⊃ 4 (island).
    const loops = [4, 16, 8, 20, 12].map((a) => square(0, 0, a));
    const region = nestLoops(loops);
    expect(region.parts).toHaveLength(3);
    const sizes = region.parts
      .map((p) => [Math.sqrt(signedLoopArea(p.outer)), p.holes.map((h) => Math.sqrt(-signedLoopArea(h)))])
      .sort((a, b) => (a[0] as number) - (b[0] as number));
    expect(sizes.map((s) => s[0])).toEqual([4, 12, 20]);
    expect(sizes.map((s) => s[1])).toEqual([[], [8], [16]]);
  });

  it('arcs: stadium with a circular hole beside a separate disc', () => {
    // Stadium: two half-circles of radius 1 joined by lines of length 4; hole of radius 0.5.
    const stadium: Loop = [
      line(P(0, -1), P(4, -1)),
      arc(P(4, 0), 1, -Math.PI / 2, Math.PI),
      line(P(4, 1), P(0, 1)),
      arc(P(0, 0), 1, Math.PI / 2, Math.PI),
    ];
    const region = nestLoops([circle(P(4.2, 0), 0.5), circle(P(20, 0), 2), reverseLoop(stadium)]);
    expect(region.parts).toHaveLength(2);
    // Rectangle 4·2 plus a circle π·1², minus π·0.5², plus π·2² — common practice.
    expectClose(regionMoments(region).a, 8 + Math.PI - Math.PI / 4 + 4 * Math.PI);
  });
});

describe('regressions', () => {
  it('full circle from angle 0: a point a few ulps below its start height is inside (mx122 cavity)', () => {
    // sin(2π) ≠ 0 leaves the computed end 6e-15·r below the start; the ray must still cross once.
    const loop = circle(P(0, 0), 25);
    for (const y of [-1e-15, -5e-15, 0, 5e-15, -1e-14]) expect(pointInLoop(P(20, y), loop)).toBe(true);
    for (const y of [-1e-15, 0, 1e-15]) expect(pointInLoop(P(26, y), loop)).toBe(false);
    // Reversed (start 2π, sweep −2π) and about an offset centre.
    const rev = reverseLoop(circle(P(7, -3), 2));
    for (const y of [-3 - 1e-15, -3, -3 + 1e-15]) expect(pointInLoop(P(8, y), rev)).toBe(true);
  });
});
