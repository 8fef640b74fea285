import { describe, expect, it } from 'vitest';
import { arc, line, makeRegion, rotation, transformRegion, translation, type Loop, type Point } from '../src';
import { symmetries } from '../src/symmetry';

const P = (x: number, y: number): Point => ({ x, y });
const poly = (pts: Point[]): Loop => pts.map((p, i) => line(p, pts[(i + 1) % pts.length]!));

describe('symmetries', () => {
  it('finds both mirrors and the half turn of a rectangle with a centred round hole', () => {
    const r = makeRegion([{ outer: poly([P(0, 0), P(100, 0), P(100, 50), P(0, 50)]), holes: [[arc(P(50, 25), 10, 0.3, -2 * Math.PI)]] }]);
    expect(symmetries(r, P(50, 25), 1e-9).sort()).toEqual(['mirror-x', 'mirror-y', 'point']);
  });

  it('finds only the mirror of a channel and only the half turn of a Z', () => {
    const channel = makeRegion([{ outer: poly([P(0, 0), P(40, 0), P(40, 5), P(5, 5), P(5, 95), P(40, 95), P(40, 100), P(0, 100)]), holes: [] }]);
    expect(symmetries(channel, P(12, 50), 1e-9)).toEqual(['mirror-y']);
    const z = makeRegion([{ outer: poly([P(0, 0), P(40, 0), P(40, 95), P(75, 95), P(75, 100), P(35, 100), P(35, 5), P(0, 5)]), holes: [] }]);
    expect(symmetries(z, P(37.5, 50), 1e-9)).toEqual(['point']);
  });

  it('sees a rotated section as having none about the drawing axes', () => {
    const r = makeRegion([{ outer: poly([P(-50, -25), P(50, -25), P(50, 25), P(-50, 25)]), holes: [] }]);
    const turned = transformRegion(transformRegion(r, rotation(0.3)), translation(5, 5));
    expect(symmetries(turned, P(5, 5), 1e-9)).toEqual(['point']);
  });
});
