import { describe, expect, it } from 'vitest';
import { regionMoments, sectionProperties, type Region } from '@keelson/geometry';
import { readDrawing } from '../src';
import { ARC, CIRCLE, LINE, LWPOLYLINE, POLYLINE, dxf, rectLines, type Tag } from './dxf';

const read = (text: string, opts: Partial<Parameters<typeof readDrawing>[1]> = {}) => readDrawing(text, { file: 't.dxf', ...opts });
const area = (r: Region) => regionMoments(r).a;
const close = (a: number, b: number, rel = 1e-12) => expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.abs(b));

describe('units from $INSUNITS', () => {
  it.each([
    [1, 'in'],
    [2, 'ft'],
    [4, 'mm'],
    [5, 'cm'],
    [6, 'm'],
  ] as const)('code %i reads as %s', async (code, unit) => {
    // $INSUNITS codes — AutoCAD DXF Reference, HEADER section variables.
    const d = await read(dxf(rectLines(0, 0, 2, 1), { insunits: code }));
    expect(d.unit).toBe(unit);
  });

  it('missing or unitless asks for --drawing-units, unless given', async () => {
    await expect(read(dxf(rectLines(0, 0, 2, 1), { insunits: null }))).rejects.toMatchObject({ code: 'MISSING_UNIT', message: /--drawing-units/ });
    await expect(read(dxf(rectLines(0, 0, 2, 1), { insunits: 0 }))).rejects.toMatchObject({ code: 'MISSING_UNIT' });
    const d = await read(dxf(rectLines(0, 0, 2, 1), { insunits: null }), { drawingUnits: 'in' });
    expect(d.unit).toBe('in');
    expect(d.warnings).toEqual([]);
  });

  it('unsupported codes are refused by name; a given unit overrides them with a warning', async () => {
    await expect(read(dxf(rectLines(0, 0, 2, 1), { insunits: 3 }))).rejects.toMatchObject({ code: 'UNKNOWN_UNIT', message: /unsupported unit \$INSUNITS 3 \(miles\)/ });
    await expect(read(dxf(rectLines(0, 0, 2, 1), { insunits: 99 }))).rejects.toMatchObject({ code: 'UNKNOWN_UNIT' });
    const d = await read(dxf(rectLines(0, 0, 2, 1), { insunits: 4 }), { drawingUnits: 'in' });
    expect(d.unit).toBe('in');
    expect(d.warnings.join()).toMatch(/\$INSUNITS 4 \(mm\); read as in/);
  });
});

