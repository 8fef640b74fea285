import { describe, expect, it } from 'vitest';
import { findCrossing, sectionProperties, segmentCount } from '@keelson/geometry';
import { tSlotProfile, type TSlotDims } from '../src';
import { expectClose } from './close';

/** Area between the sides of a corner turning through δ and its fillet of radius r: r²(tan(δ/2) − δ/2) — elementary geometry. */
const cornerArea = (r: number, delta: number) => r * r * (Math.tan(delta / 2) - delta / 2);

describe('tSlotProfile', () => {
  const d: Required<TSlotDims> = { a: 40, s: 8.2, tl: 3, w: 18, d: 9, k: 3, bore: 6.8, ro: 1.5, rf: 0.5 };

  it('area is the square less four slots and the bore, corrected corner by corner for the fillets', () => {
    const q = Math.PI / 2;
    const e = Math.PI / 4;
    const slot = d.s * d.tl + d.w * (d.d - d.tl) - d.k * d.k; // neck + chamber less two 45° chamfer triangles
    // Per slot: four convex right-angled corners lose material, two re-entrant right angles and four 45° turns gain it.
    const fillets = -4 * cornerArea(d.rf, q) + 2 * cornerArea(d.rf, q) + 4 * cornerArea(d.rf, e);
    const expected = d.a * d.a - 4 * cornerArea(d.ro, q) - 4 * slot + 4 * fillets - (Math.PI * d.bore ** 2) / 4;
    // Composite areas, elementary geometry.
    expectClose(sectionProperties(tSlotProfile(d)).A, expected);
  });

  it('has fourfold symmetry: centroid at the bore, Ix = Iy, Ixy = 0', () => {
    const p = sectionProperties(tSlotProfile(d));
    // A section with n-fold rotational symmetry, n ≥ 3, has equal second moments about every centroidal axis — common practice.
    expectClose(p.cx, 0, 1e-9, d.a);
    expectClose(p.cy, 0, 1e-9, d.a);
    expectClose(p.Ix, p.Iy);
    expectClose(p.Ixy, 0, 1e-9, p.Ix);
  });

  it('is one simple outline of 44 filleted corners and a bore, with nothing crossing', () => {
    const r = tSlotProfile(d);
    expect(segmentCount(r)).toBe(2 * 44 + 1);
    expect(findCrossing(r, 1e-9 * d.a)).toBeNull();
    const square = tSlotProfile({ ...d, k: 0, bore: 0 });
    expect(segmentCount(square)).toBe(2 * 36);
    expect(findCrossing(square, 1e-9 * d.a)).toBeNull();
  });

  it('rejects slots that would meet at the corners, a bore into the slots, fillets that overlap', () => {
    expect(() => tSlotProfile({ ...d, d: 12 })).toThrow(/meet/);
    expect(() => tSlotProfile({ ...d, bore: 30 })).toThrow(/bore/);
    expect(() => tSlotProfile({ ...d, rf: 1.6 })).toThrow(/overlap/);
  });
});
