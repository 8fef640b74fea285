import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { deviationBounds, readDrawing, readProfiles, type Drawing, type ReadOptions } from '@keelson/dxf';
import { sectionProperties, type SectionProperties } from '@keelson/geometry';
import {
  ANGLE,
  ARRAY,
  CASES,
  ELLIPSE,
  GAPPY,
  HALF_ELLIPSE,
  HATCH_EDGES,
  HATCH_PLATE,
  HOLED,
  NESTED,
  PARABOLA,
  PLATE,
  QUARTER,
  SHEET,
  SPLINE_CIRCLE,
  STADIUM,
  TEE,
  renderCase,
} from '../fixtures/import/cases';

const dir = join(import.meta.dirname, '..', 'fixtures', 'import');
const text = (name: string) => readFileSync(join(dir, `${name}.dxf`), 'latin1');
const { PI } = Math;

async function read(name: string, opts: Partial<ReadOptions> = {}): Promise<{ d: Drawing; p: SectionProperties }> {
  const d = await readDrawing(text(name), { file: `${name}.dxf`, ...opts });
  return { d, p: sectionProperties(d.region) };
}

/** |actual − expected| ≤ rel × scale (scale: |expected|, or the natural size where the value is 0). */
function close(actual: number, expected: number, rel = 1e-9, scale = Math.abs(expected)) {
  expect(Math.abs(actual - expected), `${actual} vs ${expected}`).toBeLessThanOrEqual(rel * scale);
}

/** Ix, Iy, Ixy of a section whose I1 axis lies at theta: rotation of axes — Gere & Goodno, §12.8. */
function rotated(I1: number, I2: number, theta: number) {
  const [c, s] = [Math.cos(theta), Math.sin(theta)];
  return { Ix: I1 * c * c + I2 * s * s, Iy: I1 * s * s + I2 * c * c, Ixy: -(I1 - I2) * s * c };
}

function checkMoments(p: SectionProperties, want: { Ix: number; Iy: number; Ixy: number }, rel = 1e-9) {
  const scale = Math.max(p.Ix, p.Iy);
  close(p.Ix, want.Ix, rel);
  close(p.Iy, want.Iy, rel);
  close(p.Ixy, want.Ixy, rel, scale);
}

describe('import fixtures are what fixtures/import/generate.ts writes', () => {
  it('committed files match the generator byte for byte, and there are no others', () => {
    for (const c of CASES) expect(text(c.file) === renderCase(c), c.file).toBe(true);
    const files = readdirSync(dir).filter((f) => f.endsWith('.dxf'));
    expect(files.sort()).toEqual(CASES.map((c) => `${c.file}.dxf`).sort());
  });
});

