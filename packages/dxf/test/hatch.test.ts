import { describe, expect, it } from 'vitest';
import { regionMoments, sectionProperties, type Region } from '@keelson/geometry';
import { readDrawing } from '../src';
import { dxf, type Tag } from './dxf';

const read = (entities: Tag[][]) => readDrawing(dxf(entities), { file: 'h.dxf' });
const area = (r: Region) => regionMoments(r).a;
const close = (a: number, b: number, rel = 1e-12) => expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.abs(b));

/** HATCH with the given boundary paths (their pairs from group 92 on), then style, pattern type, seed points. */
const HATCH = (paths: Tag[][], style = 0): Tag[] => [
  [0, 'HATCH'], [5, 'H1'], [8, '0'], [100, 'AcDbHatch'], [10, 0], [20, 0], [30, 0], [210, 0], [220, 0], [230, 1],
  [2, 'SOLID'], [70, 1], [71, 0], [91, paths.length], ...paths.flat(), [75, style], [76, 1], [98, 1], [10, 5], [20, 5],
];
const square = (x: number, y: number, s: number, flags = 2): Tag[] => [
  [92, flags], [72, 0], [73, 1], [93, 4], [10, x], [20, y], [10, x + s], [20, y], [10, x + s], [20, y + s], [10, x], [20, y + s], [97, 0],
];

describe('HATCH boundary paths', () => {
  it('a clockwise elliptic edge, by negated angles seen from the centre: the half ellipse right of its minor axis', async () => {
    // Ellipse a = 20 (along y), b = 10 (along x): major axis (0, 20), ratio 0.5. Clockwise from the top
    // (world angle 90°, i.e. 0° from the major axis) round the right to the bottom: stored 0° to 180° negated = 0°…−180°.
    const d = await read([
      HATCH([
        [
          [92, 0], [93, 2],
          [72, 3], [10, 0], [20, 0], [11, 0], [21, 20], [40, 0.5], [50, 0], [51, 180], [73, 0],
          [72, 1], [10, 0], [20, -20], [11, 0], [21, 20],
          [97, 0],
        ],
      ]),
    ]);
    const p = sectionProperties(d.region);
    // Half ellipse: A = πab/2, centroid 4b/3π from the dividing axis — Gere, Appendix D (semicircle, scaled).
    close(p.A, (Math.PI * 20 * 10) / 2, 1e-9);
    close(p.cx, (4 * 10) / (3 * Math.PI), 1e-9);
  });

  it('a rational spline edge (weights in group 42) followed by fit data, whose count shares group 97 with the source count', async () => {
    const w = Math.SQRT1_2;
    // Quarter circle r = 10 as one rational quadratic span (weights 1, √2/2, 1), closed through the centre.
    const d = await read([
      HATCH([
        [
          [92, 0], [93, 3],
          [72, 4], [94, 2], [73, 1], [74, 0], [95, 6], [96, 3], [40, 0], [40, 0], [40, 0], [40, 1], [40, 1], [40, 1],
          [10, 10], [20, 0], [42, 1], [10, 10], [20, 10], [42, w], [10, 0], [20, 10], [42, 1],
          [97, 2], [11, 10], [21, 0], [11, 0], [21, 10], [12, 0], [22, 1], [13, -1], [23, 0],
          [72, 1], [10, 0], [20, 10], [11, 0], [21, 0],
          [72, 1], [10, 0], [20, 0], [11, 10], [21, 0],
          [97, 1], [330, '2F'],
        ],
      ]),
    ]);
    // Quarter circle: A = πr²/4 — Gere, Appendix D.
    close(area(d.region), (Math.PI * 100) / 4, 1e-9);
  });

  it('nested paths by odd parity; text-box paths left out; other styles read as normal, with warnings', async () => {
    const d = await read([HATCH([square(0, 0, 10, 3), square(2, 2, 4), square(3, 3, 1), square(7, 7, 2, 10)], 1)]);
    // 100 − 16 + 1 — composite areas, common practice; the text box (flag 8) is not a hole.
    close(area(d.region), 85);
    expect(d.warnings.join('\n')).toMatch(/1 text-box boundary path\(s\) left out/);
    expect(d.warnings.join('\n')).toMatch(/hatch style 1 read as normal/);
  });

  it('hatches are fills where a drawing has outlines: left out, with a warning', async () => {
    const outline: Tag[] = [[0, 'LWPOLYLINE'], [8, '0'], [90, 4], [70, 1], [10, 0], [20, 0], [10, 4], [20, 0], [10, 4], [20, 4], [10, 0], [20, 4]];
    const d = await read([outline, HATCH([square(0, 0, 10)])]);
    close(area(d.region), 16);
    expect(d.warnings).toContain('ignored 1 HATCH: the drawing has outlines, which the hatches fill');
  });

  it('a path cut short names the hatch, the path and the group expected', async () => {
    const cut: Tag[] = [[92, 2], [72, 0], [73, 1], [93, 4], [10, 0], [20, 0], [10, 1], [20, 0]];
    await expect(read([HATCH([cut])])).rejects.toMatchObject({
      code: 'MALFORMED',
      message: /HATCH \(handle H1, layer 0, line \d+\): boundary path 1: expected vertex x \(group 10\) at line \d+, found group 75/,
    });
  });
});
