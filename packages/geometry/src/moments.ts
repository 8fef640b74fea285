import { CompensatedSum } from './sum';
import { integrate, integrateAdaptive } from './quadrature';
import { evalSegment, pointOnArc, pointOnEllipse, smoothBreaks } from './segment';
import { isRational } from './spline';
import type { ArcSegment, EllipseSegment, Loop, Point, Region, Segment, SplineSegment } from './types';

/**
 * Area moments up to second order about a reference point o:
 * a = ∫dA, qx = ∫x dA, qy = ∫y dA, ixx = ∫x² dA, iyy = ∫y² dA, ixy = ∫xy dA, with x, y measured from o.
 * (ixx is the integral of x², i.e. the second moment about the y-axis through o.)
 */
export interface RawMoments {
  readonly a: number;
  readonly qx: number;
  readonly qy: number;
  readonly ixx: number;
  readonly iyy: number;
  readonly ixy: number;
}

type Acc = [CompensatedSum, CompensatedSum, CompensatedSum, CompensatedSum, CompensatedSum, CompensatedSum];

/**
 * Contribution of the directed edge p→q: the moments of the triangle (o, p, q), signed by its
 * orientation — Green's theorem for polygons (e.g. Steger, "On the calculation of arbitrary
 * moments of polygons", 1996).
 */
function addEdge(acc: Acc, px: number, py: number, qx: number, qy: number): void {
  const cr = px * qy - qx * py;
  acc[0].add(cr / 2);
  acc[1].add(((px + qx) * cr) / 6);
  acc[2].add(((py + qy) * cr) / 6);
  acc[3].add(((px * px + px * qx + qx * qx) * cr) / 12);
  acc[4].add(((py * py + py * qy + qy * qy) * cr) / 12);
  acc[5].add(((px * qy + 2 * px * py + 2 * qx * qy + qx * py) * cr) / 24);
}

/**
 * Moments of the circular segment between the arc and its chord, in the frame of the circle's
 * centre with u along the arc's axis of symmetry. Half-angle α ∈ (0, π]:
 * A = r²(α − sinα cosα), ∫u dA = ⅔ r³ sin³α,
 * ∫u² dA = r⁴/4 (α + sinα cosα) − r⁴ sinα cos³α / 2, ∫v² dA = r⁴/4 (α − sinα cosα) − r⁴ sin³α cosα / 6
 * (sector minus the triangle centre–chord; the signed triangle keeps the formulas valid past α = π/2).
 */
function circularSegment(r: number, alpha: number): { a: number; u: number; uu: number; vv: number } {
  const s = Math.sin(alpha);
  const c = Math.cos(alpha);
  const r2 = r * r;
  const r4 = r2 * r2;
  return {
    a: r2 * (alpha - s * c),
    u: (2 / 3) * r2 * r * s * s * s,
    uu: (r4 / 4) * (alpha + s * c) - (r4 * s * c * c * c) / 2,
    vv: (r4 / 4) * (alpha - s * c) - (r4 * s * s * s * c) / 6,
  };
}

/** An arc contributes exactly its chord (as a straight edge) plus the signed circular segment. */
function addArc(acc: Acc, s: ArcSegment, o: Point): void {
  const p = pointOnArc(s, s.start);
  const q = pointOnArc(s, s.start + s.sweep);
  addEdge(acc, p.x - o.x, p.y - o.y, q.x - o.x, q.y - o.y);
  const sign = Math.sign(s.sweep);
  const seg = circularSegment(s.r, Math.abs(s.sweep) / 2);
  const phi = s.start + s.sweep / 2;
  const cphi = Math.cos(phi);
  const sphi = Math.sin(phi);
  const cx = s.c.x - o.x;
  const cy = s.c.y - o.y;
  acc[0].add(sign * seg.a);
  acc[1].add(sign * (cx * seg.a + seg.u * cphi));
  acc[2].add(sign * (cy * seg.a + seg.u * sphi));
  acc[3].add(sign * (cx * cx * seg.a + 2 * cx * seg.u * cphi + seg.uu * cphi * cphi + seg.vv * sphi * sphi));
  acc[4].add(sign * (cy * cy * seg.a + 2 * cy * seg.u * sphi + seg.uu * sphi * sphi + seg.vv * cphi * cphi));
  acc[5].add(
    sign * (cx * cy * seg.a + cx * seg.u * sphi + cy * seg.u * cphi + (seg.uu - seg.vv) * sphi * cphi),
  );
}

/**
 * An elliptical arc is the affine image p = c + M·q (M = [u v]) of a unit-circle arc: its chord plus
 * the image of the unit circular segment, whose moments transform as ∫p dA = det M·(c·a + M·m) and
 * ∫p pᵀ dA = det M·(c cᵀ a + c (Mm)ᵀ + (Mm) cᵀ + M S Mᵀ), with a, m, S the unit segment's moments.
 */
