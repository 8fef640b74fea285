import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  arc,
  ellipse,
  findCrossing,
  line,
  makeRegion,
  mirrorX,
  regionMoments,
  rotation,
  scaling,
  sectionProperties,
  transformRegion,
  translation,
  PROPERTY_DIMENSION,
  type PropertyKey,
  type Region,
  type SectionProperties,
} from '@keelson/geometry';
import { angle, channel, circleLoop, hollowRectangle, iSection, polygonRegion, rectangleLoop } from '@keelson/shapes';

const pos = (min: number, max: number) => fc.double({ min, max, noNaN: true });
const frac = pos(0.05, 0.95);

/** Random profiles from the shape families (dimensions in an arbitrary unit, size about 10–200). */
const profile: fc.Arbitrary<Region> = fc.oneof(
  fc.record({ h: pos(20, 200), b: pos(10, 200), tw: frac, tf: frac, r: frac }).map(({ h, b, tw, tf, r }) => {
    const web = (tw * b) / 2;
    const flange = (tf * h) / 3;
    return iSection({ h, b, tw: web, tf: flange, r: r * 0.9 * Math.min((b - web) / 2, h / 2 - flange) });
  }),
  fc.record({ a: pos(20, 150), b: pos(20, 150), t: frac, r: frac, rt: frac }).map(({ a, b, t, r, rt }) => {
    const th = t * 0.5 * Math.min(a, b);
    const free = Math.min(a, b) - th;
    return angle({ a, b, t: th, r: r * 0.45 * free, rt: rt * 0.45 * th });
  }),
  fc.record({ h: pos(20, 200), b: pos(10, 120), tw: frac, tf: frac }).map(({ h, b, tw, tf }) =>
    channel({ h, b, tw: tw * b * 0.5, tf: (tf * h) / 3 }),
  ),
  fc.record({ w: pos(20, 200), h: pos(20, 200), t: frac, ro: frac, ri: frac }).map(({ w, h, t, ro, ri }) => {
    const th = (t * Math.min(w, h)) / 3;
    const inner = Math.min(w, h) - 2 * th;
    const outer = ro * 0.5 * Math.min(w, h);
    // The inner corner must stay inside the outer one: ri ≥ ro − t (equal for constant wall thickness).
    const lo = Math.max(0, outer - th);
    return hollowRectangle({ w, h, t: th, ro: outer, ri: lo + ri * (0.5 * inner - lo) });
  }),
  fc.array(fc.tuple(pos(0, 1), pos(30, 100)), { minLength: 3, maxLength: 14 }).map((pts) => {
    // Star-shaped polygon about the origin: distinct sorted angles keep it simple.
    const angles = pts.map(([u], i) => ((i + 0.2 + 0.6 * u) / pts.length) * 2 * Math.PI);
    return polygonRegion(pts.map(([, r], i) => ({ x: r * Math.cos(angles[i]!), y: r * Math.sin(angles[i]!) })));
  }),
  fc.record({ R: pos(20, 100), k: pos(0.1, 0.6), ex: pos(-0.3, 0.3), ey: pos(-0.3, 0.3) }).map(({ R, k, ex, ey }) =>
    makeRegion([{ outer: circleLoop(R), holes: [circleLoop(k * R, { x: ex * R, y: ey * R })] }]),
  ),
  fc.record({ a: pos(20, 100), e: pos(0.2, 1), phi: pos(0, Math.PI), k: pos(0.1, 0.5) }).map(({ a, e, phi, k }) => {
    // Elliptical tube: an ellipse with a concentric elliptical hole at a different angle.
    const b = a * e;
    const ax = (len: number, t: number) => ({ x: len * Math.cos(t), y: len * Math.sin(t) });
    const ell = (p: number, q: number, t: number, dir: number) => [ellipse({ x: 0, y: 0 }, ax(p, t), ax(q, t + Math.PI / 2), 0, dir * 2 * Math.PI)];
    return makeRegion([{ outer: ell(a, b, phi, 1), holes: [ell(k * b, k * b * 0.5, phi + 1, -1)] }]);
  }),
  fc.array(pos(0.85, 1), { minLength: 6, maxLength: 14 }).map((radii) => {
    // Closed uniform cubic B-spline over a slightly perturbed circle of control points: a smooth, simple blob.
    const n = radii.length;
    const ctrl = radii.map((r, i) => ({ x: 50 * r * Math.cos((2 * Math.PI * i) / n), y: 50 * r * Math.sin((2 * Math.PI * i) / n), w: 1 }));
    const controls = [...ctrl, ctrl[0]!, ctrl[1]!, ctrl[2]!];
    const knots = Array.from({ length: controls.length + 4 }, (_, i) => i);
    return makeRegion([{ outer: [{ kind: 'spline' as const, degree: 3, knots, controls }], holes: [] }]);
  }),
);

