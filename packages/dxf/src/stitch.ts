import { endPoint, evalSegment, line, paramRange, reverseSegment, segmentRange, startPoint, type Loop, type Point, type Segment } from '@keelson/geometry';
import type { EntitySource } from './source';

/** A segment in world x, y and the entity it came from. */
export interface Piece {
  readonly seg: Segment;
  readonly src: EntitySource;
}

/** Why stitching failed, with the places to look at; read.ts turns it into a DxfError. */
export interface StitchFault {
  readonly kind: 'none' | 'open' | 'branching';
  /** Loops that did close (0: the drawing has no closed outline at all). */
  readonly closed: number;
  /** Open ends (kind 'open') or junctions (kind 'branching'): where, and which entities end there. */
  readonly at: readonly { p: Point; srcs: EntitySource[] }[];
}

export interface Stitched {
  readonly loops: Loop[];
  /** Largest distance an end was moved to meet another (drawing units), and where. */
  readonly largestGap: number;
  readonly largestGapAt: Point | null;
  /** Segments dropped because they coincide with another one. */
  readonly duplicates: EntitySource[];
  /** Segments dropped because both their ends fall on one point. */
  readonly degenerate: number;
  readonly fault: StitchFault | null;
}

/** Size of the drawing: the larger side of the box holding every segment (arcs exactly). */
export function extentOf(pieces: readonly Piece[]): number {
  let [x0, x1, y0, y1] = [Infinity, -Infinity, Infinity, -Infinity];
  const o = { x: 0, y: 0 };
  for (const { seg } of pieces) {
    const [a, b] = segmentRange(seg, 1, 0, o);
    const [c, d] = segmentRange(seg, 0, 1, o);
    [x0, x1, y0, y1] = [Math.min(x0, a), Math.max(x1, b), Math.min(y0, c), Math.max(y1, d)];
  }
  return pieces.length ? Math.max(x1 - x0, y1 - y0) : 0;
}

class UnionFind {
  private readonly up: number[];
  constructor(n: number) {
    this.up = Array.from({ length: n }, (_, i) => i);
  }
  find(i: number): number {
    while (this.up[i] !== i) i = this.up[i] = this.up[this.up[i]!]!;
    return i;
  }
  union(a: number, b: number): void {
    const [ra, rb] = [this.find(a), this.find(b)];
    if (ra !== rb) this.up[Math.max(ra, rb)] = Math.min(ra, rb);
  }
}

const dist = (p: Point, q: Point) => Math.hypot(p.x - q.x, p.y - q.y);

function sizeOf(seg: Segment): number {
  const o = { x: 0, y: 0 };
  const [a, b] = segmentRange(seg, 1, 0, o);
  const [c, d] = segmentRange(seg, 0, 1, o);
  return Math.max(b - a, d - c);
}

/**
 * Groups end points closer than tol (chains of such points merge). Points are binned in a grid of
 * cell tol, so only the 3 × 3 cells around a point are searched: linear for ordinary drawings.
 * Cells are numbered row by row over the points' box (no string keys: this runs for every end of
 * every drawing), unless the grid would be too fine to number exactly.
 */
function clusterEnds(ends: readonly Point[], tol: number): number[] {
  const uf = new UnionFind(ends.length);
  const cell = tol > 0 ? tol : 1;
  let [x0, y0, x1, y1] = [Infinity, Infinity, -Infinity, -Infinity];
  for (const p of ends) [x0, y0, x1, y1] = [Math.min(x0, p.x), Math.min(y0, p.y), Math.max(x1, p.x), Math.max(y1, p.y)];
  const cols = Math.floor((x1 - x0) / cell) + 3;
  const rows = Math.floor((y1 - y0) / cell) + 3;
  const numbered = cols * rows < 2 ** 52;
  const grid = new Map<number | string, number[]>();
  const key = (cx: number, cy: number): number | string => (numbered ? cx * rows + cy : `${cx},${cy}`);
  ends.forEach((p, i) => {
    const cx = Math.floor((p.x - x0) / cell) + 1;
    const cy = Math.floor((p.y - y0) / cell) + 1;
    for (let dx = -1; dx <= 1; dx++)
      for (let dy = -1; dy <= 1; dy++) {
        const list = grid.get(key(cx + dx, cy + dy));
        if (list) for (const j of list) if (dist(p, ends[j]!) <= tol) uf.union(i, j);
      }
    const k = key(cx, cy);
    const list = grid.get(k);
    if (list) list.push(i);
    else grid.set(k, [i]);
  });
  return ends.map((_, i) => uf.find(i));
}

interface Edge {
  seg: Segment;
  src: EntitySource;
  u: number;
  v: number;
}

/** Two edges between the same points that draw the same curve (a straight line, or the same arc). */
function sameCurve(e: Edge, f: Edge, tol: number): boolean {
  if (!((e.u === f.u && e.v === f.v) || (e.u === f.v && e.v === f.u))) return false;
  const s = e.seg;
  const t = f.seg;
  if (s.kind === 'line' || t.kind === 'line') return s.kind === t.kind;
  const mid = (a: Segment) => {
    const [t0, t1] = paramRange(a);
    return evalSegment(a, (t0 + t1) / 2).p;
  };
  return dist(mid(s), mid(t)) <= tol;
}

