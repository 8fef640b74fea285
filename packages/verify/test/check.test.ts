import { describe, expect, it } from 'vitest';
import { checkRow, keyFactor, keyUnit, massPerMetre, type ManifestRow } from '../src';

const row = (over: Partial<ManifestRow>): ManifestRow => ({ id: 'X', drawing: 'x.dxf', revision: '', material: 'steel', units: 'mm', published: {}, tolerances: {}, ...over });

describe('massPerMetre', () => {
  it('is area × density with the area in m²', () => {
    // Flat 50 × 6 mm, steel 7850 kg/m³ (EN 1991-1-1 Table A.4): 300 mm² × 7850 kg/m³ = 2.355 kg/m — common practice.
    expect(massPerMetre(300, 'mm', 7850)).toBeCloseTo(2.355, 12);
    expect(massPerMetre(3, 'cm', 7850)).toBeCloseTo(2.355, 12);
    // Round tube 50 × 3, aluminium 2700 kg/m³ (EN 1999-1-1 §3.2.5): π/4·(50² − 44²) mm² × 2700 = 1.19600 kg/m — common practice.
    expect(massPerMetre((Math.PI / 4) * (50 ** 2 - 44 ** 2), 'mm', 2700)).toBeCloseTo(1.196, 3);
    // 1 in² of steel: 645.16 mm² × 7850 = 5.0645 kg/m (the inch is 25.4 mm exactly).
    expect(massPerMetre(1, 'in', 7850)).toBeCloseTo(5.064506, 6);
  });
});

describe('keys and units', () => {
  it('labels and converts each key by its power of length; mass per metre does not scale', () => {
    expect(keyUnit('Cw', 'cm')).toBe('cm⁶');
    expect(keyUnit('J', 'mm')).toBe('mm⁴');
    expect(keyUnit('m', 'in')).toBe('kg/m');
    expect(keyUnit('theta', 'cm')).toBe('deg');
    expect(keyFactor('Ix', 'cm', 'mm')).toBeCloseTo(1e4, 9);
    expect(keyFactor('Cw', 'cm', 'mm')).toBeCloseTo(1e6, 6);
    expect(keyFactor('m', 'cm', 'mm')).toBe(1);
    expect(keyFactor('theta', 'cm', 'mm')).toBe(1);
  });
});

describe('checkRow', () => {
  it('passes within a relative tolerance of the published value and fails just outside it', () => {
    const r = row({ published: { A: 100, Ix: 1000 }, tolerances: { A: { kind: 'relative', value: 0.005 } } });
    const [a, ix] = checkRow(r, { A: 100.49, Ix: 1010.5 }, {});
    expect(a).toMatchObject({ key: 'A', unit: 'mm²', published: 100, pass: true, toleranceSource: 'manifest' });
    expect(a!.difference).toBeCloseTo(0.49, 12);
    expect(a!.relative).toBeCloseTo(0.0049, 12);
    // Default 1 %: 10.5 over 1000 fails.
    expect(ix).toMatchObject({ key: 'Ix', pass: false, toleranceSource: 'default', allowed: 10 });
  });

  it('applies absolute tolerances in the row unit; position defaults are 0.2 mm converted', () => {
    const cm = row({ units: 'cm', published: { cy: 2, J: 5 }, tolerances: { J: { kind: 'absolute', value: 0.2 } } });
    const checks = checkRow(cm, { cy: 2.019, J: 5.19 }, {});
    expect(checks.map((c) => [c.key, c.pass])).toEqual([['cy', true], ['J', true]]);
    expect(checks[0]!.allowed).toBeCloseTo(0.02, 12);
    expect(checkRow(cm, { cy: 2.021 }, {})[0]!.pass).toBe(false);
  });

  it('measures a relative tolerance on Ixy against I1 when Ixy is published as 0', () => {
    const r = row({ published: { Ixy: 0 } });
    expect(checkRow(r, { Ixy: 5, I1: 1000 }, {})[0]).toMatchObject({ pass: true, allowed: 10, relative: null });
    expect(checkRow(r, { Ixy: 11, I1: 1000 }, {})[0]!.pass).toBe(false);
  });

  it('adds the computation error bound to the allowance', () => {
    const r = row({ published: { J: 100 }, tolerances: { J: { kind: 'relative', value: 0 } } });
    expect(checkRow(r, { J: 100.05 }, { J: 1e-3 })[0]!.pass).toBe(true);
    expect(checkRow(r, { J: 100.2 }, { J: 1e-3 })[0]!.pass).toBe(false);
  });

  it('fails a published key with no computed value, and checks in the fixed key order', () => {
    const r = row({ published: { J: 3, A: 1, m: 2 } });
    const checks = checkRow(r, { A: 1, m: 2 }, {});
    expect(checks.map((c) => c.key)).toEqual(['m', 'A', 'J']);
    expect(checks[2]).toMatchObject({ computed: null, difference: null, pass: false });
  });
});