describe('closed forms from the import fixtures (relative 1e-9)', () => {
  it('quarter disc whose ARC has extrusion (0, 0, −1) and an off-origin centre', async () => {
    const { r, c } = QUARTER;
    const { p, d } = await read('quarter-disc-mirrored-arc');
    // Quarter circle: A = πr²/4, centroid 4r/3π from each edge, centroidal I = (π/16 − 4/9π)r⁴,
    // product about the edges r⁴/8 — Gere, Mechanics of Materials, Appendix D. The quadrant lies
    // left of and above the centre, so the product about the edges is −r⁴/8.
    const e = (4 * r) / (3 * PI);
    const A = (PI * r * r) / 4;
    close(p.A, A);
    close(p.cx, c.x - e);
    close(p.cy, c.y + e);
    const I = (PI / 16 - 4 / (9 * PI)) * r ** 4;
    checkMoments(p, { Ix: I, Iy: I, Ixy: -(r ** 4) / 8 + A * e * e });
    expect(d.deviation).toBe(0);
  });

  it('mirrored INSERT of an unequal angle: Ixy flips sign', async () => {
    const { a, b, t, base, at } = ANGLE;
    // Angle as two rectangles: leg a × t and leg t × (b − t) — parallel-axis theorem, Gere & Goodno §12.4.
    const parts = [
      { w: a, h: t, x: a / 2, y: t / 2 },
      { w: t, h: b - t, x: t / 2, y: t + (b - t) / 2 },
    ];
    const A = parts.reduce((s, q) => s + q.w * q.h, 0);
    const cx = parts.reduce((s, q) => s + q.w * q.h * q.x, 0) / A;
    const cy = parts.reduce((s, q) => s + q.w * q.h * q.y, 0) / A;
    const Ix = parts.reduce((s, q) => s + (q.w * q.h ** 3) / 12 + q.w * q.h * (q.y - cy) ** 2, 0);
    const Iy = parts.reduce((s, q) => s + (q.h * q.w ** 3) / 12 + q.w * q.h * (q.x - cx) ** 2, 0);
    const Ixy = parts.reduce((s, q) => s + q.w * q.h * (q.x - cx) * (q.y - cy), 0);
    expect(Ixy).toBeLessThan(0);
    const { p } = await read('angle-mirrored-insert');
    close(p.A, A);
    // x' = at.x − (x − base.x), y' = at.y + (y − base.y).
    close(p.cx, at.x - (cx - base.x));
    close(p.cy, at.y + (cy - base.y));
    checkMoments(p, { Ix, Iy, Ixy: -Ixy });
  });

  it('rotated, scaled INSERT: principal values of the scaled shape, theta equal to the rotation', async () => {
    const { b, h, r, base, scale, rotationDeg, at } = PLATE;
    const [B, H, ea, eb] = [b * scale.x, h * scale.y, r * scale.x, r * scale.y];
    // Rectangle BH³/12 minus the ellipse the hole became, πab³/4 — Gere, Appendix D; Roark, Table A.1.
    const I1 = (B * H ** 3) / 12 - (PI * ea * eb ** 3) / 4;
    const I2 = (H * B ** 3) / 12 - (PI * eb * ea ** 3) / 4;
    const phi = (rotationDeg * PI) / 180;
    const { p } = await read('plate-rotated-scaled-insert');
    close(p.A, B * H - PI * ea * eb);
    close(p.I1, I1);
    close(p.I2, I2);
    close(p.theta, rotationDeg);
    // Centroid: at + R(φ)·S·(0 − base).
    const [ox, oy] = [-scale.x * base.x, -scale.y * base.y];
    close(p.cx, at.x + Math.cos(phi) * ox - Math.sin(phi) * oy, 1e-9, 200);
    close(p.cy, at.y + Math.sin(phi) * ox + Math.cos(phi) * oy, 1e-9, 200);
    checkMoments(p, rotated(I1, I2, phi));
  });

  it('nested blocks: base points, mirrored and scaled inner inserts, a rotated outer insert', async () => {
    const { w, h, r, k, dx, at } = NESTED;
    const R = k * r;
    const { p } = await read('nested-blocks');
    // Plate w × h turned 90° (h wide, w tall) with two holes of radius R at ±dx along its length:
    // rectangle and circle formulas, parallel-axis theorem — Gere, Appendix D.
    close(p.A, w * h - 2 * PI * R * R);
    close(p.cx, at.x, 1e-9, w);
    close(p.cy, at.y, 1e-9, w);
    checkMoments(p, { Ix: (h * w ** 3) / 12 - 2 * ((PI * R ** 4) / 4 + PI * R * R * dx * dx), Iy: (w * h ** 3) / 12 - 2 * ((PI * R ** 4) / 4), Ixy: 0 });
  });

  it('ELLIPSE: area, principal values, the I1 axis along the minor axis', async () => {
    const { c, a, b, angleDeg } = ELLIPSE;
    const { p } = await read('ellipse-whole');
    // A = πab; I about the major axis πab³/4, about the minor πa³b/4 — Roark, Table A.1.
    const [I1, I2] = [(PI * a ** 3 * b) / 4, (PI * a * b ** 3) / 4];
    close(p.A, PI * a * b);
    close(p.cx, c.x, 1e-9, a);
    close(p.cy, c.y, 1e-9, a);
    close(p.I1, I1);
    close(p.I2, I2);
    close(p.theta, angleDeg + 90 - 180);
    checkMoments(p, rotated(I1, I2, ((angleDeg + 90) * PI) / 180));
  });

  it('partial ELLIPSE (parameters 0…π) with extrusion (0, 0, −1): the half below the major axis', async () => {
    const { a, b } = HALF_ELLIPSE;
    const { p } = await read('ellipse-half-mirrored');
    // Semicircle scaled by b/r across its diameter: A = πab/2, centroid 4b/3π from the diameter,
    // I about the diameter πab³/8, about the axis of symmetry πa³b/8 — Gere, Appendix D.
    const A = (PI * a * b) / 2;
    const e = (4 * b) / (3 * PI);
    close(p.A, A);
    close(p.cy, -e);
    checkMoments(p, { Ix: (PI * a * b ** 3) / 8 - A * e * e, Iy: (PI * a ** 3 * b) / 8, Ixy: 0 });
  });

  it('circle drawn as a rational SPLINE: area and I to 1e-9', async () => {
    const { c, r } = SPLINE_CIRCLE;
    const { p } = await read('circle-rational-spline');
    // Circle: A = πr², I = πr⁴/4 — common practice.
    close(p.A, PI * r * r);
    close(p.cx, c.x, 1e-9, r);
    close(p.cy, c.y, 1e-9, r);
    checkMoments(p, { Ix: (PI * r ** 4) / 4, Iy: (PI * r ** 4) / 4, Ixy: 0 });
  });

  it('non-rational SPLINE: a parabolic segment', async () => {
    const { w, h } = PARABOLA;
    const { p } = await read('parabola-spline');
    // A = 2wh/3, centroid 3h/5 from the vertex — Gere, Appendix D (parabolic semisegment, doubled).
    // Over 4hx²/w² ≤ y ≤ h: Iy = ∫x²(h − 4hx²/w²)dx = hw³/30; ∫y²dA = 2h³w/7, so Ix = 2h³w/7 − A(3h/5)² = 8h³w/175.
    close(p.A, (2 * w * h) / 3);
    close(p.cy, (3 * h) / 5);
    checkMoments(p, { Ix: (8 * h ** 3 * w) / 175, Iy: (h * w ** 3) / 30, Ixy: 0 });
  });

  it('stadium of LWPOLYLINE bulges in inches', async () => {
    const { L, r } = STADIUM;
    const { p, d } = await read('stadium-bulges-inches');
    expect(d.unit).toBe('in');
    // Rectangle L × 2r and two half circles: A = 2rL + πr²; semicircle centroidal I (π/8 − 8/9π)r⁴ at
    // L/2 + 4r/3π from the centre — Gere, Appendix D.
    close(p.A, 2 * r * L + PI * r * r);
    close(p.cx, L / 2);
    close(p.cy, r);
    const semi = (PI / 8 - 8 / (9 * PI)) * r ** 4 + ((PI * r * r) / 2) * (L / 2 + (4 * r) / (3 * PI)) ** 2;
    checkMoments(p, { Ix: (L * (2 * r) ** 3) / 12 + (PI * r ** 4) / 4, Iy: (2 * r * L ** 3) / 12 + 2 * semi, Ixy: 0 });
  });

  it('two overlapping rectangles forming a T: the overlap is not counted twice', async () => {
    const { b, tf, tw, h } = TEE;
    const { p, d } = await read('t-overlapping-rectangles');
    // Flange b × tf on a stem tw × (h − tf) — composite areas, Gere & Goodno §12.4.
    const [A1, y1, A2, y2] = [b * tf, h - tf / 2, tw * (h - tf), (h - tf) / 2];
    const cy = (A1 * y1 + A2 * y2) / (A1 + A2);
    close(p.A, A1 + A2);
    close(p.cy, cy);
    checkMoments(p, { Ix: (b * tf ** 3) / 12 + A1 * (y1 - cy) ** 2 + (tw * (h - tf) ** 3) / 12 + A2 * (y2 - cy) ** 2, Iy: (tf * b ** 3) / 12 + ((h - tf) * tw ** 3) / 12, Ixy: 0 });
    expect(d.warnings.join()).toMatch(/2 overlapping outlines united into 1 part/);
    expect(d.deviation).toBe(0);
  });

  it('a rectangle of loose shuffled LINEs with 1e-5 gaps: stitched, the largest gap reported, within the stated bound', async () => {
    const { w, h, small } = GAPPY;
    const { p, d } = await read('rectangle-lines-small-gaps');
    expect(d.warnings.join()).toMatch(/closed gaps between segment ends up to 0\.00001 mm \(largest at \(\d+, \d+\)\)/);
    close(d.deviation, small, 1e-6);
    // The first-order bound covers the actual error of every property it states (rectangle bh, bh³/12 — common practice).
    const bound = deviationBounds(p, d.deviation, d.stats.segments);
    close(p.A, w * h, bound.A!);
    close(p.Ix, (w * h ** 3) / 12, bound.Ix!);
    close(p.Iy, (h * w ** 3) / 12, bound.Iy!);
    expect(bound.A!).toBeLessThan(1e-6);
  });

  it('the same with 0.8 mm gaps: refused, naming every open end', async () => {
    const { x, y, w, h } = GAPPY;
    const e = await readDrawing(text('rectangle-lines-open-gaps'), { file: 'open.dxf' }).catch((err: unknown) => err);
    expect(e).toMatchObject({ code: 'NO_CLOSED_OUTLINE', message: /8 open ends at .*open ends up to 0\.8 mm apart, the join tolerance is 0\.00012 mm/ });
    for (const corner of [`(${x}, ${y})`, `(${x + w}, ${y})`, `(${x + w}, ${y + h})`, `(${x}, ${y + h})`]) expect((e as Error).message).toContain(corner);
    // Named by the user, a tolerance above the gaps closes them.
    const { p } = await read('rectangle-lines-open-gaps', { joinTolerance: 1 });
    close(p.A, w * h, 2e-2);
  });

  it('a hole drawn on another layer (its CIRCLE mirrored through the OCS); frozen and off layers left out and reported', async () => {
    const { w, h, r, c } = HOLED;
    const { p, d } = await read('hole-on-other-layer');
    // Plate minus hole — composite areas, common practice.
    const A = w * h - PI * r * r;
    close(p.A, A);
    close(p.cx, (w * h * (w / 2) - PI * r * r * c.x) / A);
    expect(d.warnings).toContain('read layers HOLES, PROFILE; left out CONSTRUCTION (frozen, 1 entity), DIMS (off, 1 entity)');
    close((await read('hole-on-other-layer', { excludeLayers: ['hol*'] })).p.A, w * h);
    close((await read('hole-on-other-layer', { layers: ['PROFILE'] })).p.A, w * h);
    await expect(read('hole-on-other-layer', { hiddenLayers: true })).rejects.toMatchObject({ code: 'OPEN_OUTLINE' });
  });

  it('hatch-only solid: polyline path with bulges, and a clockwise arc edge on the side its negated angles say', async () => {
    const { w, h, rc, r, c } = HATCH_PLATE;
    const { p, d } = await read('hatch-rounded-plate');
    // Rounded rectangle wh − (4 − π)rc² — common practice — minus the half disc πr²/2 right of x = c.x,
    // its centroid 4r/3π from the diameter — Gere, Appendix D.
    const [plate, hole] = [w * h - (4 - PI) * rc * rc, (PI * r * r) / 2];
    close(p.A, plate - hole);
    close(p.cx, (plate * (w / 2) - hole * (c.x + (4 * r) / (3 * PI))) / (plate - hole));
    close(p.cy, h / 2);
    expect(d.warnings.join()).toMatch(/solid read from the boundaries of 1 HATCH/);
  });

  it('hatch edges: an elliptic arc given by angles, and a spline edge', async () => {
    const { a, b, toDeg, w, h } = HATCH_EDGES;
    const { p } = await read('hatch-edges');
    // Elliptic sector up to the angle θ seen from the centre: parameter t with tan t = tan θ · a/b,
    // area ab·t/2 (affine image of a circular sector, common practice); parabolic segment 2wh/3 — Gere, Appendix D.
    const theta = (toDeg * PI) / 180;
    const t = Math.atan2(Math.sin(theta), (b / a) * Math.cos(theta));
    close(p.A, (a * b * t) / 2 + (2 * w * h) / 3);
  });

  it('row/column array INSERT, rotated with its block', async () => {
    const { s, cols, rows, d: gap, at } = ARRAY;
    const { p } = await read('array-insert');
    // Squares s × s; column j, row i lands at x ∈ at.x − (i·gap + [0, s]), y ∈ at.y + j·gap + [0, s] — common practice (parallel axes).
    const squares = [];
    for (let i = 0; i < rows; i++) for (let j = 0; j < cols; j++) squares.push({ x: at.x - i * gap - s / 2, y: at.y + j * gap + s / 2 });
    const A = squares.length * s * s;
    const cx = squares.reduce((m, q) => m + q.x, 0) / squares.length;
    const cy = squares.reduce((m, q) => m + q.y, 0) / squares.length;
    close(p.A, A);
    close(p.cx, cx);
    close(p.cy, cy);
    const I0 = s ** 4 / 12;
    checkMoments(p, {
      Ix: squares.reduce((m, q) => m + I0 + s * s * (q.y - cy) ** 2, 0),
      Iy: squares.reduce((m, q) => m + I0 + s * s * (q.x - cx) ** 2, 0),
      Ixy: squares.reduce((m, q) => m + s * s * (q.x - cx) * (q.y - cy), 0),
    });
  });

  it('LWPOLYLINE with vertex identifiers (91) and a width: every vertex read, the width reported', async () => {
    const { p, d } = await read('vertex-ids-width');
    // Square 10 × 10 — common practice.
    close(p.A, 100);
    expect(d.warnings.join()).toMatch(/has a width: its centreline is used/);
  });

  it('split by blocks, layers and islands, with names', async () => {
    const { w, h, r, s } = SHEET;
    const split = async (mode: 'blocks' | 'layers' | 'islands') =>
      (await readProfiles(text('split-sheet'), { file: 'split-sheet.dxf', split: mode })).profiles.map((q) => {
        if ('error' in q) throw q.error;
        return [q.name, sectionProperties(q.region).A] as const;
      });
    // Rectangle wh, disc πr², square s² — common practice.
    const [rect, round, square] = [w * h, PI * r * r, s * s];
    const near = (got: (readonly [string, number])[], want: [string, number][]) => {
      expect(got.map((g) => g[0])).toEqual(want.map((x) => x[0]));
      got.forEach((g, i) => close(g[1], want[i]![1]));
    };
    near(await split('blocks'), [['RECT', rect], ['ROUND', round], ['RECT-2', rect], ['split-sheet', square]]);
    near(await split('layers'), [['RECTS', 2 * rect], ['ROUNDS', round], ['LOOSE', square]]);
    near(await split('islands'), [['split-sheet-1', rect], ['split-sheet-2', round], ['split-sheet-3', rect], ['split-sheet-4', square]]);
  });

  it('a SPLINE of fit points only, and binary DXF, are refused with their reason', async () => {
    await expect(read('spline-fit-points-only')).rejects.toMatchObject({ code: 'UNSUPPORTED_ENTITY', message: /defined by 4 fit points only/ });
    await expect(read('binary-sentinel')).rejects.toMatchObject({ code: 'BINARY_DXF', message: /save the drawing as ASCII DXF/ });
  });
});

