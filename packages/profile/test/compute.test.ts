import { describe, expect, it } from 'vitest';
import { CIRCLE, dxf, rectLines } from '../../dxf/test/dxf';
import { computeDrawing, drawingFault, EXACT, PROPERTY_KEYS } from '../src';

// Plate 100 × 50 mm with a centred hole of diameter 20.
const plate = dxf([...rectLines(0, 0, 100, 50), CIRCLE([50, 25], 10)]);

describe('computeDrawing', () => {
  it('gives the JSON contract entry from text or bytes', async () => {
    const fromText = await computeDrawing(plate, { name: 'plate', source: 'plate.dxf' });
    const fromBytes = await computeDrawing(new TextEncoder().encode(plate), { name: 'plate', source: 'plate.dxf' });
    expect(fromBytes).toEqual(fromText);
    expect(fromText.units).toBe('mm');
    expect(Object.keys(fromText.properties)).toEqual(PROPERTY_KEYS);
    // A = bh − πr² = 5000 − 100π mm² — common practice.
    expect(Math.abs(fromText.properties.A - (5000 - 100 * Math.PI))).toBeLessThanOrEqual(1e-9 * 5000);
    expect(fromText.accuracy.A).toBe(EXACT);
  });

  it('converts to the requested unit', async () => {
    const p = await computeDrawing(plate, { name: 'plate', source: 'plate.dxf', units: 'cm' });
    expect(p.units).toBe('cm');
    expect(Math.abs(p.properties.A - (50 - Math.PI))).toBeLessThanOrEqual(1e-9 * 50);
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
