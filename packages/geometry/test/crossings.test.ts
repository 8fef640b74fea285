import { describe, expect, it } from 'vitest';
import { arc, findCrossing, line, makeRegion, type Loop, type Point } from '../src';

const P = (x: number, y: number): Point => ({ x, y });
const poly = (pts: Point[]): Loop => pts.map((p, i) => line(p, pts[(i + 1) % pts.length]!));
const rect = (x0: number, y0: number, w: number, h: number) => poly([P(x0, y0), P(x0 + w, y0), P(x0 + w, y0 + h), P(x0, y0 + h)]);
const TOL = 1e-9;

describe('findCrossing', () => {
  it('accepts clean outlines with arcs and holes', () => {
    const disc = [arc(P(0, 0), 10, 0, 2 * Math.PI)];
    const region = makeRegion([{ outer: disc, holes: [rect(-3, -3, 6, 6), [arc(P(5, 5), 1, 0, -2 * Math.PI)]] }]);
    expect(findCrossing(region, TOL)).toBeNull();
    const rounded = [line(P(0, 0), P(10, 0)), arc(P(10, 2), 2, -Math.PI / 2, Math.PI), line(P(10, 4), P(0, 4)), line(P(0, 4), P(0, 0))];
    expect(findCrossing(makeRegion([{ outer: rounded, holes: [] }]), TOL)).toBeNull();
  });

  it('finds a hole that crosses its outline, with the place', () => {
    const c = findCrossing(makeRegion([{ outer: rect(0, 0, 10, 10), holes: [rect(8, 2, 4, 2)] }]), TOL);
    expect(c).not.toBeNull();
    expect(c!.at.x).toBeCloseTo(10, 12);
  });

  it('finds overlapping parts, a self-intersecting outline and a circle cutting a line', () => {
    expect(findCrossing(makeRegion([{ outer: rect(0, 0, 10, 2), holes: [] }, { outer: rect(4, 1, 2, 10), holes: [] }]), TOL)).not.toBeNull();
    const bowtie = poly([P(0, 0), P(10, 10), P(10, 0), P(0, 10)]);
    const r = { parts: [{ outer: bowtie, holes: [] }] };
    expect(findCrossing(r, TOL)?.at).toEqual({ x: 5, y: 5 });
    const c = findCrossing(makeRegion([{ outer: rect(0, 0, 10, 10), holes: [[arc(P(10, 5), 2, 0, 2 * Math.PI)]] }]), TOL);
    expect(c!.at.x).toBeCloseTo(10, 12);
  });

  it('finds collinear overlapping edges of two parts', () => {
    expect(findCrossing(makeRegion([{ outer: rect(0, 0, 10, 2), holes: [] }, { outer: rect(5, 2, 10, 2), holes: [] }]), TOL)).not.toBeNull();
  });
});
