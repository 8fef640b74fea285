import { describe, expect, it } from 'vitest';
import { findCrossing, sectionProperties } from '@keelson/geometry';
import { tee } from '../src';
import { expectClose } from './close';

/** Area a fillet of radius r adds to (re-entrant) or removes from (convex) a right-angled corner: r²(1 − π/4) — elementary geometry. */
const spandrel = (r: number) => r * r * (1 - Math.PI / 4);

describe('tee', () => {
  it('without fillets matches two plates', () => {
    const d = { h: 60, b: 80, tw: 6, tf: 10 };
    const p = sectionProperties(tee(d));
    const af = d.b * d.tf;
    const aw = (d.h - d.tf) * d.tw;
    const yf = d.h - d.tf / 2;
    const yw = (d.h - d.tf) / 2;
    const cy = (af * yf + aw * yw) / (af + aw);
    // Composite areas and the parallel-axis theorem — Gere & Goodno, Mechanics of Materials, §12.3–12.5.
    expectClose(p.A, af + aw);
    expectClose(p.cy, cy);
    expectClose(p.Ix, (d.b * d.tf ** 3) / 12 + af * (yf - cy) ** 2 + (d.tw * (d.h - d.tf) ** 3) / 12 + aw * (yw - cy) ** 2);
    expectClose(p.Iy, (d.tf * d.b ** 3) / 12 + ((d.h - d.tf) * d.tw ** 3) / 12);
    expectClose(p.cx, 0, 1e-9, d.b);
  });

  it('root fillets add and toe radii remove a spandrel each', () => {
    const d = { h: 50, b: 50, tw: 5, tf: 5, r: 5, rt: 1 };
    const r = tee(d);
    // Plates + 2 root spandrels − 4 toe spandrels (two flange tips, two stem-end corners) — elementary geometry.
    expectClose(sectionProperties(r).A, d.b * d.tf + (d.h - d.tf) * d.tw + 2 * spandrel(d.r) - 4 * spandrel(d.rt));
    expect(findCrossing(r, 1e-9 * d.h)).toBeNull();
  });

  it('rejects a stem as wide as the flange', () => {
    expect(() => tee({ h: 50, b: 5, tw: 5, tf: 5 })).toThrow();
  });
});