function addEllipse(acc: Acc, s: EllipseSegment, o: Point): void {
  const p = pointOnEllipse(s, s.start);
  const q = pointOnEllipse(s, s.start + s.sweep);
  addEdge(acc, p.x - o.x, p.y - o.y, q.x - o.x, q.y - o.y);
  const seg = circularSegment(1, Math.abs(s.sweep) / 2);
  const phi = s.start + s.sweep / 2;
  const cf = Math.cos(phi);
  const sf = Math.sin(phi);
  const sxx = seg.uu * cf * cf + seg.vv * sf * sf;
  const syy = seg.uu * sf * sf + seg.vv * cf * cf;
  const sxy = (seg.uu - seg.vv) * sf * cf;
  const { u, v } = s;
  const k = Math.sign(s.sweep) * (u.x * v.y - u.y * v.x);
  // M·m with m = seg.u·(cos φ, sin φ)
  const mx = seg.u * (u.x * cf + v.x * sf);
  const my = seg.u * (u.y * cf + v.y * sf);
  // M S Mᵀ
  const xx = u.x * u.x * sxx + 2 * u.x * v.x * sxy + v.x * v.x * syy;
  const yy = u.y * u.y * sxx + 2 * u.y * v.y * sxy + v.y * v.y * syy;
  const xy = u.x * u.y * sxx + (u.x * v.y + v.x * u.y) * sxy + v.x * v.y * syy;
  const cx = s.c.x - o.x;
  const cy = s.c.y - o.y;
  acc[0].add(k * seg.a);
  acc[1].add(k * (cx * seg.a + mx));
  acc[2].add(k * (cy * seg.a + my));
  acc[3].add(k * (cx * cx * seg.a + 2 * cx * mx + xx));
  acc[4].add(k * (cy * cy * seg.a + 2 * cy * my + yy));
  acc[5].add(k * (cx * cy * seg.a + cx * my + cy * mx + xy));
}

/**
 * A spline contributes the moments of the fan from o to the curve, with κ = x·y' − y·x':
 * dA = κ/2, x dA = xκ/3, y dA = yκ/3, x² dA = x²κ/4, y² dA = y²κ/4, xy dA = xyκ/4 per unit parameter —
 * the same forms the straight-edge formulas integrate exactly. For a polynomial spline of degree
 * p ≤ 8 the integrands are polynomials of degree ≤ 4p − 1 ≤ 31 on each knot span, which the 16-point
 * Gauss–Legendre rule integrates exactly; rational or higher-degree splines are integrated
 * adaptively to 1e-14 of the contribution's natural size.
 */
function addSpline(acc: Acc, s: SplineSegment, o: Point): void {
  const f = (t: number, out: Float64Array) => {
    const { p, d } = evalSegment(s, t);
    const x = p.x - o.x;
    const y = p.y - o.y;
    const kap = x * d.y - y * d.x;
    out[0] = kap / 2;
    out[1] = (x * kap) / 3;
    out[2] = (y * kap) / 3;
    out[3] = (x * x * kap) / 4;
    out[4] = (y * y * kap) / 4;
    out[5] = (x * y * kap) / 4;
  };
  const br = smoothBreaks(s);
  const exact = !isRational(s) && s.degree <= 8;
  let L = 0;
  for (const c of s.controls) L = Math.max(L, Math.abs(c.x - o.x), Math.abs(c.y - o.y));
  const floor = [L ** 2, L ** 3, L ** 3, L ** 4, L ** 4, L ** 4];
  for (let i = 0; i + 1 < br.length; i++) {
    const r = exact ? integrate(f, br[i]!, br[i + 1]!, 6) : integrateAdaptive(f, br[i]!, br[i + 1]!, 6, floor);
    for (let k = 0; k < 6; k++) acc[k as 0]!.add(r[k]!);
  }
}

function addSegment(acc: Acc, s: Segment, o: Point): void {
  switch (s.kind) {
    case 'line':
      return addEdge(acc, s.a.x - o.x, s.a.y - o.y, s.b.x - o.x, s.b.y - o.y);
    case 'arc':
      return addArc(acc, s, o);
    case 'ellipse':
      return addEllipse(acc, s, o);
    case 'spline':
      return addSpline(acc, s, o);
  }
}

function newAcc(): Acc {
  return [
    new CompensatedSum(),
    new CompensatedSum(),
    new CompensatedSum(),
    new CompensatedSum(),
    new CompensatedSum(),
    new CompensatedSum(),
  ];
}

function result(acc: Acc): RawMoments {
  return {
    a: acc[0].value,
    qx: acc[1].value,
    qy: acc[2].value,
    ixx: acc[3].value,
    iyy: acc[4].value,
    ixy: acc[5].value,
  };
}

/** Signed moments enclosed by one loop (positive when counter-clockwise). */
export function loopMoments(loop: Loop, o: Point = { x: 0, y: 0 }): RawMoments {
  const acc = newAcc();
  for (const s of loop) addSegment(acc, s, o);
  return result(acc);
}

/** Moments of a region (holes subtracted through their clockwise orientation). */
export function regionMoments(region: Region, o: Point = { x: 0, y: 0 }): RawMoments {
  const acc = newAcc();
  for (const part of region.parts) {
    for (const s of part.outer) addSegment(acc, s, o);
    for (const h of part.holes) for (const s of h) addSegment(acc, s, o);
  }
  return result(acc);
}
