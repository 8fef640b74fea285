import { describe, expect, it } from 'vitest';
import { arc, line, reverseLoop, sectionProperties, type Loop, type Point } from '@keelson/geometry';
import { ResolveError, resolveLoops } from '../src';

const P = (x: number, y: number): Point => ({ x, y });
const poly = (pts: Point[]): Loop => pts.map((p, i) => line(p, pts[(i + 1) % pts.length]!));
const rect = (x0: number, y0: number, w: number, h: number) => poly([P(x0, y0), P(x0 + w, y0), P(x0 + w, y0 + h), P(x0, y0 + h)]);
/** Rectangle with corners rounded by radius r (counter-clockwise). */
function rounded(x0: number, y0: number, w: number, h: number, r: number): Loop {
  const [x1, y1] = [x0 + w, y0 + h];
  return [
    line(P(x0 + r, y0), P(x1 - r, y0)),
    arc(P(x1 - r, y0 + r), r, -Math.PI / 2, Math.PI / 2),
    line(P(x1, y0 + r), P(x1, y1 - r)),
    arc(P(x1 - r, y1 - r), r, 0, Math.PI / 2),
    line(P(x1 - r, y1), P(x0 + r, y1)),
    arc(P(x0 + r, y1 - r), r, Math.PI / 2, Math.PI / 2),
    line(P(x0, y1 - r), P(x0, y0 + r)),
    arc(P(x0 + r, y0 + r), r, Math.PI, Math.PI / 2),
  ];
}
const TOL = 1e-9;

describe('resolveLoops', () => {
  it('keeps separate loops exact and nests holes', () => {
    const r = resolveLoops([rect(2, 2, 2, 2), rect(0, 0, 10, 10), rect(20, 0, 1, 1)], TOL);
    expect(r.flattening).toBeNull();
    expect(r.region.parts).toHaveLength(2);
    expect(sectionProperties(r.region).A).toBe(100 - 4 + 1);
  });

  it('unites two overlapping rectangles drawn as a T without counting the overlap twice', () => {
    // Flange 100 × 10 on top of a web 10 × 100 that runs through it.
    const r = resolveLoops([rect(0, 90, 100, 10), reverseLoop(rect(45, 0, 10, 100))], TOL);
    const p = sectionProperties(r.region);
    // Composite T: A = 100·10 + 10·90; centroid and Ix by the parallel-axis theorem — Gere & Goodno, §12.4.
    const A = 1000 + 900;
    const cy = (1000 * 95 + 900 * 45) / A;
    const Ix = (100 * 10 ** 3) / 12 + 1000 * (95 - cy) ** 2 + (10 * 90 ** 3) / 12 + 900 * (45 - cy) ** 2;
    expect(Math.abs(p.A / A - 1)).toBeLessThan(1e-12);
    expect(Math.abs(p.cy / cy - 1)).toBeLessThan(1e-12);
    expect(Math.abs(p.Ix / Ix - 1)).toBeLessThan(1e-12);
    expect(r.region.parts).toHaveLength(1);
    expect(r.notes.join(' ')).toMatch(/united/);
  });

  it('restores arcs the union did not cut', () => {
    // A rounded plate with a rib overlapping the middle of its top edge: all four corner arcs survive.
    const plate = rounded(0, 0, 100, 20, 5);
    const r = resolveLoops([plate, rect(40, 15, 20, 30)], TOL);
    expect(r.flattening).toBeNull();
    expect(r.region.parts[0]!.outer.filter((s) => s.kind === 'arc')).toHaveLength(4);
    // Rounded rectangle: wh − (4 − π)r² (common practice), plus the rib above the plate: 20 × 25.
    const A = 100 * 20 - (4 - Math.PI) * 25 + 20 * 25;
    expect(Math.abs(sectionProperties(r.region).A / A - 1)).toBeLessThan(1e-12);
  });

  it('flattens arcs the union cuts and states the bound', () => {
    const R = 10;
    const d = 6;
    // A disc and a bar covering x ≥ d: the overlap is the circular segment r²·acos(d/r) − d·√(r² − d²) — Gere & Goodno, Appendix D.
    const r = resolveLoops([[arc(P(0, 0), R, 0, 2 * Math.PI)], rect(d, -3, 20, 6)], TOL);
    expect(r.flattening).not.toBeNull();
    const dev = r.flattening!.maxDeviation;
    const barInDisc = 2 * (3 * Math.sqrt(R * R - 9) / 2 + (R * R / 2) * Math.asin(3 / R)) - 6 * d; // strip |y| ≤ 3, d ≤ x ≤ √(R²−y²)
    const A = Math.PI * R * R + 20 * 6 - barInDisc;
    const a = sectionProperties(r.region).A;
    // The flattened boundary lies within dev of the true one: the area is off by at most dev × perimeter.
    expect(Math.abs(a - A)).toBeLessThanOrEqual(dev * (2 * Math.PI * R + 52));
    expect(dev).toBeLessThan(1e-5);
  });

  it('drops a duplicated contour instead of letting it cancel', () => {
    const r = resolveLoops([rect(0, 0, 10, 5), reverseLoop(rect(0, 0, 10, 5))], TOL);
    expect(sectionProperties(r.region).A).toBe(50);
    expect(r.notes[0]).toMatch(/duplicate/);
  });

  it('refuses a self-intersecting outline with its location', () => {
    const bowtie = poly([P(0, 0), P(10, 10), P(10, 0), P(0, 10)]);
    try {
      resolveLoops([bowtie], TOL);
      expect.fail('accepted a bow tie');
    } catch (e) {
      expect(e).toBeInstanceOf(ResolveError);
      expect((e as ResolveError).code).toBe('SELF_INTERSECTION');
      expect((e as ResolveError).message).toContain('(5, 5)');
    }
  });

  it('unites crossing loops at any depth: two holes that overlap become one hole', () => {
    const r = resolveLoops([rect(0, 0, 100, 100), rect(10, 10, 30, 20), rect(30, 20, 30, 20)], TOL);
    // Plate minus the union of two overlapping 30 × 20 holes sharing a 10 × 10 corner (inclusion–exclusion, common practice).
    expect(sectionProperties(r.region).A).toBeCloseTo(10000 - (600 + 600 - 100), 9);
    expect(r.region.parts[0]!.holes).toHaveLength(1);
  });

  it('works far from the origin and at large scale without leaving clipper-lib’s integer range', () => {
    const s = 1e6;
    const r = resolveLoops([rect(5e9, 5e9, 100 * s, 10 * s), rect(5e9 + 45 * s, 5e9 - 90 * s, 10 * s, 100 * s)], TOL * s);
    expect(Math.abs(sectionProperties(r.region).A / (1900 * s * s) - 1)).toBeLessThan(1e-12);
  });
});