/** Natural size of a property: its dimension's power of the radius of gyration times the area. */
function natural(p: SectionProperties, key: PropertyKey): number {
  const L = Math.sqrt(p.A);
  const d = PROPERTY_DIMENSION[key];
  return d === 0 ? 180 : L ** d;
}

function expectSame(a: SectionProperties, b: SectionProperties, keys: PropertyKey[], tol = 1e-9): void {
  for (const k of keys) {
    const err = Math.abs(a[k] - b[k]);
    const bound = tol * Math.max(Math.abs(b[k]), natural(b, k));
    if (!(err <= bound)) expect.fail(`${k}: ${a[k]} vs ${b[k]}`);
  }
}

const CENTROIDAL: PropertyKey[] = [
  'A', 'P', 'Ix', 'Iy', 'Ixy', 'I1', 'I2', 'rx', 'ry', 'r1', 'r2',
  'Sx_top', 'Sx_bottom', 'Sx', 'Sy_left', 'Sy_right', 'Sy', 'S1', 'S2', 'Zx', 'Zy',
];

function angleDiff(a: number, b: number): number {
  const d = (((a - b) % 180) + 180) % 180;
  return Math.min(d, 180 - d);
}

// Invariance laws of second moments under rigid motions and scaling — Gere & Goodno, §12.3–12.8 (transformation equations).
describe('invariants of the property set (fast-check)', () => {
  it('the generated profiles are valid: no loop meets another', () => {
    fc.assert(fc.property(profile, (r) => {
      expect(findCrossing(r, 1e-9)).toBeNull();
    }), { numRuns: 300 });
  });

  it('translation leaves every centroidal value unchanged and moves the centroid', () => {
    fc.assert(
      fc.property(profile, pos(-1e4, 1e4), pos(-1e4, 1e4), (r, dx, dy) => {
        const a = sectionProperties(r);
        const b = sectionProperties(transformRegion(r, translation(dx, dy)));
        expectSame(b, a, CENTROIDAL, 1e-9);
        if (a.I1 - a.I2 > 1e-6 * a.I1) expect(angleDiff(b.theta, a.theta)).toBeLessThan(1e-6);
        expect(Math.abs(b.cx - a.cx - dx)).toBeLessThanOrEqual(1e-9 * (Math.abs(dx) + natural(a, 'cx')));
        expect(Math.abs(b.ypna - a.ypna - dy)).toBeLessThanOrEqual(1e-9 * (Math.abs(dy) + natural(a, 'cy')));
      }),
      { numRuns: 300 },
    );
  });

  it('rotation by φ keeps I1, I2 and turns theta by φ', () => {
    fc.assert(
      fc.property(profile, pos(-Math.PI, Math.PI), (r, phi) => {
        const a = sectionProperties(r);
        fc.pre(a.I1 - a.I2 > 1e-3 * a.I1); // the principal direction is defined
        const b = sectionProperties(transformRegion(r, rotation(phi)));
        expectSame(b, a, ['A', 'P', 'I1', 'I2', 'r1', 'r2', 'S1', 'S2'], 1e-9);
        expect(angleDiff(b.theta, a.theta + (phi * 180) / Math.PI)).toBeLessThan(1e-7);
      }),
      { numRuns: 300 },
    );
  });

  it('mirroring flips the sign of Ixy and keeps Ix, Iy, Z', () => {
    fc.assert(
      fc.property(profile, (r) => {
        const a = sectionProperties(r);
        const b = sectionProperties(transformRegion(r, mirrorX));
        expectSame(b, a, ['A', 'Ix', 'Iy', 'I1', 'I2', 'Sx', 'Zx', 'Zy'], 1e-9);
        expect(Math.abs(b.Ixy + a.Ixy)).toBeLessThanOrEqual(1e-9 * a.I1);
        expect(Math.abs(b.Sy_left - a.Sy_right)).toBeLessThanOrEqual(1e-9 * a.Sy_right);
      }),
      { numRuns: 200 },
    );
  });

  it('scaling by s multiplies A by s², I by s⁴, S and Z by s³', () => {
    fc.assert(
      fc.property(profile, pos(1e-3, 1e3), (r, s) => {
        const a = sectionProperties(r);
        const b = sectionProperties(transformRegion(r, scaling(s)));
        for (const k of Object.keys(PROPERTY_DIMENSION) as PropertyKey[]) {
          if (k === 'theta') continue;
          const expected = a[k] * s ** PROPERTY_DIMENSION[k];
          const bound = 1e-9 * Math.max(Math.abs(expected), natural(a, k) * s ** PROPERTY_DIMENSION[k]);
          if (!(Math.abs(b[k] - expected) <= bound)) expect.fail(`${k}: ${b[k]} vs ${expected}`);
        }
      }),
      { numRuns: 200 },
    );
  });

  it('the same profile scaled from 1e-9 to 1e9 keeps its relative values', () => {
    const base = iSection({ h: 200, b: 100, tw: 5.6, tf: 8.5, r: 12 });
    const a = sectionProperties(base);
    for (let e = -9; e <= 9; e++) {
      const s = 10 ** e;
      const b = sectionProperties(transformRegion(base, scaling(s)));
      for (const k of ['A', 'Ix', 'Iy', 'Sx', 'Zx', 'Zy', 'P'] as PropertyKey[])
        expect(Math.abs(b[k] / (a[k] * s ** PROPERTY_DIMENSION[k]) - 1), `${k} at scale 1e${e}`).toBeLessThan(1e-9);
    }
  });
});

