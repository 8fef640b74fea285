import { GeometryError } from './errors';
import { regionBox, regionRange } from './extent';
import { regionMoments } from './moments';
import { plasticAboutHorizontal } from './plastic';
import { perimeter } from './region';
import { transformSegment } from './segment';
import type { Region } from './types';

/**
 * The exact geometric property set of a region, lengths in the region's own unit.
 * Conventions: x to the right, y up; Ix = ∫(y−cy)² dA, Iy = ∫(x−cx)² dA, Ixy = ∫(x−cx)(y−cy) dA;
 * theta is the angle of the I1 axis from +x, counter-clockwise, in degrees within (−90, 90].
 */
export interface SectionProperties {
  A: number;
  P: number;
  cx: number;
  cy: number;
  xmin: number;
  xmax: number;
  ymin: number;
  ymax: number;
  Ix: number;
  Iy: number;
  Ixy: number;
  I1: number;
  I2: number;
  theta: number;
  rx: number;
  ry: number;
  r1: number;
  r2: number;
  Sx_top: number;
  Sx_bottom: number;
  Sx: number;
  Sy_right: number;
  Sy_left: number;
  Sy: number;
  S1: number;
  S2: number;
  Zx: number;
  Zy: number;
  ypna: number;
  xpna: number;
}

export type PropertyKey = keyof SectionProperties;

/** Quarter turn clockwise (x, y) → (y, −x), exact in floating point. */
const QUARTER_TURN = { a: 0, b: 1, c: -1, d: 0, tx: 0, ty: 0 };

export function sectionProperties(region: Region): SectionProperties {
  const box = regionBox(region);
  // Integrate about the box centre: keeps the sums well conditioned for drawings far from the origin.
  const o = { x: (box.xmin + box.xmax) / 2, y: (box.ymin + box.ymax) / 2 };
  const m = regionMoments(region, o);
  if (!(m.a > 0)) throw new GeometryError('EMPTY_REGION', `region has no positive area (A = ${m.a})`);
  const ex = m.qx / m.a;
  const ey = m.qy / m.a;
  const cx = o.x + ex;
  const cy = o.y + ey;
  // Parallel-axis theorem, from the box centre to the centroid.
  const Iy = m.ixx - m.a * ex * ex;
  const Ix = m.iyy - m.a * ey * ey;
  const Ixy = m.ixy - m.a * ex * ey;
  const mean = (Ix + Iy) / 2;
  const rad = Math.hypot((Ix - Iy) / 2, Ixy);
  const I1 = mean + rad;
  const I2 = mean - rad;
  // tan 2θ = −2Ixy / (Ix − Iy) at the axis of the largest second moment.
  // Below the stated accuracy the section is isotropic (circle, square): every axis is principal.
  let thetaRad = rad <= 1e-12 * mean ? 0 : Math.atan2(-2 * Ixy, Ix - Iy) / 2;
  if (thetaRad <= -Math.PI / 2) thetaRad += Math.PI; // atan2(−0, ·) = −π: keep θ in (−90°, 90°]
  const c = { x: cx, y: cy };

  const [ylo, yhi] = regionRange(region, 0, 1, c);
  const [xlo, xhi] = regionRange(region, 1, 0, c);
  // Distance from the I1 axis runs along its normal (−sinθ, cosθ); from the I2 axis along (cosθ, sinθ).
  const [n1lo, n1hi] = regionRange(region, -Math.sin(thetaRad), Math.cos(thetaRad), c);
  const [n2lo, n2hi] = regionRange(region, Math.cos(thetaRad), Math.sin(thetaRad), c);

  const px = plasticAboutHorizontal(region, c, m.a);
  // A rotation keeps every loop valid and oriented: map the segments without re-checking them.
  const turn = { ...QUARTER_TURN, tx: -cy, ty: cx };
  const turned = {
    parts: region.parts.map((p) => ({
      outer: p.outer.map((s) => transformSegment(turn, s)),
      holes: p.holes.map((h) => h.map((s) => transformSegment(turn, s))),
    })),
  };
  const py = plasticAboutHorizontal(turned, { x: 0, y: 0 }, m.a);
  const Sx_top = Ix / yhi;
  const Sx_bottom = Ix / -ylo;
  const Sy_right = Iy / xhi;
  const Sy_left = Iy / -xlo;
  return {
    A: m.a,
    P: perimeter(region),
    cx,
    cy,
    xmin: box.xmin,
    xmax: box.xmax,
    ymin: box.ymin,
    ymax: box.ymax,
    Ix,
    Iy,
    Ixy,
    I1,
    I2,
    theta: (thetaRad * 180) / Math.PI,
    rx: Math.sqrt(Ix / m.a),
    ry: Math.sqrt(Iy / m.a),
    r1: Math.sqrt(I1 / m.a),
    r2: Math.sqrt(Math.max(I2, 0) / m.a),
    Sx_top,
    Sx_bottom,
    Sx: Math.min(Sx_top, Sx_bottom),
    Sy_right,
    Sy_left,
    Sy: Math.min(Sy_right, Sy_left),
    S1: I1 / Math.max(n1hi, -n1lo),
    S2: I2 / Math.max(n2hi, -n2lo),
    Zx: px.Z,
    Zy: py.Z,
    ypna: cy + px.c,
    xpna: cx - py.c,
  };
}
