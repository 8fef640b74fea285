import { arc, ellipse, line, makeRegion, type Point, type Region } from '@keelson/geometry';
import { polygonRegion } from '@keelson/shapes';

/**
 * Rectangle torsion factor β in J = β·w·t³ (w ≥ t) — Timoshenko & Goodier, Theory of Elasticity,
 * 3rd ed., torsion of rectangular bars: β = ⅓[1 − (192/π⁵)(t/w) Σ_{n odd} tanh(nπw/2t)/n⁵].
 */
export function rectangleBeta(w: number, t: number): number {
  let s = 0;
  for (let n = 1; n < 400; n += 2) s += Math.tanh((n * Math.PI * w) / (2 * t)) / n ** 5;
  return (1 / 3) * (1 - (192 / Math.PI ** 5) * (t / w) * s);
}

/** Ellipse x²/a² + y²/b² = 1 as one exact elliptical arc, rotated by phi. */
export function ellipseRegion(a: number, b: number, phi = 0): Region {
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  return makeRegion([{ outer: [ellipse({ x: 0, y: 0 }, { x: a * c, y: a * s }, { x: -b * s, y: b * c }, 0, 2 * Math.PI)], holes: [] }]);
}

/** Regular n-gon inscribed in the ellipse x²/a² + y²/b² = 1 (the geometry core has no elliptical arcs yet). */
export function ellipsePolygon(a: number, b: number, n: number): Region {
  return polygonRegion(
    Array.from({ length: n }, (_, i) => ({ x: a * Math.cos((2 * Math.PI * i) / n), y: b * Math.sin((2 * Math.PI * i) / n) })),
  );
}

/** Equilateral triangle of side a, centroid at the origin. */
export function equilateral(a: number): Region {
  const h = (Math.sqrt(3) / 2) * a;
  return polygonRegion([
    { x: -a / 2, y: -h / 3 },
    { x: a / 2, y: -h / 3 },
    { x: 0, y: (2 * h) / 3 },
  ]);
}

/**
 * Thin semicircular open tube: centreline radius r about c, thickness t, the arc on the +x side
 * (from −90° to +90°), open towards −x.
 */
export function semicircularTube(r: number, t: number, c: Point = { x: 0, y: 0 }): Region {
  const ro = r + t / 2;
  const ri = r - t / 2;
  const P = (rad: number, ang: number): Point => ({ x: c.x + rad * Math.cos(ang), y: c.y + rad * Math.sin(ang) });
  return makeRegion([
    {
      outer: [
        arc(c, ro, -Math.PI / 2, Math.PI),
        line(P(ro, Math.PI / 2), P(ri, Math.PI / 2)),
        arc(c, ri, Math.PI / 2, -Math.PI),
        line(P(ri, -Math.PI / 2), P(ro, -Math.PI / 2)),
      ],
      holes: [],
    },
  ]);
}

export const rel = (a: number, b: number) => Math.abs(a / b - 1);
