import { GeometryError, arc, line, type Loop, type Point, type Segment } from '@keelson/geometry';

/** A polygon corner, optionally rounded by a tangent arc of radius `r`. */
export interface Corner {
  readonly x: number;
  readonly y: number;
  readonly r?: number;
}

/**
 * Closed loop through the corners, each rounded by a circular arc tangent to both sides.
 * The arc's tangent points lie r·tan(|δ|/2) from the corner, δ the signed turn there; its
 * centre lies on the inner side of the turn, so convex corners sweep with the loop and
 * re-entrant corners (root fillets) against it.
 */
export function filletedPolygon(corners: readonly Corner[]): Loop {
  const n = corners.length;
  if (n < 3) throw new GeometryError('DEGENERATE_LOOP', 'a polygon needs at least three corners');
  const entry: Point[] = [];
  const exit: Point[] = [];
  const arcs: (Segment | null)[] = [];
  for (let i = 0; i < n; i++) {
    const p = corners[(i + n - 1) % n]!;
    const v = corners[i]!;
    const q = corners[(i + 1) % n]!;
    const l1 = Math.hypot(v.x - p.x, v.y - p.y);
    const l2 = Math.hypot(q.x - v.x, q.y - v.y);
    const d1 = { x: (v.x - p.x) / l1, y: (v.y - p.y) / l1 };
    const d2 = { x: (q.x - v.x) / l2, y: (q.y - v.y) / l2 };
    const turn = Math.atan2(d1.x * d2.y - d1.y * d2.x, d1.x * d2.x + d1.y * d2.y);
    const r = v.r ?? 0;
    if (r <= 0 || turn === 0) {
      entry.push(v);
      exit.push(v);
      arcs.push(null);
      continue;
    }
    const t = r * Math.tan(Math.abs(turn) / 2);
    if (t > l1 + 1e-12 * l1 || t > l2 + 1e-12 * l2)
      throw new GeometryError('DEGENERATE_LOOP', `corner radius ${r} at (${v.x}, ${v.y}) does not fit its sides`);
    const t1 = { x: v.x - d1.x * t, y: v.y - d1.y * t };
    const side = Math.sign(turn);
    const c = { x: t1.x - d1.y * r * side, y: t1.y + d1.x * r * side };
    entry.push(t1);
    exit.push({ x: v.x + d2.x * t, y: v.y + d2.y * t });
    arcs.push(arc(c, r, Math.atan2(t1.y - c.y, t1.x - c.x), turn));
  }
  const loop: Segment[] = [];
  for (let i = 0; i < n; i++) {
    const a = arcs[i];
    if (a) loop.push(a);
    const from = exit[i]!;
    const to = entry[(i + 1) % n]!;
    if (Math.hypot(to.x - from.x, to.y - from.y) > 0) loop.push(line(from, to));
  }
  return loop;
}

/** Straight-sided polygon through the points. */
export function polygon(points: readonly Point[]): Loop {
  return filletedPolygon(points);
}
