import { line, type LineSegment, type Point } from '@keelson/geometry';
import type { Piece } from './stitch';
import type { EntitySource } from './source';

/** Distance from p to the segment a–b, and where along it p projects (0 at a, 1 at b). */
function toSegment(p: Point, a: Point, b: Point): { d: number; t: number; off: number } {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  const len2 = dx * dx + dy * dy;
  const t = ((p.x - a.x) * dx + (p.y - a.y) * dy) / len2;
  const u = Math.min(1, Math.max(0, t));
  const off = Math.abs((p.x - a.x) * dy - (p.y - a.y) * dx) / Math.sqrt(len2);
  return { d: Math.hypot(p.x - a.x - u * dx, p.y - a.y - u * dy), t, off };
}

export interface Merged {
  readonly pieces: Piece[];
  /** Sources of the lines that were folded into another (each cluster keeps one). */
  readonly folded: EntitySource[];
}

/**
 * Replaces straight segments that overlap along a common line by their union: a side drawn twice
 * in different pieces, or a short line lying on a long one, would otherwise leave ends in the
 * middle of another segment (under even-odd filling a doubled side cancels itself). Two lines
 * overlap when an end of one lies inside the other, farther than `tol` from its ends, and the
 * other end lies within `tol` of its line. Lines are binned in a grid, so the cost is linear in
 * the number of lines. Lines that merely meet end to end, or coincide exactly, are left to the
 * stitcher. `tick` is called between stages (the caller's time limit).
 */
export function mergeCollinear(pieces: readonly Piece[], tol: number, extent: number, tick: () => void = () => {}): Merged {
  const lines: number[] = [];
  pieces.forEach((p, i) => {
    if (p.seg.kind === 'line' && Math.hypot(p.seg.b.x - p.seg.a.x, p.seg.b.y - p.seg.a.y) > 2 * tol) lines.push(i);
  });
  if (lines.length < 2) return { pieces: [...pieces], folded: [] };
  const seg = (i: number) => pieces[i]!.seg as LineSegment;
  // Cells as large as an average line: each line is entered in the cells along it (about two a line
  // on average) and each end looks in the 3 × 3 cells around it. Sizing cells from the extent instead
  // would crowd a long column of small shapes into few cells (quadratic).
  let total = 0;
  for (const i of lines) total += lengthOf(seg(i));
  const cell = Math.min(Math.max(total / lines.length, 4 * tol), extent) || 1;
  const grid = new Map<string, number[]>();
  const key = (x: number, y: number) => `${Math.floor(x / cell)},${Math.floor(y / cell)}`;
  for (const i of lines) {
    const { a, b } = seg(i);
    const steps = Math.ceil((2 * lengthOf(seg(i))) / cell);
    let last = '';
    for (let k = 0; k <= steps; k++) {
      const k0 = key(a.x + ((b.x - a.x) * k) / steps, a.y + ((b.y - a.y) * k) / steps);
      if (k0 === last) continue;
      last = k0;
      const list = grid.get(k0);
      if (list) {
        if (list[list.length - 1] !== i) list.push(i);
      } else grid.set(k0, [i]);
    }
  }
  tick();
  const parent = new Map<number, number>();
  const find = (i: number): number => {
    let r = i;
    while (parent.has(r) && parent.get(r) !== r) r = parent.get(r)!;
    parent.set(i, r);
    return r;
  };
  const union = (i: number, j: number) => {
    const [ri, rj] = [find(i), find(j)];
    if (ri !== rj) parent.set(Math.max(ri, rj), Math.min(ri, rj));
  };
  for (const i of lines) {
    const s = seg(i);
    for (const [p, q] of [
      [s.a, s.b],
      [s.b, s.a],
    ] as const) {
      const [cx, cy] = [Math.floor(p.x / cell), Math.floor(p.y / cell)];
      for (let dx = -1; dx <= 1; dx++)
        for (let dy = -1; dy <= 1; dy++)
          for (const j of grid.get(`${cx + dx},${cy + dy}`) ?? []) {
            if (j === i) continue;
            const o = seg(j);
            const len = lengthOf(o);
            const hit = toSegment(p, o.a, o.b);
            const inside = hit.d <= tol && hit.t * len > tol && (1 - hit.t) * len > tol;
            if (inside && toSegment(q, o.a, o.b).off <= tol) union(i, j);
          }
    }
  }
  tick();
  const clusters = new Map<number, number[]>();
  for (const i of lines) {
    if (!parent.has(i)) continue;
    const root = find(i);
    const list = clusters.get(root);
    if (list) list.push(i);
    else clusters.set(root, [i]);
  }
  if (!clusters.size) return { pieces: [...pieces], folded: [] };

  const out: Piece[] = [];
  const folded: EntitySource[] = [];
  const replaced = new Set<number>();
  for (const members of clusters.values()) {
    // Along the longest member: the union runs from the end projecting lowest to the one projecting highest.
    const longest = members.reduce((m, i) => (lengthOf(seg(i)) > lengthOf(seg(m)) ? i : m));
    const { a, b } = seg(longest);
    const [dx, dy] = [b.x - a.x, b.y - a.y];
    let lo = a;
    let hi = b;
    const along = (p: Point) => (p.x - a.x) * dx + (p.y - a.y) * dy;
    for (const i of members)
      for (const p of [seg(i).a, seg(i).b]) {
        if (along(p) < along(lo)) lo = p;
        if (along(p) > along(hi)) hi = p;
      }
    members.forEach((i) => replaced.add(i));
    out.push({ seg: line(lo, hi), src: pieces[longest]!.src });
    for (const i of members) if (i !== longest) folded.push(pieces[i]!.src);
  }
  pieces.forEach((p, i) => replaced.has(i) || out.push(p));
  return { pieces: out, folded };
}

const lengthOf = (s: LineSegment) => Math.hypot(s.b.x - s.a.x, s.b.y - s.a.y);
