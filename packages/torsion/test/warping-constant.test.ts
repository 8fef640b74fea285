import { describe, expect, it } from 'vitest';
import { channel, iSection } from '@keelson/shapes';
import { torsionProperties } from '../src';
import { rel } from './helpers';

describe('warping constant and published tables', () => {
  it('thin I (t/h = 0.02): Cw within 5 % of tf·b³·h0²/24 — AISC 360-16 §F2 user note', () => {
    const t = 4;
    const h = 200;
    const b = 100;
    const p = torsionProperties(iSection({ h, b, tw: t, tf: t }));
    expect(rel(p.Cw, (t * b ** 3 * (h - t) ** 2) / 24)).toBeLessThanOrEqual(0.05);
  });

  it('thin channel (t/h = 0.02): Cw within 6 % of (tf·b³·h²/12)(3b·tf + 2h·tw)/(6b·tf + h·tw) — Roark 7th ed., Table 10.2', () => {
    const t = 2;
    const h = 100;
    const b = 50;
    const p = torsionProperties(channel({ h: h + t, b: b + t / 2, tw: t, tf: t }));
    const roark = ((t * b ** 3 * h ** 2) / 12) * ((3 * b * t + 2 * h * t) / (6 * b * t + h * t));
    expect(rel(p.Cw, roark)).toBeLessThanOrEqual(0.06);
  });

  // European section tables (dimensions EN 10365; It from approximate fillet formulas, Iw from the
  // flanges-only formula): finite elements on the drawn section within 8 % (It) and 6 % (Iw).
  it('IPE 200 (h 200, b 100, tw 5.6, tf 8.5, r 12): It 6.98 cm⁴, Iw 12.99×10³ cm⁶', () => {
    const p = torsionProperties(iSection({ h: 200, b: 100, tw: 5.6, tf: 8.5, r: 12 }));
    expect(rel(p.J / 1e4, 6.98)).toBeLessThanOrEqual(0.08);
    expect(rel(p.Cw / 1e6, 12.99e3)).toBeLessThanOrEqual(0.06);
  });

  it('HE 200 A (h 190, b 200, tw 6.5, tf 10, r 18): It 20.98 cm⁴, Iw 108.0×10³ cm⁶', () => {
    const p = torsionProperties(iSection({ h: 190, b: 200, tw: 6.5, tf: 10, r: 18 }));
    expect(rel(p.J / 1e4, 20.98)).toBeLessThanOrEqual(0.08);
    expect(rel(p.Cw / 1e6, 108.0e3)).toBeLessThanOrEqual(0.06);
  });
});
