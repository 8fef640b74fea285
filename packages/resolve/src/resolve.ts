import {
  findCrossings,
  flattenSegment,
  line,
  loopBox,
  nestLoops,
  perimeter,
  reverseLoop,
  signedLoopArea,
  type Loop,
  type Point,
  type Region,
  type Segment,
} from '@keelson/geometry';
import { unionPolygons } from './clip';
import { ResolveError, fmt } from './errors';
import { snapper } from './snap';

export interface Resolution {
  readonly region: Region;
  /** What was done to the drawing's loops, one sentence each, for the result's warnings. */
  readonly notes: string[];
  /**
   * Where clipping had to cut curves, the largest distance between the flattened boundary and the
   * drawn one (chord error plus integer rounding); null when every segment is kept exact.
   */
  readonly flattening: { readonly maxDeviation: number; readonly loops: number } | null;
}

/** A loop's identity up to start point and direction: area, perimeter and box to rounding. */
function fingerprint(loop: Loop, tol: number): string {
  const b = loopBox(loop);
  const r = (v: number) => Math.round(v / tol);
  const region = { parts: [{ outer: loop, holes: [] }] };
  return [b.xmin, b.xmax, b.ymin, b.ymax].map(r).join(',') + `|${r(Math.abs(signedLoopArea(loop)) / Math.max(1, b.xmax - b.xmin))}|${r(perimeter(region))}`;
}

function components(n: number, pairs: readonly (readonly [number, number])[]): number[] {
  const parent = Array.from({ length: n }, (_, i) => i);
  const find = (i: number): number => (parent[i] === i ? i : (parent[i] = find(parent[i]!)));
  for (const [a, b] of pairs) parent[find(a)] = find(b);
  return parent.map((_, i) => find(i));
}

/**
 * Turns the closed loops of a drawing into a region: duplicates dropped, loops that cross or
 * overlap united (clipper-lib, non-zero fill), holes found by nesting. Loops that touch nothing
 * keep their exact segments; united loops come back as polygons whose curved pieces are restored
 * exactly wherever the union left a whole segment in place. Crossing loops are united whatever
 * their nesting (overlapping parts; a hole drawn partly outside its outline joins it), and the
 * note says so. A self-intersecting outline has no single meaning and is refused with its location.
 * `tol` is the drawing's coincidence tolerance (drawing units).
 */
export function resolveLoops(input: readonly Loop[], tol: number): Resolution {
  const notes: string[] = [];
  const seen = new Set<string>();
  const loops = input.filter((l) => {
    const key = fingerprint(l, tol);
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
  if (loops.length < input.length) notes.push(`${input.length - loops.length} duplicate outline(s) removed`);

  const crossings = findCrossings({ parts: loops.map((outer) => ({ outer, holes: [] })) }, tol);
  if (crossings.length === 0) return { region: nestLoops(loops), notes, flattening: null };

  const self = crossings.find((c) => c.loops[0] === c.loops[1]);
  if (self) throw new ResolveError('SELF_INTERSECTION', `an outline crosses itself at ${fmt(self.at)}`, self.at);

  const comp = components(loops.length, crossings.map((c) => c.loops));
  const box = loops.map((l) => loopBox(l));
  // A reduction, not Math.max(...box): spreading 120,000 loops overflows the call stack.
  const extent = box.reduce((m, b) => Math.max(m, b.xmax - b.xmin, b.ymax - b.ymin), 0);
  const chord = Math.max(tol, 1e-7 * extent);
  const kept: Loop[] = [];
  const groups = new Map<number, number[]>();
  loops.forEach((l, i) => {
    if (!crossings.some((c) => comp[c.loops[0]] === comp[i])) kept.push(l);
    else groups.set(comp[i]!, [...(groups.get(comp[i]!) ?? []), i]);
  });

  let maxDeviation = 0;
  let flattenedLoops = 0;
  for (const members of groups.values()) {
    const curved = new Map<string, Tag>();
    const polygons = members.map((i) =>
      (signedLoopArea(loops[i]!) < 0 ? reverseLoop(loops[i]!) : loops[i]!).flatMap((seg) => {
        const pts = flattenSegment(seg, chord).slice(0, -1);
        if (seg.kind !== 'line') pts.forEach((p, k) => curved.set(`${p.x},${p.y}`, { seg, index: k, count: pts.length }));
        return pts;
      }),
    );
    const { parts, grid } = unionPolygons(polygons);
    const snap = snapper(polygons, grid);
    for (const part of parts)
      for (const ring of [part.outer, ...part.holes]) {
        const { loop, exact } = rebuild(ring.map(snap), curved);
        kept.push(loop);
        if (!exact) {
          flattenedLoops++;
          maxDeviation = Math.max(maxDeviation, chord + grid);
        }
      }
    notes.push(`${members.length} overlapping outlines united into ${parts.length} part(s)`);
  }
  const region = nestLoops(kept);
  const left = findCrossings(region, tol, 1)[0];
  if (left) throw new ResolveError('UNRESOLVED', `outlines still meet at ${fmt(left.at)} after union`, left.at);
  return { region, notes, flattening: flattenedLoops ? { maxDeviation, loops: flattenedLoops } : null };
}

/**
 * Rebuilds a clipped ring as segments: a run of vertices that walks a whole curved segment's
 * flattening point by point becomes that exact segment again; everything else stays straight.
 * Inputs were oriented counter-clockwise, so the union's rings (outer counter-clockwise, holes
 * clockwise, solid on the left of both) walk every surviving piece forwards.
 */
function rebuild(ring: Point[], curved: Map<string, Tag>): { loop: Loop; exact: boolean } {
  const n = ring.length;
  const tag = ring.map((p) => curved.get(`${p.x},${p.y}`));
  const follows = (a: Tag | undefined, b: Tag | undefined) => !!a && !!b && a.seg === b.seg && b.index === a.index + 1;
  let start = 0;
  while (start < n && follows(tag[(start + n - 1) % n], tag[start])) start++;
  if (start === n) start = 0;
  const out: Segment[] = [];
  let exact = true;
  for (let i = 0; i < n; ) {
    const k = (start + i) % n;
    const t = tag[k];
    let j = i;
    while (j + 1 < n && follows(tag[(start + j) % n], tag[(start + j + 1) % n])) j++;
    if (t && t.index === 0 && j - i + 1 === t.count) {
      out.push(t.seg);
      i = j + 1;
      continue;
    }
    if (t) exact = false;
    out.push(line(ring[k]!, ring[(k + 1) % n]!));
    i++;
  }
  return { loop: out, exact };
}

interface Tag {
  seg: Segment;
  index: number;
  count: number;
}
