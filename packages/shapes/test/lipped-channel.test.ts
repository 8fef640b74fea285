import { describe, expect, it } from 'vitest';
import { findCrossing, sectionProperties } from '@keelson/geometry';
import { lippedChannel, lippedChannelCentreline } from '../src';
import { expectClose } from './close';

describe('lippedChannel', () => {
  const d = { h: 100, b: 50, c: 15, t: 2, ri: 2 };

  it('area is the mid-thickness length times the thickness', () => {
    const p = sectionProperties(lippedChannel(d));
    // A = Lc·t: exact for constant thickness with concentric bends, common practice (cold-formed design, e.g. the
    // "linear method" of AISI S100 and EN 1993-1-3 uses it as an approximation for the sharp-corner model).
    expectClose(p.A, lippedChannelCentreline(d) * d.t);
    // Lc by hand: straight web 100 − 8, flanges 2 × (50 − 8), lips 2 × (15 − 4), four quarter bends of radius 3 — common practice.
    expectClose(lippedChannelCentreline(d), 92 + 84 + 22 + 2 * Math.PI * 3);
  });

  it('perimeter is twice the mid-thickness length plus the two lip ends', () => {
    // Inner and outer edges are parallel offsets of the mid-line by ±t/2; their lengths average to Lc — common practice.
    expectClose(sectionProperties(lippedChannel(d)).P, 2 * lippedChannelCentreline(d) + 2 * d.t);
  });

  it('is symmetric about its mid-depth and outlines a simple loop', () => {
    const r = lippedChannel(d);
    const p = sectionProperties(r);
    // Mirror symmetry about y = h/2 puts the centroid and the plastic axis there, Ixy = 0 — common practice.
    expectClose(p.cy, d.h / 2);
    expectClose(p.ypna, d.h / 2);
    expectClose(p.Ixy, 0, 1e-9, p.I1);
    expect(findCrossing(r, 1e-9 * d.h)).toBeNull();
  });

  it('sharp inside bends (ri = 0) keep the area rule, the outside radius being t', () => {
    const s = { h: 60, b: 30, c: 10, t: 1.5, ri: 0 };
    // Same rule with mid-line bend radius t/2 — common practice.
    expectClose(sectionProperties(lippedChannel(s)).A, lippedChannelCentreline(s) * s.t);
  });

  it('rejects a lip shorter than its bend', () => {
    expect(() => lippedChannel({ h: 100, b: 50, c: 3, t: 2, ri: 2 })).toThrow(/do not fit/);
  });
});
