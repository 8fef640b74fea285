import { describe, expect, it } from 'vitest';
import { applyToPoint, rotation, scaling, transformRegion, translation, type Affine } from '@keelson/geometry';
import { channel } from '@keelson/shapes';
import { TorsionError, torsionProperties } from '../src';
import { rel } from './helpers';

// Laws of the quantities themselves (any text on torsion): J and Cw are invariants of a rigid
// motion, the shear centre moves with the section; J scales as L⁴, Cw as L⁶, xs and ys as L.
describe('invariance under rigid motions and scaling', () => {
  const base = channel({ h: 60, b: 30, tw: 3, tf: 4, r: 3 });
  const ref = torsionProperties(base);
  const size = 60;

  const compose = (t: Affine, s: Affine): Affine => ({
    a: t.a * s.a + t.b * s.c,
    b: t.a * s.b + t.b * s.d,
    c: t.c * s.a + t.d * s.c,
    d: t.c * s.b + t.d * s.d,
    tx: t.a * s.tx + t.b * s.ty + t.tx,
    ty: t.c * s.tx + t.d * s.ty + t.ty,
  });

  for (const [name, T] of [
    ['translation by (1234.5, −678.25)', translation(1234.5, -678.25)],
    ['rotation by 30° then translation', compose(translation(-40, 25), rotation(Math.PI / 6))],
    ['rotation by 90°', rotation(Math.PI / 2)],
  ] as const) {
    it(`${name}: shear centre moves with the section, J and Cw unchanged`, () => {
      const p = torsionProperties(transformRegion(base, T));
      const moved = applyToPoint(T, { x: ref.xs, y: ref.ys });
      const tolJ = 2 * (p.accuracy.J + ref.accuracy.J) + 1e-9;
      expect(rel(p.J, ref.J)).toBeLessThanOrEqual(Math.max(tolJ, 1e-4));
      expect(rel(p.Cw, ref.Cw)).toBeLessThanOrEqual(Math.max(2 * (p.accuracy.Cw + ref.accuracy.Cw), 1e-4));
      expect(Math.hypot(p.xs - moved.x, p.ys - moved.y) / size).toBeLessThanOrEqual(1e-5);
    });
  }

  it('the same section drawn from 1e-9 to 1e9 scale gives the same relative answers, within the stated accuracy', () => {
    // Meshing runs in a normalised frame; only rounding of the normalised coordinates differs
    // (it can break Delaunay ties differently), so answers agree to their stated accuracy.
    for (const k of [1e-9, 1e-3, 1e3, 1e9]) {
      const p = torsionProperties(transformRegion(base, scaling(k)));
      expect(rel(p.J, ref.J * k ** 4)).toBeLessThanOrEqual(2 * (p.accuracy.J + ref.accuracy.J));
      expect(rel(p.Cw, ref.Cw * k ** 6)).toBeLessThanOrEqual(2 * (p.accuracy.Cw + ref.accuracy.Cw));
      expect(Math.abs(p.xs - ref.xs * k) / (size * k)).toBeLessThanOrEqual(1e-5);
    }
  });

  it('rejects a target outside (0, 1) with a typed error', () => {
    expect(() => torsionProperties(base, { target: 0 })).toThrow(TorsionError);
    expect(() => torsionProperties(base, { target: 2 })).toThrow(/target/);
  });
});