describe('additivity: a region split into parts sums to the whole', () => {
  const keys = ['a', 'qx', 'qy', 'ixx', 'iyy', 'ixy'] as const;

  it('a disc cut along any chord', () => {
    fc.assert(
      fc.property(pos(1, 100), pos(-Math.PI, Math.PI), pos(0.01, 2 * Math.PI - 0.01), pos(-50, 50), (R, t0, sweep, off) => {
        const c = { x: off, y: -off / 2 };
        const p0 = { x: c.x + R * Math.cos(t0), y: c.y + R * Math.sin(t0) };
        const p1 = { x: c.x + R * Math.cos(t0 + sweep), y: c.y + R * Math.sin(t0 + sweep) };
        const piece1 = [arc(c, R, t0, sweep), line(p1, p0)];
        const piece2 = [arc(c, R, t0 + sweep, 2 * Math.PI - sweep), line(p0, p1)];
        const whole = regionMoments(makeRegion([{ outer: circleLoop(R, c), holes: [] }]));
        const sum = regionMoments(makeRegion([{ outer: piece1, holes: [] }, { outer: piece2, holes: [] }]));
        const L = R + Math.abs(off);
        const size = [R * R, R * R * L, R * R * L, R * R * L * L, R * R * L * L, R * R * L * L];
        keys.forEach((k, i) => expect(Math.abs(sum[k] - whole[k])).toBeLessThanOrEqual(1e-12 * size[i]!));
      }),
      { numRuns: 300 },
    );
  });

  it('an I-section is the sum of its three plates', () => {
    fc.assert(
      fc.property(pos(20, 400), pos(20, 300), frac, frac, (h, b, tw, tf) => {
        const web = (tw * b) / 2;
        const flange = (tf * h) / 3;
        const whole = regionMoments(iSection({ h, b, tw: web, tf: flange }));
        const plates = regionMoments(
          makeRegion([
            { outer: rectangleLoop(b, flange, -b / 2, -h / 2), holes: [] },
            { outer: rectangleLoop(web, h - 2 * flange, -web / 2, -h / 2 + flange), holes: [] },
            { outer: rectangleLoop(b, flange, -b / 2, h / 2 - flange), holes: [] },
          ]),
        );
        const L = Math.max(h, b);
        const power = [2, 3, 3, 4, 4, 4];
        keys.forEach((k, i) => expect(Math.abs(plates[k] - whole[k])).toBeLessThanOrEqual(1e-12 * L ** power[i]!));
      }),
      { numRuns: 200 },
    );
  });
});