describe('drawings written by another program (ezdxf 1.4.4, AutoCAD 2018 files: fixtures/import/ezdxf)', () => {
  const ezdxf = (name: string) => readFileSync(join(dir, 'ezdxf', `${name}.dxf`), 'utf8');
  /** Circular segment cut off by a chord c with bulge b: r²(θ − sin θ)/2, θ = 4·atan|b|, r = c / 2sin(θ/2) — common practice. */
  const segment = (b: number, c: number) => {
    const t = 4 * Math.atan(Math.abs(b));
    const r = c / (2 * Math.sin(t / 2));
    return (r * r * (t - Math.sin(t))) / 2;
  };

  it('nested, mirrored, rotated, unequally scaled and arrayed INSERTs; ELLIPSE and CIRCLE through (0, 0, −1)', async () => {
    const d = await readDrawing(ezdxf('blocks-r2018'), { file: 'blocks-r2018.dxf' });
    expect(d.stats.loops).toBe(17);
    // Block INNER: a 6 × 3 rectangle whose bottom bulges out (0.4) and top in (−0.3), and a circle r = 1.5.
    const inner = 18 + segment(0.4, 6) - segment(0.3, 6) + PI * 1.5 ** 2;
    // An affine map multiplies areas by |det| (common practice): OUTER at scale 1.2 holds INNER at
    // (−1.5, 0.8) and an ellipse πab with a = |(4, 1)|, b = 0.4a; INNER arrayed 3 × 2 at (0.7, −1.1);
    // loose: ellipse a = |(6, 2)|, b = a/2, and a circle r = 3.
    const A = 1.44 * (1.2 * inner + PI * 17 * 0.4) + 6 * 0.77 * inner + PI * 40 * 0.5 + PI * 9;
    close(sectionProperties(d.region).A, A);
  });

  it('HATCH with a bulged polyline path, clockwise arc and elliptic edges, and a rational spline edge', async () => {
    const d = await readDrawing(ezdxf('hatch-r2018'), { file: 'hatch-r2018.dxf' });
    // Outer 60 × 40 bulging out at the bottom (0.2) and in at the top (−0.15); hole 10 × 20 with a half
    // disc r = 5 on top and a half ellipse 5 × 3 cut from its right side (common practice).
    const outer = 2400 + segment(0.2, 60) - segment(0.15, 60);
    const hole = 200 + (PI * 25) / 2 - (PI * 5 * 3) / 2;
    // The spline path: a rational cubic Bézier (weights 1, 0.7, 1.3, 1) closed by a line; its area
    // ½∮(x dy − y dx) by composite Simpson on 20,000 steps of the curve (independent of Keelson's quadrature).
    const P = [[40, 10], [50, 5], [55, 20], [45, 30]] as const;
    const W = [1, 0.7, 1.3, 1];
    const at = (t: number) => {
      const B = [(1 - t) ** 3, 3 * t * (1 - t) ** 2, 3 * t * t * (1 - t), t ** 3].map((b, i) => b * W[i]!);
      const s = B.reduce((m, b) => m + b, 0);
      return [B.reduce((m, b, i) => m + b * P[i]![0], 0) / s, B.reduce((m, b, i) => m + b * P[i]![1], 0) / s] as const;
    };
    const n = 20_000;
    const h = 1e-7;
    let twice = 0;
    for (let i = 0; i <= n; i++) {
      const t = i / n;
      const [x, y] = at(t);
      const [xa, ya] = at(Math.max(0, t - h));
      const [xb, yb] = at(Math.min(1, t + h));
      const dt = Math.min(1, t + h) - Math.max(0, t - h);
      const f = x * ((yb - ya) / dt) - y * ((xb - xa) / dt);
      twice += f * (i === 0 || i === n ? 1 : i % 2 ? 4 : 2);
    }
    // Closing line from (45, 30) back to (40, 10): x dy − y dx over it is the cross product of its ends.
    const spline = Math.abs((twice / (3 * n) + (45 * 10 - 30 * 40)) / 2);
    close(sectionProperties(d.region).A, outer - hole - spline, 1e-8);
  });
});
