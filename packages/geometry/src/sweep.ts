import type { Box } from './extent';

/**
 * Calls `visit(i, j)` once for every pair of boxes that overlap (within `tol`), until it returns
 * true. A sweep along one axis keeps the boxes whose extent along it is still open; it runs along
 * the axis where boxes overlap least (sum of their extents against the span), so that a column of
 * shapes is swept along y and a row along x, instead of every box of the column staying open at once
 * (quadratic: an array of 60,000 squares stacked in y took minutes swept along x).
 */
export function overlappingBoxes(boxes: readonly Box[], tol: number, visit: (i: number, j: number) => boolean | void): void {
  if (boxes.length < 2) return;
  let [x0, x1, y0, y1, sx, sy] = [Infinity, -Infinity, Infinity, -Infinity, 0, 0];
  for (const b of boxes) {
    [x0, x1, y0, y1] = [Math.min(x0, b.xmin), Math.max(x1, b.xmax), Math.min(y0, b.ymin), Math.max(y1, b.ymax)];
    sx += b.xmax - b.xmin;
    sy += b.ymax - b.ymin;
  }
  const alongY = sy * (x1 - x0) < sx * (y1 - y0);
  const lo = (b: Box) => (alongY ? b.ymin : b.xmin);
  const hi = (b: Box) => (alongY ? b.ymax : b.xmax);
  const order = boxes.map((_, i) => i).sort((a, b) => lo(boxes[a]!) - lo(boxes[b]!));
  const active: number[] = [];
  for (const i of order) {
    const e = boxes[i]!;
    for (let k = active.length - 1; k >= 0; k--) if (hi(boxes[active[k]!]!) < lo(e) - tol) active.splice(k, 1);
    for (const j of active) {
      const f = boxes[j]!;
      const apart = alongY ? f.xmax < e.xmin - tol || e.xmax < f.xmin - tol : f.ymax < e.ymin - tol || e.ymax < f.ymin - tol;
      if (!apart && visit(i, j)) return;
    }
    active.push(i);
  }
}
