import { describe, expect, it } from 'vitest';
import { arc, endPoint, line, loopMoments, startPoint, type Point, type Segment } from '@keelson/geometry';
import { stitch } from '../src/stitch';

const P = (x: number, y: number): Point => ({ x, y });
const pieces = (segs: Segment[]) => segs.map((seg, i) => ({ seg, src: { type: seg.kind === 'line' ? 'LINE' : 'ARC', handle: String(i) } }));
const closes = (loop: readonly Segment[]) =>
  loop.every((s, i) => {
    const e = endPoint(s);
    const n = startPoint(loop[(i + 1) % loop.length]!);
    return e.x === n.x && e.y === n.y;
  });

describe('stitch', () => {
  it('joins arcs meeting with a gap through a bridging line, so loops close exactly', () => {
    // Two half circles of radius 1 whose ends miss by 1e-10 (two arcs cannot be moved onto each other).
    const segs = [arc(P(0, 0), 1, 0, Math.PI), arc(P(0, 1e-10), 1, Math.PI, Math.PI)];
    const st = stitch(pieces(segs), 1e-9);
    expect(st.fault).toBeNull();
    expect(st.loops).toHaveLength(1);
    expect(st.loops[0]!.length).toBe(4);
    const loop = st.loops[0]!;
    // Exact closure up to the last bit of the arcs' computed end points.
    loop.forEach((s, i) => {
      const e = endPoint(s);
      const n = startPoint(loop[(i + 1) % loop.length]!);
      expect(Math.hypot(e.x - n.x, e.y - n.y)).toBeLessThan(1e-15);
    });
    // Circle πr² — common practice; the bridges add O(gap · r).
    expect(Math.abs(loopMoments(loop).a - Math.PI)).toBeLessThan(1e-9);
  });

  it('snaps line ends onto an arc end exactly', () => {
    const segs = [arc(P(0, 0), 1, 0, Math.PI / 2), line(P(0, 1 + 1e-13), P(0, 0)), line(P(0, 0), P(1 - 1e-13, 0))];
    const st = stitch(pieces(segs), 1e-9);
    expect(st.fault).toBeNull();
    expect(closes(st.loops[0]!)).toBe(true);
    expect(st.largestGap).toBeGreaterThan(0);
  });

  it('a full circle is a loop of its own; a duplicated arc is dropped, the other half of a circle is not', () => {
    const half = arc(P(0, 0), 1, 0, Math.PI);
    const st = stitch(pieces([arc(P(5, 5), 1, 0.3, 2 * Math.PI), half, arc(P(0, 0), 1, Math.PI, -Math.PI), arc(P(0, 0), 1, Math.PI, Math.PI)]), 1e-9);
    expect(st.fault).toBeNull();
    expect(st.loops).toHaveLength(2);
    expect(st.duplicates.map((d) => d.handle)).toEqual(['2']);
  });

  it('reports open ends and junctions with the entities that end there', () => {
    const open = stitch(pieces([line(P(0, 0), P(1, 0)), line(P(1, 0), P(1, 1))]), 1e-9);
    expect(open.fault).toMatchObject({ kind: 'open', closed: 0 });
    expect(open.fault!.at.map((a) => a.p)).toEqual([P(0, 0), P(1, 1)]);
    const none = stitch([], 0);
    expect(none.fault).toMatchObject({ kind: 'none' });
  });

  it('is near-linear: 40,000 segments in one polygon and 1,600 small squares', () => {
    const n = 40_000;
    const pts = Array.from({ length: n }, (_, i) => P(100 * Math.cos((2 * Math.PI * i) / n), 100 * Math.sin((2 * Math.PI * i) / n)));
    const segs: Segment[] = pts.map((p, i) => line(p, pts[(i + 1) % n]!));
    // Squares on a grid: many ends share an x (or a y), the case a sweep over x handles badly.
    for (let i = 0; i < 40; i++)
      for (let j = 0; j < 40; j++) {
        const [x, y] = [-60 + 3 * i, -60 + 3 * j];
        segs.push(line(P(x, y), P(x + 1, y)), line(P(x + 1, y), P(x + 1, y + 1)), line(P(x + 1, y + 1), P(x, y + 1)), line(P(x, y + 1), P(x, y)));
      }
    const t0 = performance.now();
    const st = stitch(pieces(segs.reverse()), 2e-7);
    expect(st.fault).toBeNull();
    expect(st.loops).toHaveLength(1601);
    // Quadratic steps take minutes here; the linear ones well under a second on an idle machine.
    expect(performance.now() - t0).toBeLessThan(10_000);
  });
});
