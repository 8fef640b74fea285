import { describe, it } from 'vitest';
import { arc, line, makeRegion, sectionProperties, type Loop, type Point } from '../src';
import { expectClose } from './close';

const P = (x: number, y: number): Point => ({ x, y });
const poly = (pts: Point[]): Loop => pts.map((p, i) => line(p, pts[(i + 1) % pts.length]!));
const rect = (x0: number, y0: number, w: number, h: number): Loop =>
  poly([P(x0, y0), P(x0 + w, y0), P(x0 + w, y0 + h), P(x0, y0 + h)]);
const solid = (outer: Loop, holes: Loop[] = []) => sectionProperties(makeRegion([{ outer, holes }]));

describe('exact closed forms (relative error ≤ 1e-9)', () => {
  it('rectangle offset from the origin', () => {
    const b = 40;
    const h = 10;
    const p = solid(rect(1234.5, -678.25, b, h));
    // Rectangle: A = bh, Ix = bh³/12, Iy = hb³/12 about centroidal axes — Gere & Goodno, Mechanics of Materials, Appendix D, case 1.
    expectClose(p.A, b * h);
    expectClose(p.cx, 1234.5 + b / 2);
    expectClose(p.cy, -678.25 + h / 2);
    expectClose(p.Ix, (b * h ** 3) / 12);
    expectClose(p.Iy, (h * b ** 3) / 12);
    expectClose(p.Ixy, 0, 1e-9, (b * h) ** 2);
    // Elastic modulus bh²/6 and plastic modulus bh²/4 — Gere & Goodno, §5.6 and plastic bending.
    expectClose(p.Sx, (b * h ** 2) / 6);
    expectClose(p.Sy, (h * b ** 2) / 6);
    expectClose(p.Zx, (b * h ** 2) / 4);
    expectClose(p.Zy, (h * b ** 2) / 4);
    expectClose(p.ypna, -678.25 + h / 2);
    expectClose(p.P, 2 * (b + h));
    expectClose(p.I1, (h * b ** 3) / 12);
    expectClose(p.theta, 90);
  });

  it('solid circle', () => {
    const r = 12.5;
    const d = 2 * r;
    const p = solid([arc(P(-300, 45), r, 0.7, 2 * Math.PI)]);
    // Circle: A = πr², I = πr⁴/4 — Gere & Goodno, Appendix D, case 9; S = πd³/32; Z = d³/6 — Gere & Goodno, plastic bending.
    expectClose(p.A, Math.PI * r * r);
    expectClose(p.cx, -300);
    expectClose(p.cy, 45);
    expectClose(p.Ix, (Math.PI * r ** 4) / 4);
    expectClose(p.Iy, (Math.PI * r ** 4) / 4);
    expectClose(p.Ixy, 0, 1e-9, r ** 4);
    expectClose(p.Sx, (Math.PI * d ** 3) / 32);
    expectClose(p.Zx, d ** 3 / 6);
    expectClose(p.Zy, d ** 3 / 6);
    expectClose(p.P, Math.PI * d);
  });

  it('circular tube', () => {
    const D = 48.3;
    const t = 3;
    const d = D - 2 * t;
    const c = P(10, 20);
    const p = solid([arc(c, D / 2, 0, 2 * Math.PI)], [[arc(c, d / 2, 1, -2 * Math.PI)]]);
    // Tube: A = π(D²−d²)/4, I = π(D⁴−d⁴)/64, Z = (D³−d³)/6 — Gere & Goodno, Appendix D and plastic bending.
    expectClose(p.A, (Math.PI * (D * D - d * d)) / 4);
    expectClose(p.Ix, (Math.PI * (D ** 4 - d ** 4)) / 64);
    expectClose(p.Iy, (Math.PI * (D ** 4 - d ** 4)) / 64);
    expectClose(p.Sx, (Math.PI * (D ** 4 - d ** 4)) / 32 / D);
    expectClose(p.Zx, (D ** 3 - d ** 3) / 6);
    expectClose(p.Zy, (D ** 3 - d ** 3) / 6);
  });

  it('semicircle', () => {
    const r = 7;
    const x0 = 50;
    const y0 = -20;
    // Upper half-disc on the diameter from (x0 − r, y0) to (x0 + r, y0).
    const p = solid([arc(P(x0, y0), r, 0, Math.PI), line(P(x0 - r, y0), P(x0 + r, y0))]);
    // Semicircle: A = πr²/2, ȳ = 4r/3π from the diameter, I about the diameter πr⁴/8,
    // centroidal Ix = (π/8 − 8/9π) r⁴, Iy = πr⁴/8 — Gere & Goodno, Appendix D, case 10.
    expectClose(p.A, (Math.PI * r * r) / 2);
    expectClose(p.cy - y0, (4 * r) / (3 * Math.PI));
    expectClose(p.cx, x0);
    expectClose(p.Ix, (Math.PI / 8 - 8 / (9 * Math.PI)) * r ** 4);
    expectClose(p.Ix + p.A * (p.cy - y0) ** 2, (Math.PI * r ** 4) / 8);
    expectClose(p.Iy, (Math.PI * r ** 4) / 8);
    expectClose(p.Ixy, 0, 1e-9, r ** 4);
  });

  it('quarter circle', () => {
    const r = 3;
    const x0 = -4;
    const y0 = 9;
    const p = solid([line(P(x0, y0), P(x0 + r, y0)), arc(P(x0, y0), r, 0, Math.PI / 2), line(P(x0, y0 + r), P(x0, y0))]);
    // Quarter circle: A = πr²/4, centroid 4r/3π from each edge, I about each edge πr⁴/16,
    // product about the edges r⁴/8, centroidal I = (π/16 − 4/9π) r⁴ — Gere & Goodno, Appendix D, case 12.
    const e = (4 * r) / (3 * Math.PI);
    const A = (Math.PI * r * r) / 4;
    expectClose(p.A, A);
    expectClose(p.cx - x0, e);
    expectClose(p.cy - y0, e);
    expectClose(p.Ix, (Math.PI / 16 - 4 / (9 * Math.PI)) * r ** 4);
    expectClose(p.Iy, (Math.PI / 16 - 4 / (9 * Math.PI)) * r ** 4);
    expectClose(p.Ix + A * e * e, (Math.PI * r ** 4) / 16);
    expectClose(p.Ixy + A * e * e, r ** 4 / 8);
    // Centroidal product by the parallel-axis theorem from the edge value — Gere & Goodno, §12.7.
    expectClose(p.Ixy, r ** 4 / 8 - A * e * e);
  });

  it('equilateral triangle', () => {
    const a = 30;
    const h = (Math.sqrt(3) / 2) * a;
    const p = solid(poly([P(100, 100), P(100 + a, 100), P(100 + a / 2, 100 + h)]));
    // Triangle: A = bh/2, centroid h/3 above the base, Ix = bh³/36 — Gere & Goodno, Appendix D, case 4;
    // for the equilateral triangle Ix = Iy = √3 a⁴/96 (same source, b = a, h = √3a/2).
    expectClose(p.A, (Math.sqrt(3) / 4) * a * a);
    expectClose(p.cy - 100, h / 3);
    expectClose(p.Ix, (a * h ** 3) / 36);
    expectClose(p.Ix, (Math.sqrt(3) * a ** 4) / 96);
    expectClose(p.Iy, (Math.sqrt(3) * a ** 4) / 96);
    expectClose(p.Ixy, 0, 1e-9, a ** 4);
  });

  it('I-section from plates', () => {
    const h = 300;
    const b = 150;
    const tw = 7.1;
    const tf = 10.7;
    const hw = h - 2 * tf;
    const x = b / 2;
    const w = tw / 2;
    const y = h / 2;
    const yi = y - tf;
    const p = solid(
      poly([
        P(-x, -y), P(x, -y), P(x, -yi), P(w, -yi), P(w, yi), P(x, yi),
        P(x, y), P(-x, y), P(-x, yi), P(-w, yi), P(-w, -yi), P(-x, -yi),
      ]),
    );
    // Plates: A = 2b·tf + hw·tw; Ix = [bh³ − (b − tw)hw³]/12; Iy = 2tf·b³/12 + hw·tw³/12 — Gere & Goodno, Appendix D by composition.
    expectClose(p.A, 2 * b * tf + hw * tw);
    expectClose(p.Ix, (b * h ** 3 - (b - tw) * hw ** 3) / 12);
    expectClose(p.Iy, (2 * tf * b ** 3) / 12 + (hw * tw ** 3) / 12);
    // Doubly symmetric I: Zx = b·tf(h − tf) + tw·hw²/4, Zy = tf·b²/2 + hw·tw²/4 — Gere & Goodno, plastic bending.
    expectClose(p.Zx, b * tf * (h - tf) + (tw * hw ** 2) / 4);
    expectClose(p.Zy, (tf * b ** 2) / 2 + (hw * tw ** 2) / 4);
    expectClose(p.Sx, (b * h ** 3 - (b - tw) * hw ** 3) / 12 / y);
  });

  it('unequal angle with sharp corners', () => {
    const a = 100; // horizontal leg
    const b = 60; // vertical leg
    const t = 8;
    const p = solid(poly([P(0, 0), P(a, 0), P(a, t), P(t, t), P(t, b), P(0, b)]));
    // Decomposition into rectangles with the parallel-axis theorem — Gere & Goodno, §12.4 and §12.7:
    // R1 = a × t at (a/2, t/2), R2 = t × (b − t) at (t/2, t + (b − t)/2).
    const r1 = { A: a * t, x: a / 2, y: t / 2, Ix: (a * t ** 3) / 12, Iy: (t * a ** 3) / 12 };
    const r2 = { A: t * (b - t), x: t / 2, y: t + (b - t) / 2, Ix: (t * (b - t) ** 3) / 12, Iy: ((b - t) * t ** 3) / 12 };
    const A = r1.A + r2.A;
    const cx = (r1.A * r1.x + r2.A * r2.x) / A;
    const cy = (r1.A * r1.y + r2.A * r2.y) / A;
    const Ix = r1.Ix + r1.A * (r1.y - cy) ** 2 + r2.Ix + r2.A * (r2.y - cy) ** 2;
    const Iy = r1.Iy + r1.A * (r1.x - cx) ** 2 + r2.Iy + r2.A * (r2.x - cx) ** 2;
    const Ixy = r1.A * (r1.x - cx) * (r1.y - cy) + r2.A * (r2.x - cx) * (r2.y - cy);
    // Principal values I1,2 = (Ix + Iy)/2 ± √(((Ix − Iy)/2)² + Ixy²), tan 2θ = −2Ixy/(Ix − Iy) — Gere & Goodno, §12.8.
    const I1 = (Ix + Iy) / 2 + Math.hypot((Ix - Iy) / 2, Ixy);
    const I2 = (Ix + Iy) / 2 - Math.hypot((Ix - Iy) / 2, Ixy);
    expectClose(p.A, A);
    expectClose(p.cx, cx);
    expectClose(p.cy, cy);
    expectClose(p.Ix, Ix);
    expectClose(p.Iy, Iy);
    expectClose(p.Ixy, Ixy);
    expectClose(p.I1, I1);
    expectClose(p.I2, I2);
    expectClose(p.theta, (Math.atan2(-2 * Ixy, Ix - Iy) / 2) * (180 / Math.PI));
    if (!(p.Ixy < 0)) throw new Error('an angle with legs along +x and +y has a negative product of inertia');
  });

  it('rectangle with a rectangular hole', () => {
    const B = 80;
    const H = 50;
    const bh = 30;
    const hh = 20;
    // Hole off centre: lower-left corner at (10, 12).
    const p = solid(rect(0, 0, B, H), [rect(10, 12, bh, hh)]);
    // Composite area with the parallel-axis theorem — Gere & Goodno, §12.4.
    const A = B * H - bh * hh;
    const cx = (B * H * (B / 2) - bh * hh * (10 + bh / 2)) / A;
    const cy = (B * H * (H / 2) - bh * hh * (12 + hh / 2)) / A;
    const Ix = (B * H ** 3) / 12 + B * H * (H / 2 - cy) ** 2 - ((bh * hh ** 3) / 12 + bh * hh * (12 + hh / 2 - cy) ** 2);
    const Iy = (H * B ** 3) / 12 + B * H * (B / 2 - cx) ** 2 - ((hh * bh ** 3) / 12 + bh * hh * (10 + bh / 2 - cx) ** 2);
    const Ixy = B * H * (B / 2 - cx) * (H / 2 - cy) - bh * hh * (10 + bh / 2 - cx) * (12 + hh / 2 - cy);
    expectClose(p.A, A);
    expectClose(p.cx, cx);
    expectClose(p.cy, cy);
    expectClose(p.Ix, Ix);
    expectClose(p.Iy, Iy);
    expectClose(p.Ixy, Ixy);
    expectClose(p.P, 2 * (B + H) + 2 * (bh + hh));
    // Concentric hole: Ix = (BH³ − bh³)/12, Z = (BH² − bh²)/4 — Gere & Goodno, Appendix D and plastic bending.
    const q = solid(rect(0, 0, B, H), [rect((B - bh) / 2, (H - hh) / 2, bh, hh)]);
    expectClose(q.Ix, (B * H ** 3 - bh * hh ** 3) / 12);
    expectClose(q.Zx, (B * H ** 2 - bh * hh ** 2) / 4);
    expectClose(q.Zy, (H * B ** 2 - hh * bh ** 2) / 4);
  });
});
