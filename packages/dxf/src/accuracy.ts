import type { PropertyKey, SectionProperties } from '@keelson/geometry';

/**
 * Relative error bounds, to first order in δ, of the exact properties of a region whose boundary
 * lies within δ of the drawn one (`Drawing.deviation`: gaps closed, curves flattened where parts
 * were united), for `segments` boundary segments.
 *
 * Moving a boundary of length P by at most δ changes ∫f dA by at most δ·P·max|f| over the moved
 * band (the band has area ≤ δP). About the centroid, with R the largest distance from it to the
 * boundary (bounded by the box's far corner) plus δ: ΔA ≤ δP, Δc ≤ δPR/A, ΔI ≤ δPR² (the centroid's
 * own shift enters I only to second order), ΔZ ≤ δP·max|y − ypna| (the plastic axis minimises Z:
 * its shift is second order too), Δ(extreme fibre) ≤ δ + Δc; a side whose ends move by δ changes
 * length by ≤ 2δ, and so does a chord against its arc while its sagitta is ≤ δ.
 * Positions are relative to the section's size, Ixy to I1, theta to 90°. The plastic axes' positions
 * get no bound (their shift depends on the section's width there). δ = 0 gives {}.
 */
export function deviationBounds(p: SectionProperties, delta: number, segments: number): Partial<Record<PropertyKey, number>> {
  if (!(delta > 0)) return {};
  const size = Math.max(p.xmax - p.xmin, p.ymax - p.ymin);
  const R = Math.hypot(Math.max(p.xmax - p.cx, p.cx - p.xmin), Math.max(p.ymax - p.cy, p.cy - p.ymin)) + delta;
  const band = delta * p.P;
  const A = band / p.A;
  const dc = (band * R) / p.A;
  const I = (v: number) => (band * R * R) / v;
  const fibre = (I0: number, d: number) => I0 + (delta + dc) / d;
  const out: Partial<Record<PropertyKey, number>> = {
    A,
    P: (2 * delta * segments) / p.P,
    cx: dc / size,
    cy: dc / size,
    xmin: delta / size,
    xmax: delta / size,
    ymin: delta / size,
    ymax: delta / size,
    Ix: I(p.Ix),
    Iy: I(p.Iy),
    Ixy: I(p.I1),
    I1: I(p.I1),
    I2: I(p.I2),
    theta: (2 * band * R * R) / (p.I1 - p.I2) / (Math.PI / 2),
    rx: (I(p.Ix) + A) / 2,
    ry: (I(p.Iy) + A) / 2,
    r1: (I(p.I1) + A) / 2,
    r2: (I(p.I2) + A) / 2,
    Sx_top: fibre(I(p.Ix), p.ymax - p.cy),
    Sx_bottom: fibre(I(p.Ix), p.cy - p.ymin),
    Sy_right: fibre(I(p.Iy), p.xmax - p.cx),
    Sy_left: fibre(I(p.Iy), p.cx - p.xmin),
    S1: fibre(I(p.I1), p.I1 / p.S1),
    S2: fibre(I(p.I2), p.I2 / p.S2),
    Zx: (band * (Math.max(p.ymax - p.ypna, p.ypna - p.ymin) + delta)) / p.Zx,
    Zy: (band * (Math.max(p.xmax - p.xpna, p.xpna - p.xmin) + delta)) / p.Zy,
  };
  out.Sx = Math.max(out.Sx_top!, out.Sx_bottom!);
  out.Sy = Math.max(out.Sy_right!, out.Sy_left!);
  for (const [k, v] of Object.entries(out)) if (!Number.isFinite(v)) delete out[k as PropertyKey];
  return out;
}