describe('entities', () => {
  it('LWPOLYLINE bulges are exact arcs: sweep = 4·atan(bulge)', async () => {
    // Two vertices with bulge 1 (half circles) draw a circle of diameter 10: A = πr² — common practice.
    const disc = await read(dxf([LWPOLYLINE([[0, 0, 1], [10, 0, 1]])]));
    close(area(disc.region), Math.PI * 25);
    // Slot: 20 × 10 rectangle with half-circle ends of radius 5: A = 20·10 + π·5² — common practice.
    const slot = await read(dxf([LWPOLYLINE([[0, 0], [20, 0, 1], [20, 10], [0, 10, 1]])]));
    close(area(slot.region), 200 + Math.PI * 25);
    close(sectionProperties(slot.region).cx, 10);
    // Negative bulge turns clockwise: the same half circle cut out of a 20 × 10 rectangle's side (radius 5).
    const notched = await read(dxf([LWPOLYLINE([[0, 0], [20, 0], [20, 10], [15, 10, -1], [5, 10], [0, 10]])]));
    close(area(notched.region), 200 - (Math.PI * 25) / 2);
    // Bulge tan(θ/4) with θ = 90°: quarter circle of radius 1 from (1, 0) to (0, 1), closed through the centre.
    const quarter = await read(dxf([LWPOLYLINE([[0, 0], [1, 0, Math.tan(Math.PI / 8)], [0, 1]])]));
    // Quarter circle: A = πr²/4, centroid 4r/3π from each edge — Gere, Mechanics of Materials, Appendix D.
    close(area(quarter.region), Math.PI / 4);
    close(sectionProperties(quarter.region).cx, 4 / (3 * Math.PI));
  });

  it('2D POLYLINE with VERTEX bulges reads like LWPOLYLINE; 3D ones are reported, not read', async () => {
    // Slot: 20 × 10 rectangle with half-circle ends of radius 5: A = 20·10 + π·5² — common practice.
    const slot = await read(dxf([POLYLINE([[0, 0], [20, 0, 1], [20, 10], [0, 10, 1]])]));
    close(area(slot.region), 200 + Math.PI * 25);
    // Extrusion (0, 0, −1) mirrors x here too.
    const mirrored = await read(dxf([POLYLINE([[0, 0], [20, 0, 1], [20, 10], [0, 10, 1]], 1, -1)]));
    close(sectionProperties(mirrored.region).cx, -10);
    const d = await read(dxf([...rectLines(0, 0, 1, 1), POLYLINE([[5, 5], [6, 5], [6, 6]], 8)]));
    expect(d.warnings.join()).toMatch(/ignored 1 POLYLINE \(3D polyline or mesh\)/);
  });

  it('an ARC from 350° to 10° sweeps 20°, not −340°', async () => {
    const r = 3;
    const th = (20 * Math.PI) / 180;
    const p = (deg: number): [number, number] => [r * Math.cos((deg * Math.PI) / 180), r * Math.sin((deg * Math.PI) / 180)];
    const d = await read(dxf([ARC([0, 0], r, 350, 10), LINE(p(10), p(350))]));
    // Circular segment: A = r²(θ − sin θ)/2 — common practice (sector minus triangle).
    close(area(d.region), (r * r * (th - Math.sin(th))) / 2, 1e-9);
    // Start angle 0 and end 360 draw the whole circle.
    const full = await read(dxf([ARC([1, 1], 2, 0, 360)]));
    close(area(full.region), Math.PI * 4);
  });

  it('extrusion direction (0, 0, −1) mirrors x for ARC, CIRCLE and LWPOLYLINE', async () => {
    const circle = await read(dxf([CIRCLE([5, 2], 1, -1)]));
    close(sectionProperties(circle.region).cx, -5);
    close(sectionProperties(circle.region).cy, 2);
    const rect = await read(dxf([LWPOLYLINE([[1, 0], [3, 0], [3, 1], [1, 1]], true, -1)]));
    close(sectionProperties(rect.region).cx, -2);
    // Half disc right of x = 10 in the OCS, i.e. left of x = −10 in the world: its ARC runs −90°..90° about (0,0,−1).
    const half = await read(dxf([ARC([10, 0], 2, -90, 90, -1), LINE([-10, 2], [-10, -2])]));
    const p = sectionProperties(half.region);
    // Semicircle: A = πr²/2, centroid 4r/3π from the diameter — Gere, Mechanics of Materials, Appendix D.
    close(p.A, 2 * Math.PI);
    close(p.cx, -10 - (4 * 2) / (3 * Math.PI), 1e-12);
    // Same drawing with (0, 0, 1): the half disc lies right of x = 10.
    const same = await read(dxf([ARC([10, 0], 2, -90, 90, 1), LINE([10, 2], [10, -2])]));
    close(sectionProperties(same.region).cx, 10 + (4 * 2) / (3 * Math.PI), 1e-12);
  });

  it('a tilted extrusion direction is refused, naming the entity', async () => {
    const t = dxf([[[0, 'CIRCLE'], [5, 'AB'], [8, 'Profile'], [10, 0], [20, 0], [30, 0], [40, 1], [210, 0.6], [220, 0], [230, 0.8]]]);
    await expect(read(t)).rejects.toMatchObject({ code: 'INVALID_ENTITY', message: /CIRCLE \(handle AB, layer Profile, line \d+\): not drawn in the xy-plane/ });
  });

  it('other entity types are counted in warnings by kind, paper space too', async () => {
    const solid: Tag[] = [[0, 'SOLID'], [8, '0'], [10, 0], [20, 0]];
    const text: Tag[] = [[0, 'TEXT'], [8, '0'], [10, 0], [20, 0], [1, 'hello']];
    const dim: Tag[] = [[0, 'DIMENSION'], [8, '0'], [2, '*D1']];
    const xline: Tag[] = [[0, 'XLINE'], [8, '0'], [10, 0], [20, 0], [11, 1], [21, 0]];
    const paper: Tag[] = [...LINE([0, 0], [1, 1]), [67, 1]];
    const d = await read(dxf([...rectLines(0, 0, 2, 1), solid, text, dim, solid, xline, paper]));
    expect(d.warnings).toEqual([
      'ignored annotation: 1 DIMENSION, 1 TEXT',
      'ignored construction entities: 1 XLINE',
      'not read (entity types Keelson does not read): 2 SOLID',
      'ignored 1 paper-space entity',
    ]);
    expect(d.stats).toEqual({ entities: 9, segments: 4, loops: 1 });
  });
});