/**
 * Joins segments given in any order and direction into closed loops. Ends within `tol` of each
 * other become one point: a line's end moves onto it exactly (onto an arc's end where there is
 * one), two arcs meeting with a gap get a bridging line, so every loop closes exactly. Segments
 * that duplicate another are dropped; every point must then join exactly two ends. `tick` is
 * called between stages (the caller's time limit).
 */
export function stitch(pieces: readonly Piece[], tol: number, tick: () => void = () => {}): Stitched {
  const ends = pieces.flatMap((p) => [startPoint(p.seg), endPoint(p.seg)]);
  const cluster = clusterEnds(ends, tol);
  tick();
  // Each point's representative: an arc's end if one meets there (arc ends cannot move), else the first end.
  const rep = new Map<number, Point>();
  const repOnArc = new Set<number>();
  ends.forEach((p, i) => {
    const k = cluster[i]!;
    const onArc = pieces[i >> 1]!.seg.kind !== 'line';
    if (rep.has(k) && (repOnArc.has(k) || !onArc)) return;
    rep.set(k, p);
    if (onArc) repOnArc.add(k);
  });
  let largestGap = 0;
  let largestGapAt: Point | null = null;
  ends.forEach((p, i) => {
    const d = dist(p, rep.get(cluster[i]!)!);
    if (d > largestGap) [largestGap, largestGapAt] = [d, p];
  });

  const edges: Edge[] = [];
  const duplicates: EntitySource[] = [];
  const between = new Map<string, Edge[]>();
  let degenerate = 0;
  pieces.forEach(({ seg, src }, i) => {
    const u = cluster[2 * i]!;
    const v = cluster[2 * i + 1]!;
    // A curve whose ends meet is a loop by itself (a circle, a whole ellipse, a closed spline) unless it is tiny.
    if (u === v && !(seg.kind !== 'line' && sizeOf(seg) > 2 * tol)) {
      degenerate++;
      return;
    }
    const e: Edge = { seg: seg.kind === 'line' ? line(rep.get(u)!, rep.get(v)!) : seg, src, u, v };
    // Only edges between the same two points can coincide.
    const pair = u < v ? `${u},${v}` : `${v},${u}`;
    const same = between.get(pair);
    if (same?.some((f) => sameCurve(e, f, tol))) duplicates.push(src);
    else {
      edges.push(e);
      if (same) same.push(e);
      else between.set(pair, [e]);
    }
  });

  const at = new Map<number, number[]>();
  edges.forEach((e, i) => {
    for (const k of [e.u, e.v]) {
      const list = at.get(k);
      if (list) list.push(i);
      else at.set(k, [i]);
    }
  });
  const faultAt = (pred: (n: number) => boolean) =>
    [...at.entries()].filter(([, es]) => pred(es.length)).map(([k, es]) => ({ p: rep.get(k)!, srcs: es.map((i) => edges[i]!.src) }));
  const branching = faultAt((n) => n > 2);
  const open = faultAt((n) => n === 1);

  tick();
  const loops = traceLoops(edges, at, tol);
  const closed = loops.filter((l) => l.closed).length;
  const fault: StitchFault | null =
    edges.length === 0
      ? { kind: 'none', closed: 0, at: [] }
      : branching.length
        ? { kind: 'branching', closed, at: branching }
        : open.length
          ? { kind: 'open', closed, at: open }
          : null;
  return { loops: loops.filter((l) => l.closed).map((l) => l.loop), largestGap, largestGapAt, duplicates, degenerate, fault };
}

/**
 * Walks each chain of edges through points joining exactly two ends. A chain that comes back to
 * its first point is a closed loop; one that reaches an open end or a junction is not.
 */
function traceLoops(edges: readonly Edge[], at: ReadonlyMap<number, number[]>, tol: number): { loop: Loop; closed: boolean }[] {
  const used = edges.map(() => false);
  const out: { loop: Loop; closed: boolean }[] = [];
  // Gaps left between two arcs' ends (their ends cannot move) are bridged by a line.
  const bridgeAbove = tol * 1e-3;
  const bridge = (loop: Segment[], prev: Segment | undefined, next: Segment) => {
    if (!prev) return;
    const [p, q] = [endPoint(prev), startPoint(next)];
    if (dist(p, q) > bridgeAbove) loop.push(line(p, q));
  };
  for (let i = 0; i < edges.length; i++) {
    if (used[i]) continue;
    const first = edges[i]!.u;
    const loop: Segment[] = [];
    let closed = at.get(first)!.length === 2;
    let node = first;
    let e: number | undefined = i;
    while (e !== undefined) {
      used[e] = true;
      const ed = edges[e]!;
      const forward = ed.u === node;
      const seg = forward ? ed.seg : reverseSegment(ed.seg);
      bridge(loop, loop[loop.length - 1], seg);
      loop.push(seg);
      node = forward ? ed.v : ed.u;
      const here = at.get(node)!;
      if (here.length !== 2) closed = false;
      e = here.length === 2 ? here.find((j) => !used[j]) : undefined;
    }
    closed &&= node === first;
    if (closed) bridge(loop, loop[loop.length - 1], loop[0]!);
    out.push({ loop, closed });
  }
  return out;
}
