import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { CIRCLE, dxf, rectLines } from '../../dxf/test/dxf';
import { computeDrawing, computeProfiles, drawingFault, EXACT, PROPERTY_KEYS } from '../src';

// Plate 100 × 50 mm with a centred hole of diameter 20.
const plate = dxf([...rectLines(0, 0, 100, 50), CIRCLE([50, 25], 10)]);

describe('computeDrawing', () => {
  it('gives the JSON contract entry from text or bytes', async () => {
    const fromText = await computeDrawing(plate, { name: 'plate', source: 'plate.dxf' });
    const fromBytes = await computeDrawing(new TextEncoder().encode(plate), { name: 'plate', source: 'plate.dxf' });
    expect(fromBytes).toEqual(fromText);
    expect(fromText.units).toBe('mm');
    expect(Object.keys(fromText.properties)).toEqual([...PROPERTY_KEYS, 'J', 'Cw', 'xs', 'ys']);
    // A = bh − πr² = 5000 − 100π mm² — common practice.
    expect(Math.abs(fromText.properties.A - (5000 - 100 * Math.PI))).toBeLessThanOrEqual(1e-9 * 5000);
    expect(fromText.accuracy.A).toBe(EXACT);
  });

  it('converts to the requested unit', async () => {
    const p = await computeDrawing(plate, { name: 'plate', source: 'plate.dxf', units: 'cm' });
    expect(p.units).toBe('cm');
    expect(Math.abs(p.properties.A - (50 - Math.PI))).toBeLessThanOrEqual(1e-9 * 50);
  });

  it('adds torsion and warping by finite elements, converted with the unit, or skips them', async () => {
    const bar = dxf(rectLines(0, 0, 100, 50));
    const mm = await computeDrawing(bar, { name: 'bar', source: 'bar.dxf' });
    // Rectangle w/t = 2: J = β·w·t³, β = 0.228682 — Timoshenko & Goodier, Theory of Elasticity, torsion of rectangular bars.
    const J = 0.228682 * 100 * 50 ** 3;
    expect(Math.abs(mm.properties.J! / J - 1)).toBeLessThanOrEqual(1e-3);
    expect(mm.accuracy.J).toBeLessThanOrEqual(1e-3);
    // Doubly symmetric: the shear centre is the centroid — Gere & Goodno, shear centres.
    expect(Math.abs(mm.properties.xs! - 50)).toBeLessThanOrEqual(1e-6 * 100);
    expect(Math.abs(mm.properties.ys! - 25)).toBeLessThanOrEqual(1e-6 * 100);
    const cm = await computeDrawing(bar, { name: 'bar', source: 'bar.dxf', units: 'cm' });
    expect(Math.abs(cm.properties.J! / (mm.properties.J! * 1e-4) - 1)).toBeLessThan(1e-12);
    expect(Math.abs(cm.properties.Cw! - mm.properties.Cw! * 1e-6)).toBeLessThanOrEqual(1e-12 * mm.properties.Cw! + 1e-9);
    // A symmetric section centred on the origin (the demo's T-slot, its centroid 1e-18 off by
    // rounding): the shear centre is the tidied centroid, exactly 0, not rounding noise.
    const slot = await computeDrawing(readFileSync(new URL('../../../fixtures/demo/mx121-t-slot-40.dxf', import.meta.url), 'utf8'), { name: 'slot', source: 'slot.dxf' });
    expect([slot.properties.cx, slot.properties.cy]).toEqual([0, 0]);
    expect([slot.properties.xs, slot.properties.ys]).toEqual([0, 0]);
    const fast = await computeDrawing(bar, { name: 'bar', source: 'bar.dxf', torsion: false });
    expect(fast.properties.J).toBeUndefined();
    expect(fast.accuracy.J).toBeUndefined();
  });

  it('states a fault in the drawing as its code and one line naming the source', async () => {
    const e = await computeDrawing(dxf(rectLines(0, 0, 2, 1), { insunits: null }), { name: 'x', source: 'up/x.dxf' }).catch((err: unknown) => err);
    const f = drawingFault(e, 'up/x.dxf');
    expect(f?.code).toBe('MISSING_UNIT');
    expect(f?.message).toMatch(/^up\/x\.dxf: .*--drawing-units/);
    expect(f?.message).not.toMatch(/\n/);
    expect(drawingFault(new TypeError('bug'), 'x')).toBeNull();
  });
});

describe('computeProfiles', () => {
  it('gives one profile per island with split=islands, named after the drawing', async () => {
    // Two separate 10 × 10 squares — common practice.
    const two = dxf([...rectLines(0, 0, 10, 10), ...rectLines(20, 0, 10, 10)]);
    const one = await computeProfiles(two, { name: 'pair', source: 'pair.dxf', torsion: false });
    expect(one).toHaveLength(1);
    const split = await computeProfiles(two, { name: 'pair', source: 'pair.dxf', torsion: false, split: 'islands' });
    expect(split.map((p) => p.name)).toEqual(['pair-1', 'pair-2']);
    for (const p of split) expect('properties' in p && p.properties.A).toBe(100);
  });
});
