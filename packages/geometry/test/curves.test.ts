import { describe, expect, it } from 'vitest';
import {
  arc,
  ellipse,
  findCrossing,
  line,
  makeRegion,
  nestLoops,
  perimeter,
  sectionProperties,
  transformRegion,
  type Point,
  type SplineSegment,
} from '../src';
import { expectClose } from './close';

const P = (x: number, y: number): Point => ({ x, y });
const solid = (outer: Parameters<typeof makeRegion>[0][number]['outer'], holes: typeof outer[] = []) =>
  sectionProperties(makeRegion([{ outer, holes }]));

/** Gauss–Kummer series for the perimeter of an ellipse: π(a+b) Σ C(½, n)² hⁿ, h = ((a−b)/(a+b))² — from memory. */
function ellipsePerimeter(a: number, b: number): number {
  const h = ((a - b) / (a + b)) ** 2;
  let sum = 0;
  let c = 1;
  for (let n = 0; n < 60; n++) {
    sum += c * c * h ** n;
    c *= (0.5 - n) / (n + 1);
  }
  return Math.PI * (a + b) * sum;
}

describe('elliptical arcs, exact', () => {
  const a = 30;
  const b = 12;
  it('full ellipse with axes along x and y', () => {
    const p = solid([ellipse(P(5, -7), P(a, 0), P(0, b), 0, 2 * Math.PI)]);
    // Ellipse: A = πab, Ix = πab³/4, Iy = πa³b/4 — Gere & Goodno, Mechanics of Materials, Appendix D, case 16.
    expectClose(p.A, Math.PI * a * b);
    expectClose(p.cx, 5);
    expectClose(p.cy, -7);
    expectClose(p.Ix, (Math.PI * a * b ** 3) / 4);
    expectClose(p.Iy, (Math.PI * a ** 3 * b) / 4);
    expectClose(p.Ixy, 0, 1e-9, a * a * b * b);
    expectClose(p.Sx, (Math.PI * a * b ** 2) / 4);
    // Z = twice the first moment of the half ellipse: 2·(πab/2)(4b/3π) = 4ab²/3 (semi-ellipse centroid
    // 4b/3π, the affine image of the semicircle's — Gere & Goodno, Appendix D, case 10).
    expectClose(p.Zx, (4 * a * b * b) / 3);
    expectClose(p.Zy, (4 * a * a * b) / 3);
    expectClose(p.P, ellipsePerimeter(a, b), 1e-12);
  });

  it('rotated ellipse: principal values and theta', () => {
    const phi = 0.4;
    const u = P(a * Math.cos(phi), a * Math.sin(phi));
    const v = P(-b * Math.sin(phi), b * Math.cos(phi));
    const p = solid([ellipse(P(100, 200), u, v, 1, 2 * Math.PI)]);
    // Same source as above: principal values πa³b/4 and πab³/4; the larger is about the minor axis, at φ + 90°.
    expectClose(p.I1, (Math.PI * a ** 3 * b) / 4);
    expectClose(p.I2, (Math.PI * a * b ** 3) / 4);
    expectClose(p.theta, (phi * 180) / Math.PI + 90 - 180);
    // Extreme fibre of a rotated ellipse: √(a² sin²φ + b² cos²φ) from the centroid along y — from memory.
    expectClose(p.ymax - 200, Math.sqrt(a * a * Math.sin(phi) ** 2 + b * b * Math.cos(phi) ** 2));
  });

  it('half ellipse closed by its major axis, drawn clockwise', () => {
    const p = solid([line(P(-a, 0), P(a, 0)), ellipse(P(0, 0), P(a, 0), P(0, -b), 0, -Math.PI)].reverse());
    // Semi-ellipse: A = πab/2, centroid 4b/3π from the axis — affine image of Gere & Goodno, Appendix D, case 10.
    expectClose(p.A, (Math.PI * a * b) / 2);
    expectClose(p.cy, (4 * b) / (3 * Math.PI));
    expectClose(p.Iy, (Math.PI * a ** 3 * b) / 8);
    expectClose(p.Ix + p.A * p.cy ** 2, (Math.PI * a * b ** 3) / 8);
  });

  it('a circle inserted with unequal scales becomes an exact ellipse', () => {
    const r = 10;
    const disc = makeRegion([{ outer: [arc(P(3, 4), r, 0.5, 2 * Math.PI)], holes: [] }]);
    const p = sectionProperties(transformRegion(disc, { a: 2, b: 0, c: 0, d: -0.5, tx: 0, ty: 0 }));
    // Image is the ellipse a = 2r, b = r/2: Gere & Goodno, Appendix D, case 16.
    expectClose(p.A, Math.PI * 2 * r * 0.5 * r);
    expectClose(p.Ix, (Math.PI * 2 * r * (0.5 * r) ** 3) / 4);
    expectClose(p.Iy, (Math.PI * (2 * r) ** 3 * 0.5 * r) / 4);
    expectClose(p.cx, 6);
    expectClose(p.cy, -2);
  });

  it('ellipse holes nest and cross-check', () => {
    const outer = [arc(P(0, 0), 50, 0, 2 * Math.PI)];
    const hole = [ellipse(P(0, 0), P(20, 0), P(0, 10), 0, 2 * Math.PI)];
    const region = nestLoops([hole, outer]);
    expect(region.parts[0]!.holes).toHaveLength(1);
    expect(findCrossing(region, 1e-9)).toBeNull();
    expect(findCrossing(makeRegion([{ outer, holes: [[ellipse(P(40, 0), P(20, 0), P(0, 10), 0, 2 * Math.PI)]] }]), 1e-9)).not.toBeNull();
    // Area of a disc with an elliptical hole: π(R² − ab) — Gere & Goodno, Appendix D, cases 9 and 16.
    expectClose(sectionProperties(region).A, Math.PI * (2500 - 200));
  });
});