describe('stitching and nesting', () => {
  it('joins lines given shuffled and reversed', async () => {
    const segs: [number, number][] = [[0, 0], [4, 0], [4, 1], [1, 1], [1, 3], [0, 3]];
    const lines = segs.map((p, i) => (i % 2 ? LINE(segs[(i + 1) % segs.length]!, p) : LINE(p, segs[(i + 1) % segs.length]!)));
    const shuffled = [lines[3]!, lines[0]!, lines[5]!, lines[1]!, lines[4]!, lines[2]!];
    const d = await read(dxf(shuffled));
    // L-shape: 4·1 + 1·2 = 6; centroid x = (4·2 + 2·0.5)/6 = 1.5 — composite areas, common practice.
    close(area(d.region), 6);
    close(sectionProperties(d.region).cx, 1.5);
  });

  it('closes gaps below the join tolerance (1e-6 of the extent) and reports larger ones as open ends with coordinates', async () => {
    const gap = 1e-7;
    const d = await read(dxf([LINE([0, 0], [100, 0]), LINE([100, gap], [100, 50]), LINE([100, 50], [0, 50]), LINE([0, 50], [0, gap])]));
    close(area(d.region), 5000, 1e-9);
    expect(d.warnings.join()).toMatch(/closed gaps between segment ends up to 1e-7 mm \(largest at \(100, 1e-7\)\)/);
    expect(d.deviation).toBe(gap);
    const open = dxf([LINE([0, 0], [100, 0]), LINE([100, 0.001], [100, 50]), LINE([100, 50], [0, 50]), LINE([0, 50], [0, 0])]);
    await expect(read(open)).rejects.toMatchObject({
      code: 'NO_CLOSED_OUTLINE',
      message: /2 open ends at \(100, 0\) on LINE .*\(100, 0\.001\) on LINE .*; open ends up to 0\.001 mm apart, the join tolerance is 0\.0001 mm/,
    });
    // A larger tolerance closes it.
    close(area((await read(open, { joinTolerance: 0.002 })).region), 5000, 1e-5);
  });

  it('open ends beside a closed loop are an open outline', async () => {
    const t = dxf([...rectLines(0, 0, 10, 10), LINE([20, 0], [30, 0])]);
    await expect(read(t)).rejects.toMatchObject({ code: 'OPEN_OUTLINE', message: /^t\.dxf: open outline: 2 open ends at \(20, 0\)/ });
  });

  it('removes duplicate and overlapping collinear lines, refuses junctions, unites crossing loops', async () => {
    const dup = await read(dxf([...rectLines(0, 0, 2, 1), LINE([2, 0], [0, 0])]));
    close(area(dup.region), 2);
    expect(dup.warnings.join()).toMatch(/removed 1 duplicate segment/);
    // Two unit squares side by side drawn as one outline plus the shared edge: three ends at (1, 0) and (1, 1).
    const t = dxf([...rectLines(0, 0, 1, 1), LINE([1, 0], [2, 0]), LINE([2, 0], [2, 1]), LINE([2, 1], [1, 1])]);
    await expect(read(t)).rejects.toMatchObject({ code: 'BRANCHING_OUTLINE', message: /more than two segment ends meet at \(1, [01]\)/ });
    // The bottom side drawn again in two pieces that overlap it: folded into one line.
    const overlap = await read(dxf([...rectLines(0, 0, 4, 1), LINE([0, 0], [2.5, 0]), LINE([4, 0], [1.5, 0])]));
    // Rectangle 4 × 1 — common practice.
    close(area(overlap.region), 4);
    expect(overlap.warnings.join()).toMatch(/merged 2 line\(s\) overlapping others along the same line/);
    // Two 2 × 2 squares overlapping by a unit square: 4 + 4 − 1 — composite areas, common practice.
    const crossing = await read(dxf([...rectLines(0, 0, 2, 2), ...rectLines(1, 1, 2, 2)]));
    close(area(crossing.region), 7);
    expect(crossing.warnings.join()).toMatch(/2 overlapping outlines united into 1 part/);
  });

  it('nests holes and islands', async () => {
    // Plate 100 × 60 with a circular hole r = 20 holding a disc r = 10, and a separate 10 × 10 square.
    const d = await read(dxf([CIRCLE([50, 30], 10), ...rectLines(0, 0, 100, 60), CIRCLE([50, 30], 20), LWPOLYLINE([[200, 0], [210, 0], [210, 10], [200, 10]])]));
    expect(d.region.parts).toHaveLength(3);
    expect(d.region.parts.map((p) => p.holes.length).sort()).toEqual([0, 0, 1]);
    // 6000 − π·20² + π·10² + 100 — composite areas, common practice.
    close(area(d.region), 6000 - 400 * Math.PI + 100 * Math.PI + 100, 1e-12);
  });

  it('the same drawing scaled from 1e-6 to 1e6 reads the same, up to scale', async () => {
    for (const k of [1e-6, 1e-3, 1, 1e3, 1e6]) {
      const d = await read(dxf([LWPOLYLINE([[0, 0], [20 * k, 0, 1], [20 * k, 10 * k], [0, 10 * k, 1]]), CIRCLE([10 * k, 5 * k], 2 * k)]));
      // Slot 200 + 25π minus the hole 4π, times k² — common practice.
      close(area(d.region), (200 + 25 * Math.PI - 4 * Math.PI) * k * k, 1e-12);
    }
  });
});
