import { flattenSegment } from './flatten';
import { arcContainsAngle, endPoint, line, startPoint } from './segment';
import { segmentRange } from './extent';
import { allLoops } from './region';
import { overlappingBoxes } from './sweep';
import type { ArcSegment, LineSegment, Point, Region, Segment } from './types';

/** Points where two segments meet (for overlapping collinear pieces, the ends of the overlap). */
function meet(s: LineSegment | ArcSegment, t: LineSegment | ArcSegment, tol: number): Point[] {
  if (s.kind === 'line' && t.kind === 'line') return lineLine(s, t, tol);
  if (s.kind === 'line') return lineArc(s, t as ArcSegment, tol);
  if (t.kind === 'line') return lineArc(t, s, tol);
  return arcArc(s, t, tol);
}

/**
 * Lines and circular arcs are tested exactly; elliptical arcs and splines by their chords within
 * 1e-6 of their size (a topology test needs no more, and keeps the number of pieces small).
 */
function pieces(s: Segment, tol: number): (LineSegment | ArcSegment)[] {
  if (s.kind === 'line' || s.kind === 'arc') return [s];
  const box = [0, 1].map((k) => segmentRange(s, 1 - k, k, { x: 0, y: 0 }));
  const size = Math.max(...box.map(([a, b]) => b - a));
  const pts = flattenSegment(s, Math.max(tol, 1e-6 * size));
  return pts.slice(1).map((p, i) => line(pts[i]!, p));
}

function lineLine(s: LineSegment, t: LineSegment, tol: number): Point[] {
  const rx = s.b.x - s.a.x;
  const ry = s.b.y - s.a.y;
  const qx = t.b.x - t.a.x;
  const qy = t.b.y - t.a.y;
  const den = rx * qy - ry * qx;
  const wx = t.a.x - s.a.x;
  const wy = t.a.y - s.a.y;
  const ls = Math.hypot(rx, ry);
  const lt = Math.hypot(qx, qy);
  if (Math.abs(den) <= 1e-12 * ls * lt) {
    // Parallel: they meet only if collinear, along the overlap of their projections.
    if (Math.abs(wx * ry - wy * rx) > tol * ls) return [];
    const u0 = (wx * rx + wy * ry) / (ls * ls);
    const u1 = ((t.b.x - s.a.x) * rx + (t.b.y - s.a.y) * ry) / (ls * ls);
    const lo = Math.max(0, Math.min(u0, u1));
    const hi = Math.min(1, Math.max(u0, u1));
    if (hi < lo - tol / ls) return [];
    return [lo, hi].map((u) => ({ x: s.a.x + u * rx, y: s.a.y + u * ry }));
  }
  const u = (wx * qy - wy * qx) / den;
  const v = (wx * ry - wy * rx) / den;
  const eu = tol / ls;
  const ev = tol / lt;
  if (u < -eu || u > 1 + eu || v < -ev || v > 1 + ev) return [];
  return [{ x: s.a.x + u * rx, y: s.a.y + u * ry }];
}

function onArc(a: ArcSegment, p: Point, tol: number): boolean {
  const ang = Math.atan2(p.y - a.c.y, p.x - a.c.x);
  if (arcContainsAngle(a, ang)) return true;
  const e0 = startPoint(a);
  const e1 = endPoint(a);
  return Math.hypot(p.x - e0.x, p.y - e0.y) <= tol || Math.hypot(p.x - e1.x, p.y - e1.y) <= tol;
}

function lineArc(s: LineSegment, a: ArcSegment, tol: number): Point[] {
  const dx = s.b.x - s.a.x;
  const dy = s.b.y - s.a.y;
  const L2 = dx * dx + dy * dy;
  const fx = s.a.x - a.c.x;
  const fy = s.a.y - a.c.y;
  // Foot of the perpendicular from the centre, then ± half-chord along the line.
  const u0 = -(fx * dx + fy * dy) / L2;
  const px = fx + u0 * dx;
  const py = fy + u0 * dy;
  const d2 = a.r * a.r - (px * px + py * py);
  if (d2 < -2 * a.r * tol) return [];
  const h = Math.sqrt(Math.max(d2, 0) / L2);
  const out: Point[] = [];
  const eu = tol / Math.sqrt(L2);
  for (const u of h === 0 ? [u0] : [u0 - h, u0 + h]) {
    if (u < -eu || u > 1 + eu) continue;
    const p = { x: s.a.x + u * dx, y: s.a.y + u * dy };
    if (onArc(a, p, tol)) out.push(p);
  }
  return out;
}