describe('splines', () => {
  it('a circle as a rational quadratic NURBS reproduces the exact disc', () => {
    const r = 7;
    const w = Math.SQRT1_2;
    const pts = [P(r, 0), P(r, r), P(0, r), P(-r, r), P(-r, 0), P(-r, -r), P(0, -r), P(r, -r), P(r, 0)];
    const spline: SplineSegment = {
      kind: 'spline',
      degree: 2,
      knots: [0, 0, 0, 0.25, 0.25, 0.5, 0.5, 0.75, 0.75, 1, 1, 1],
      controls: pts.map((p, i) => ({ x: p.x + 20, y: p.y - 5, w: i % 2 ? w : 1 })),
    };
    // Nine-point rational quadratic circle — Piegl & Tiller, The NURBS Book, §7.5; disc values
    // A = πr², I = πr⁴/4, Z = d³/6 — Gere & Goodno, Appendix D, case 9, and plastic bending.
    const p = solid([spline]);
    expectClose(p.A, Math.PI * r * r);
    expectClose(p.cx, 20);
    expectClose(p.cy, -5);
    expectClose(p.Ix, (Math.PI * r ** 4) / 4);
    expectClose(p.Iy, (Math.PI * r ** 4) / 4);
    expectClose(p.Zx, (8 * r ** 3) / 6);
    expectClose(p.ymax, -5 + r);
    expectClose(p.P, 2 * Math.PI * r);
    expectClose(perimeter(makeRegion([{ outer: [spline], holes: [] }])), 2 * Math.PI * r);
  });

  it('a parabolic segment as a quadratic Bézier closed by its chord', () => {
    const b = 4;
    const h = 3;
    // y = h(1 − x²/b²) from (−b, 0) through control (0, 2h) to (b, 0).
    const spline: SplineSegment = {
      kind: 'spline',
      degree: 2,
      knots: [0, 0, 0, 1, 1, 1],
      controls: [{ x: -b, y: 0, w: 1 }, { x: 0, y: 2 * h, w: 1 }, { x: b, y: 0, w: 1 }],
    };
    const p = solid([line(P(b, 0), P(-b, 0)), spline].reverse().reverse());
    // Parabolic semisegment: A = 2bh/3, ȳ = 2h/5 — Gere & Goodno, Appendix D, case 17; two of them side by side.
    expectClose(p.A, (4 * b * h) / 3);
    expectClose(p.cy, (2 * h) / 5);
    // Iy = 2∫₀ᵇ x²·h(1 − x²/b²) dx = 4hb³/15 (elementary integration of the same curve).
    expectClose(p.Iy, (4 * h * b ** 3) / 15);
    expectClose(p.ymax, h);
  });
});
