import { CompensatedSum } from './sum';
import { regionRange } from './extent';
import { allLoops } from './region';
import type { ArcSegment, Point, Region } from './types';

/**
 * Area and first moment of the part of a region below the line y = c (coordinates from o).
 * Green's theorem with A = ∮x dy and ∫y dA = ∮xy dy: both forms vanish along the cutting line,
 * so integrating over the boundary pieces with y ≤ c is exact with no closing chords.
 */
interface Below {
  a: number;
  q: number;
}

/** ∫x dy and ∫xy dy along the straight piece p→q. */
function lineForms(px: number, py: number, qx: number, qy: number, a: CompensatedSum, q: CompensatedSum): void {
  const dx = qx - px;
  const dy = qy - py;
  a.add(((px + qx) / 2) * dy);
  q.add(dy * (px * py + (px * dy + py * dx) / 2 + (dx * dy) / 3));
}

/** Antiderivatives in the arc parameter t of x dy and xy dy, x = h + r cos t, y = k + r sin t. */
function arcForms(h: number, k: number, r: number, t: number): [number, number] {
  const s = Math.sin(t);
  const c = Math.cos(t);
  const half = t / 2 + (s * c) / 2;
  return [h * r * s + r * r * half, r * (h * k * s + (h * r * s * s) / 2 + k * r * half - (r * r * c * c * c) / 3)];
}

function addLineBelow(px: number, py: number, qx: number, qy: number, c: number, a: CompensatedSum, q: CompensatedSum) {
  const pin = py <= c;
  const qin = qy <= c;
  if (pin && qin) return lineForms(px, py, qx, qy, a, q);
  if (!pin && !qin) return;
  const t = (c - py) / (qy - py);
  const mx = px + t * (qx - px);
  if (pin) lineForms(px, py, mx, c, a, q);
  else lineForms(mx, c, qx, qy, a, q);
}

function addArcBelow(s: ArcSegment, o: Point, c: number, a: CompensatedSum, q: CompensatedSum) {
  const h = s.c.x - o.x;
  const k = s.c.y - o.y;
  const t0 = s.start;
  const t1 = s.start + s.sweep;
  const lo = Math.min(t0, t1);
  const hi = Math.max(t0, t1);
  const cuts: number[] = [];
  const m = (c - k) / s.r;
  if (m > -1 && m < 1) {
    const base = Math.asin(m);
    for (const root of [base, Math.PI - base]) {
      const n0 = Math.ceil((lo - root) / (2 * Math.PI));
      for (let t = root + n0 * 2 * Math.PI; t < hi; t += 2 * Math.PI) if (t > lo) cuts.push(t);
    }
  }
  const ts = [t0, ...cuts.sort((x, y) => (s.sweep > 0 ? x - y : y - x)), t1];
  for (let i = 0; i + 1 < ts.length; i++) {
    const ta = ts[i]!;
    const tb = ts[i + 1]!;
    if (k + s.r * Math.sin((ta + tb) / 2) > c) continue;
    const [fa, ga] = arcForms(h, k, s.r, ta);
    const [fb, gb] = arcForms(h, k, s.r, tb);
    a.add(fb - fa);
    q.add(gb - ga);
  }
}

function below(region: Region, o: Point, c: number): Below {
  const a = new CompensatedSum();
  const q = new CompensatedSum();
  for (const loop of allLoops(region))
    for (const s of loop) {
      if (s.kind === 'line') addLineBelow(s.a.x - o.x, s.a.y - o.y, s.b.x - o.x, s.b.y - o.y, c, a, q);
      else addArcBelow(s, o, c, a, q);
    }
  return { a: a.value, q: q.value };
}

export interface PlasticAxis {
  /** Plastic modulus ∫|y − c| dA about the equal-area axis. */
  readonly Z: number;
  /** Position of the equal-area (plastic neutral) axis, measured from o. */
  readonly c: number;
}

/**
 * Plastic modulus about the axis parallel to x that halves the area (Gere & Goodno, plastic bending).
 * The axis is found by bisection on the exact area below it; Z is stationary there, so its error
 * is second order in the axis position.
 */
export function plasticAboutHorizontal(region: Region, o: Point, area: number): PlasticAxis {
  let [lo, hi] = regionRange(region, 0, 1, o);
  const ymax = hi;
  for (let i = 0; i < 200 && hi - lo > 0; i++) {
    const mid = (lo + hi) / 2;
    if (mid <= lo || mid >= hi) break;
    if (below(region, o, mid).a < area / 2) lo = mid;
    else hi = mid;
  }
  const c = (lo + hi) / 2;
  const b = below(region, o, c);
  const whole = below(region, o, ymax);
  // ∫|y−c| dA = (Q − Qb − c(A − Ab)) − (Qb − c·Ab)
  const Z = whole.q - 2 * b.q - c * whole.a + 2 * c * b.a;
  return { Z, c };
}
