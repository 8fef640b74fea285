import type { Point } from '@keelson/geometry';

/**
 * Moves clipped vertices back where they came from, undoing the integer rounding (≤ `grid`) that
 * clipper-lib imposed: a vertex near an input vertex becomes that vertex, bit for bit (so curved
 * runs are recognised); any other vertex has each coordinate moved to the nearest input coordinate
 * within `grid`, which makes new vertices where axis-parallel edges cross exact as well.
 */
export function snapper(inputs: readonly (readonly Point[])[], grid: number): (p: Point) => Point {
  const cell = 2 * grid;
  const buckets = new Map<string, Point[]>();
  const key = (i: number, j: number) => `${i},${j}`;
  for (const poly of inputs)
    for (const p of poly) {
      const k = key(Math.floor(p.x / cell), Math.floor(p.y / cell));
      const b = buckets.get(k);
      if (b) b.push(p);
      else buckets.set(k, [p]);
    }
  const xs = Float64Array.from(inputs.flatMap((poly) => poly.map((p) => p.x))).sort();
  const ys = Float64Array.from(inputs.flatMap((poly) => poly.map((p) => p.y))).sort();
  const near = (sorted: Float64Array, v: number) => {
    let lo = 0;
    let hi = sorted.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (sorted[mid]! < v) lo = mid + 1;
      else hi = mid;
    }
    let best = v;
    let dist = grid;
    for (const i of [lo - 1, lo]) {
      const c = sorted[i];
      if (c !== undefined && Math.abs(c - v) <= dist) {
        dist = Math.abs(c - v);
        best = c;
      }
    }
    return best;
  };
  return (p) => {
    const i = Math.floor(p.x / cell);
    const j = Math.floor(p.y / cell);
    let best: Point | null = null;
    let dist = grid * Math.SQRT2;
    for (let di = -1; di <= 1; di++)
      for (let dj = -1; dj <= 1; dj++)
        for (const q of buckets.get(key(i + di, j + dj)) ?? []) {
          const d = Math.hypot(q.x - p.x, q.y - p.y);
          if (d <= dist) {
            dist = d;
            best = q;
          }
        }
    return best ?? { x: near(xs, p.x), y: near(ys, p.y) };
  };
}
