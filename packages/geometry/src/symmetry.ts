import { TAU, evalSegment, paramRange } from './segment';
import { allLoops } from './region';
import type { Point, Region } from './types';

/** The maps under which a section can be symmetric about its centroid c. */
export type Symmetry = 'mirror-x' | 'mirror-y' | 'point';

/** Ends and middle of every boundary segment: three points that fix a line or an arc. */
function markers(region: Region): Point[] {
  const out: Point[] = [];
  for (const loop of allLoops(region))
    for (const s of loop) {
      if ((s.kind === 'arc' || s.kind === 'ellipse') && Math.abs(s.sweep) >= TAU * (1 - 1e-12)) {
        // A whole circle or ellipse starts anywhere: mark it by its centre and axis ends instead.
        const [u, v] = s.kind === 'arc' ? [{ x: s.r, y: 0 }, { x: 0, y: s.r }] : [s.u, s.v];
        for (const [a, b] of [[0, 0], [1, 0], [-1, 0], [0, 1], [0, -1]] as const)
          out.push({ x: s.c.x + a * u.x + b * v.x, y: s.c.y + a * u.y + b * v.y });
        continue;
      }
      const [t0, t1] = paramRange(s);
      for (const t of [t0, (t0 + t1) / 2, t1]) out.push(evalSegment(s, t).p);
    }
  return out;
}

/**
 * Symmetries of the drawn boundary about the centroid c, within `tol`: `mirror-x` maps x − cx to
 * −(x − cx) (symmetric about the vertical axis through c), `mirror-y` the same for y, `point` is a
 * half turn. The ends and middle of every segment must land within tol of such a point of the
 * boundary (a line or arc is fixed by those three points, so matching them matches the segments).
 * A boundary drawn with a side split differently left and right is not recognised: the finite-
 * element values then stand as computed, never a wrong claim.
 */
export function symmetries(region: Region, c: Point, tol: number): Symmetry[] {
  const pts = markers(region);
  const cell = 4 * tol;
  const grid = new Map<number, Point[]>();
  // A numeric hash of the cell (string keys cost more than the search): cells that share a key
  // only add candidates, each tested by its distance.
  const key = (i: number, j: number) => (i * 1_000_003 + j) % 2 ** 52;
  for (const p of pts) {
    const k = key(Math.floor(p.x / cell), Math.floor(p.y / cell));
    (grid.get(k) ?? grid.set(k, []).get(k)!).push(p);
  }
  const has = (q: Point) => {
    const i = Math.floor(q.x / cell);
    const j = Math.floor(q.y / cell);
    for (let di = -1; di <= 1; di++)
      for (let dj = -1; dj <= 1; dj++)
        for (const p of grid.get(key(i + di, j + dj)) ?? []) if (Math.hypot(p.x - q.x, p.y - q.y) <= tol) return true;
    return false;
  };
  const maps: [Symmetry, (p: Point) => Point][] = [
    ['mirror-x', (p) => ({ x: 2 * c.x - p.x, y: p.y })],
    ['mirror-y', (p) => ({ x: p.x, y: 2 * c.y - p.y })],
    ['point', (p) => ({ x: 2 * c.x - p.x, y: 2 * c.y - p.y })],
  ];
  return maps.filter(([, f]) => pts.every((p) => has(f(p)))).map(([name]) => name);
}
