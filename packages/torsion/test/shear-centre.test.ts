import { describe, expect, it } from 'vitest';
import { sectionProperties } from '@keelson/geometry';
import { channel, hollowRectangle, iSection, rectangle, tube } from '@keelson/shapes';
import { torsionProperties } from '../src';
import { rel, semicircularTube } from './helpers';

describe('shear centre', () => {
  // Doubly symmetric sections: the shear centre is the centroid (symmetry; any text on shear centres).
  const symmetric = [
    { name: 'rectangle 30 × 10 off the origin', region: rectangle(30, 10, 100, 50), size: 30 },
    { name: 'IPE 200 with root fillets', region: iSection({ h: 200, b: 100, tw: 5.6, tf: 8.5, r: 12 }), size: 200 },
    { name: 'RHS 40 × 20 × 2 (EN 10219 radii)', region: hollowRectangle({ w: 40, h: 20, t: 2, ro: 4, ri: 2 }), size: 40 },
    { name: 'tube 60 × 4 centred at (5, −3)', region: tube(60, 52, { x: 5, y: -3 }), size: 60 },
  ];
  for (const c of symmetric)
    it(`${c.name}: at the centroid to 1e-6 of the size`, () => {
      const g = sectionProperties(c.region);
      const p = torsionProperties(c.region);
      expect(Math.abs(p.xs - g.cx) / c.size).toBeLessThanOrEqual(1e-6);
      expect(Math.abs(p.ys - g.cy) / c.size).toBeLessThanOrEqual(1e-6);
    });

  it('thin channel (t/h = 0.02): within 4 % of e = 3b²tf/(6b·tf + h·tw) — Gere & Goodno, shear centres of thin-walled open sections', () => {
    // Centreline dimensions h = 100 (between flange centrelines), b = 50 (web centreline to flange tip), t = 2.
    const t = 2;
    const h = 100;
    const b = 50;
    const p = torsionProperties(channel({ h: h + t, b: b + t / 2, tw: t, tf: t }));
    const e = (3 * b * b * t) / (6 * b * t + h * t);
    // Web centreline at x = t/2; the shear centre lies beyond the web, away from the flanges.
    expect(p.xs).toBeLessThan(0);
    expect(rel(t / 2 - p.xs, e)).toBeLessThanOrEqual(0.04);
    expect(Math.abs(p.ys) / h).toBeLessThanOrEqual(1e-6);
  });

  it('thin semicircular open tube (t/r = 0.05): within 3 % of 4r/π, and closer as the wall thins — Roark 7th ed., Table 10.2', () => {
    const r = 1;
    const errs = [0.1, 0.05].map((t) => {
      const p = torsionProperties(semicircularTube(r, t, { x: 2, y: 1 }));
      // From the centre, on the arc's convex side (+x); on the axis of symmetry.
      expect(Math.abs(p.ys - 1)).toBeLessThanOrEqual(1e-6);
      return rel(p.xs - 2, (4 * r) / Math.PI);
    });
    expect(errs[1]!).toBeLessThanOrEqual(0.03);
    expect(errs[1]!).toBeLessThan(errs[0]!);
  });

  it('thin channel: the error against the thin-walled formula shrinks as the walls thin', () => {
    const errs = [4, 2].map((t) => {
      const h = 100;
      const b = 50;
      const p = torsionProperties(channel({ h: h + t, b: b + t / 2, tw: t, tf: t }));
      return rel(t / 2 - p.xs, (3 * b * b * t) / (6 * b * t + h * t));
    });
    expect(errs[1]!).toBeLessThan(errs[0]!);
  });
});
