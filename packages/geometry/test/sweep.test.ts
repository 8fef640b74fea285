import { describe, expect, it } from 'vitest';
import { findCrossings, line, nestLoops, regionBox, segmentLength, type Loop, type Point } from '../src';
import { overlappingBoxes } from '../src/sweep';

const P = (x: number, y: number): Point => ({ x, y });
const square = (x: number, y: number, s: number): Loop => {
  const c = [P(x, y), P(x + s, y), P(x + s, y + s), P(x, y + s)];
  return c.map((p, i) => line(p, c[(i + 1) % 4]!));
};

describe('overlappingBoxes', () => {
  it('visits exactly the overlapping pairs, whichever axis it sweeps', () => {
    const boxes = [
      { xmin: 0, xmax: 2, ymin: 0, ymax: 2 },
      { xmin: 1, xmax: 3, ymin: 1, ymax: 3 },
      { xmin: 5, xmax: 6, ymin: 0, ymax: 10 },
      { xmin: 0, xmax: 10, ymin: 9, ymax: 10 },
    ];
    for (const bs of [boxes, boxes.map((b) => ({ xmin: b.ymin, xmax: b.ymax, ymin: b.xmin, ymax: b.xmax }))]) {
      const pairs: string[] = [];
      overlappingBoxes(bs, 0, (i, j) => void pairs.push([i, j].sort().join('-')));
      expect(pairs.sort()).toEqual(['0-1', '2-3']);
    }
  });
});

// Issue 3 (DXF import): an array INSERT stacks thousands of shapes in one column; sweeping along x
// kept every box open at once and took minutes for 60,000 squares.
describe('a column of 20,000 squares', () => {
  const loops = Array.from({ length: 20_000 }, (_, i) => square(0, 10 * i, 4));
  it('findCrossings and nestLoops stay near-linear', () => {
    const t0 = performance.now();
    expect(findCrossings({ parts: loops.map((outer) => ({ outer, holes: [] })) }, 1e-9)).toEqual([]);
    expect(nestLoops(loops).parts).toHaveLength(20_000);
    // Quadratic took over a minute; near-linear takes well under a second (generous for a shared CI box).
    expect(performance.now() - t0).toBeLessThan(10_000);
  });
});

// Issue 3 (DXF import): an array INSERT can make more parts than Math.min(...array) can spread.
describe('200,000 parts', () => {
  it('regionBox and the spline box of segmentLength take them without overflowing the stack', () => {
    const parts = Array.from({ length: 200_000 }, (_, i) => ({ outer: square(2 * i, 0, 1), holes: [] }));
    expect(regionBox({ parts })).toEqual({ xmin: 0, xmax: 399_999, ymin: 0, ymax: 1 });
    const n = 200_000;
    const controls = Array.from({ length: n }, (_, i) => ({ x: i, y: 0, w: 1 }));
    const knots = [0, ...Array.from({ length: n }, (_, i) => i / (n - 1)), 1];
    // A degree-1 spline along the x axis: its length is the span of its control points — common practice.
    expect(segmentLength({ kind: 'spline', degree: 1, knots, controls })).toBeCloseTo(n - 1, 3);
  });
});
