import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { arc, makeRegion, sectionProperties, type Region } from '@keelson/geometry';
import { filletedPolygon } from '@keelson/shapes';
import { torsionProperties } from '../src';

/**
 * Star-shaped polygons about (5s, −2s), 3 to 14 corners at radii 0.3s … 1.3s, about half the
 * corners filleted with radii from 0 to 0.02s (down to a few millionths of the size), sometimes
 * a round hole at the centre; the size s spans six decades. Such outlines once stopped the mesh
 * generator (constrainautor giving up on nearly collinear boundary points) or sent its refinement
 * into a cascade of splits (tens of thousands of vertices, a minute per section).
 */
const outline: fc.Arbitrary<Region> = fc
  .record({
    scale: fc.double({ min: -3, max: 3, noNaN: true }).map((e) => 10 ** e),
    corners: fc.array(
      fc.record({
        jitter: fc.double({ min: 0, max: 0.3, noNaN: true }),
        radius: fc.double({ min: 0.3, max: 1.3, noNaN: true }),
        fillet: fc.oneof(fc.constant(0), fc.double({ min: 1e-6, max: 0.02, noNaN: true })),
      }),
      { minLength: 3, maxLength: 14 },
    ),
    hole: fc.boolean(),
  })
  .map(({ scale, corners, hole }) => {
    const n = corners.length;
    const c = { x: 5 * scale, y: -2 * scale };
    const outer = filletedPolygon(
      corners.map((k, i) => {
        const a = (2 * Math.PI * (i + k.jitter)) / n;
        return { x: c.x + scale * k.radius * Math.cos(a), y: c.y + scale * k.radius * Math.sin(a), r: scale * k.fillet };
      }),
    );
    return makeRegion([{ outer, holes: hole ? [[arc(c, 0.1 * scale, 0, 2 * Math.PI)]] : [] }]);
  });

describe('torsion of arbitrary filleted outlines', () => {
  it('always meshes and converges, with 0 < J ≤ Ip', () => {
    fc.assert(
      fc.property(outline, (region) => {
        const g = sectionProperties(region);
        const p = torsionProperties(region);
        expect(p.converged).toBe(true);
        expect(p.mesh.nodes).toBeLessThan(100_000);
        // J = Ip − ωᵀKω never exceeds the polar moment about the centroid, equal only for a
        // circle or a tube (Timoshenko & Goodier, Theory of Elasticity, §104).
        expect(p.J).toBeGreaterThan(0);
        expect(p.J).toBeLessThanOrEqual((g.Ix + g.Iy) * (1 + 1e-9));
      }),
      { numRuns: 40, seed: 20261202 },
    );
  });
});