function arcArc(s: ArcSegment, t: ArcSegment, tol: number): Point[] {
  const dx = t.c.x - s.c.x;
  const dy = t.c.y - s.c.y;
  const d = Math.hypot(dx, dy);
  if (d <= tol) {
    // Concentric: they meet only on the same circle, where their sweeps overlap.
    if (Math.abs(s.r - t.r) > tol) return [];
    return [startPoint(t), endPoint(t), startPoint(s), endPoint(s)].filter((p) => onArc(s, p, tol) && onArc(t, p, tol));
  }
  if (d > s.r + t.r + tol || d < Math.abs(s.r - t.r) - tol) return [];
  const a = (d * d + s.r * s.r - t.r * t.r) / (2 * d);
  const h = Math.sqrt(Math.max(s.r * s.r - a * a, 0));
  const mx = s.c.x + (a * dx) / d;
  const my = s.c.y + (a * dy) / d;
  const pts = [
    { x: mx - (h * dy) / d, y: my + (h * dx) / d },
    { x: mx + (h * dy) / d, y: my - (h * dx) / d },
  ];
  return pts.filter((p) => onArc(s, p, tol) && onArc(t, p, tol));
}

interface Entry {
  seg: LineSegment | ArcSegment;
  loop: number;
  index: number;
  size: number;
  xmin: number;
  xmax: number;
  ymin: number;
  ymax: number;
}

export interface Crossing {
  readonly at: Point;
  /** Loops involved, numbered as `allLoops` lists them (outer loops and holes of each part in turn). */
  readonly loops: readonly [number, number];
}

/**
 * Places where the region's boundary meets itself other than at the joint of two consecutive
 * segments: crossing or touching loops, a self-intersecting outline, overlapping edges — at most
 * one per pair of loops, up to `limit` of them. A sweep over the segments' bounding boxes keeps it
 * near n log n for ordinary drawings.
 */
export function findCrossings(region: Region, tol: number, limit = Infinity): Crossing[] {
  const found: Crossing[] = [];
  const seen = new Set<string>();
  const entries: Entry[] = [];
  allLoops(region).forEach((loop, li) => {
    const expanded = loop.flatMap((s) => pieces(s, tol));
    expanded.forEach((seg, i) => {
      const o = { x: 0, y: 0 };
      const [xmin, xmax] = segmentRange(seg, 1, 0, o);
      const [ymin, ymax] = segmentRange(seg, 0, 1, o);
      entries.push({ seg, loop: li, index: i, size: expanded.length, xmin, xmax, ymin, ymax });
    });
  });
  overlappingBoxes(entries, tol, (i, j) => {
    const e = entries[i]!;
    const f = entries[j]!;
    const pts = meet(e.seg, f.seg, tol);
    if (pts.length === 0) return false;
    const joints: Point[] = [];
    if (e.loop === f.loop) {
      if ((e.index + 1) % e.size === f.index) joints.push(endPoint(e.seg));
      if ((f.index + 1) % f.size === e.index) joints.push(endPoint(f.seg));
    }
    const bad = pts.find((p) => !joints.some((j) => Math.hypot(p.x - j.x, p.y - j.y) <= tol * 4));
    const key = `${Math.min(e.loop, f.loop)}:${Math.max(e.loop, f.loop)}`;
    if (!bad || seen.has(key)) return false;
    seen.add(key);
    found.push({ at: bad, loops: [Math.min(e.loop, f.loop), Math.max(e.loop, f.loop)] });
    return found.length >= limit;
  });
  return found;
}

/** The first place where the boundary meets itself, or null for a clean region. */
export function findCrossing(region: Region, tol: number): Crossing | null {
  return findCrossings(region, tol, 1)[0] ?? null;
}
