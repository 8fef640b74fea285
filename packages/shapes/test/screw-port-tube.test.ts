import { describe, expect, it } from 'vitest';
import {
  endPoint,
  evalSegment,
  paramRange,
  findCrossing,
  sectionProperties,
  startPoint,
  type Point,
  type Segment,
} from '@keelson/geometry';
import { screwPortTube, type ScrewPortTubeDims } from '../src';
import { expectClose } from './close';

/** Unit tangent in the direction of travel at the start (u = 0) or end (u = 1) of a segment. */
function tangent(s: Segment, u: 0 | 1): Point {
  const [t0, t1] = paramRange(s);
  const { d } = evalSegment(s, u ? t1 : t0);
  const l = Math.hypot(d.x, d.y) * Math.sign(t1 - t0);
  return { x: d.x / l, y: d.y / l };
}

/** Area common to two discs of radii r, R with centres d apart — Weisstein, MathWorld "Circle-Circle Intersection" (from memory). */
function lens(r: number, R: number, d: number): number {
  const a = r * r * Math.acos((d * d + r * r - R * R) / (2 * d * r));
  const b = R * R * Math.acos((d * d + R * R - r * r) / (2 * d * R));
  return a + b - Math.sqrt((-d + r + R) * (d + r - R) * (d - r + R) * (d + r + R)) / 2;
}

describe('screwPortTube', () => {
  const d: ScrewPortTubeDims = { D: 50, t: 2.5, n: 4, e: 19.5, rb: 4, dh: 3.3, rf: 1 };

  it('cavity outline is smooth: every joint is tangent continuous', () => {
    const cavity = screwPortTube(d).parts[0]!.holes[0]!;
    expect(cavity.length).toBe(4 * d.n);
    cavity.forEach((s, i) => {
      const next = cavity[(i + 1) % cavity.length]!;
      const p = endPoint(s);
      const q = startPoint(next);
      // Rolling-ball fillets meet wall and boss tangentially — common practice.
      expectClose(Math.hypot(p.x - q.x, p.y - q.y), 0, 1e-9, d.D);
      const a = tangent(s, 1);
      const b = tangent(next, 0);
      expectClose(a.x * b.y - a.y * b.x, 0, 1e-9, 1);
      expect(a.x * b.x + a.y * b.y).toBeGreaterThan(0);
    });
  });

  it('nothing crosses: outside, cavity and screw holes are disjoint', () => {
    expect(findCrossing(screwPortTube(d), 1e-9 * d.D)).toBeNull();
    expect(findCrossing(screwPortTube({ ...d, n: 1 }), 1e-9 * d.D)).toBeNull();
    expect(findCrossing(screwPortTube({ ...d, n: 6, rb: 3, e: 20 }), 1e-9 * d.D)).toBeNull();
    expect(findCrossing(screwPortTube({ ...d, n: 12 }), 1e-9 * d.D)).toBeNull(); // the most the checks allow
  });

  it('with vanishing fillets the area is the tube plus the bosses inside the bore, less the holes', () => {
    const f = { ...d, rf: 1e-3 };
    const ri = d.D / 2 - d.t;
    // Annulus + n lenses (boss ∩ bore disc) − n screw holes; fillets add O(rf²) — elementary geometry.
    const sharp = Math.PI * ((d.D / 2) ** 2 - ri * ri) + d.n * (lens(d.rb, ri, d.e) - (Math.PI * d.dh ** 2) / 4);
    expectClose(sectionProperties(screwPortTube(f)).A, sharp, 1e-6);
    expect(sectionProperties(screwPortTube(d)).A).toBeGreaterThan(sharp);
  });

  it('four equal ports: centroid at the centre and Ix = Iy, Ixy = 0', () => {
    const p = sectionProperties(screwPortTube(d));
    // n-fold rotational symmetry with n ≥ 3 makes every centroidal axis principal — common practice.
    expectClose(p.cx, 0, 1e-9, d.D);
    expectClose(p.cy, 0, 1e-9, d.D);
    expectClose(p.Ix, p.Iy);
    expectClose(p.Ixy, 0, 1e-9, p.Ix);
  });

  it('rejects bosses that miss the wall, holes that break out, bosses that overlap', () => {
    expect(() => screwPortTube({ ...d, e: 10 })).toThrow(/does not cross/);
    expect(() => screwPortTube({ ...d, dh: 9 })).toThrow(/does not fit/);
    expect(() => screwPortTube({ ...d, n: 12 })).not.toThrow();
    expect(() => screwPortTube({ ...d, n: 13 })).toThrow(/overlap/);
  });
});
