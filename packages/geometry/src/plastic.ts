import { CompensatedSum } from './sum';
import { regionRange, segmentRange } from './extent';
import { allLoops } from './region';
import { integrate, integrateAdaptive } from './quadrature';
import { evalSegment, smoothBreaks } from './segment';
import { isRational } from './spline';
import type { ArcSegment, Point, Region, Segment } from './types';

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

/**
 * Antiderivatives in the arc parameter t of x dy and xy dy, x = h + r cos t, y = k + r sin t,
 * written to `out` (a scratch pair: these run hundreds of thousands of times per section, and a
 * returned pair would be an allocation each).
 */
function arcForms(h: number, k: number, r: number, t: number, out: Float64Array): void {
  const s = Math.sin(t);
  const c = Math.cos(t);
  const half = t / 2 + (s * c) / 2;
  out[0] = h * r * s + r * r * half;
  out[1] = r * (h * k * s + (h * r * s * s) / 2 + k * r * half - (r * r * c * c * c) / 3);
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

/** Scratch of `addArcBelow`: the arc's end parameters and its crossings of the cutting line. */
const CUTS = new Float64Array(8);
const FA = new Float64Array(2);
const FB = new Float64Array(2);

function addArcBelow(s: ArcSegment, o: Point, c: number, a: CompensatedSum, q: CompensatedSum) {
  const h = s.c.x - o.x;
  const k = s.c.y - o.y;
  const r = s.r;
  const t0 = s.start;
  const t1 = s.start + s.sweep;
  const lo = Math.min(t0, t1);
  const hi = Math.max(t0, t1);
  // Crossings of y = c strictly between the ends (two per turn at most; an arc turns once at most).
  let n = 0;
  CUTS[n++] = t0;
  const m = (c - k) / r;
  if (m > -1 && m < 1) {
    const base = Math.asin(m);
    for (let f = 0; f < 2; f++) {
      const root = f === 0 ? base : Math.PI - base;
      const n0 = Math.ceil((lo - root) / (2 * Math.PI));
      for (let t = root + n0 * 2 * Math.PI; t < hi && n < CUTS.length - 1; t += 2 * Math.PI) if (t > lo) CUTS[n++] = t;
    }
  }
  // In the arc's direction (insertion sort of a few).
  const dir = s.sweep > 0 ? 1 : -1;
  for (let i = 2; i < n; i++) {
    const v = CUTS[i]!;
    let j = i;
    while (j > 1 && dir * (CUTS[j - 1]! - v) > 0) {
      CUTS[j] = CUTS[j - 1]!;
      j--;
    }
    CUTS[j] = v;
  }
  CUTS[n++] = t1;
  for (let i = 0; i + 1 < n; i++) {
    const ta = CUTS[i]!;
    const tb = CUTS[i + 1]!;
    if (k + r * Math.sin((ta + tb) / 2) > c) continue;
    arcForms(h, k, r, ta, FA);
    arcForms(h, k, r, tb, FB);
    a.add(FB[0]! - FA[0]!);
    q.add(FB[1]! - FA[1]!);
  }
}

/** A y-monotone piece of an elliptical arc or spline, with its integrals precomputed. */
interface MonotonePiece {
  s: Segment;
  t0: number;
  t1: number;
  y0: number;
  y1: number;
  a: number;
  q: number;
  adaptive: boolean;
  floor: [number, number];
}

/** Bisection to rounding for the parameter where g changes sign between a and b. */
function root(g: (t: number) => number, a: number, b: number): number {
  const ga = g(a) > 0;
  for (let i = 0; i < 200; i++) {
    const m = (a + b) / 2;
    if (m === a || m === b) break;
    if (g(m) > 0 === ga) a = m;
    else b = m;
  }
  return (a + b) / 2;
}

/** Integrands x·y' and x·y·y' (coordinates from o) of a curve segment. */
function cutForms(s: Segment, o: Point) {
  return (t: number, out: Float64Array) => {
    const { p, d } = evalSegment(s, t);
    const x = p.x - o.x;
    out[0] = x * d.y;
    out[1] = x * (p.y - o.y) * d.y;
  };
}

/**
 * Elliptical arcs and splines are split once into y-monotone pieces (at the roots of y'(t), found
 * by sign changes on 32 samples per smooth piece and bisection), each with ∫x dy and ∫xy dy
 * integrated by Gauss–Legendre — exact for polynomial splines up to degree 10, and to rounding for
 * the trigonometric integrands of an elliptical arc on pieces of a quarter turn. A cut then only
 * splits the one piece the line crosses.
 */
function monotonePieces(s: Segment, o: Point): MonotonePiece[] {
  const f = cutForms(s, o);
  const dy = (t: number) => evalSegment(s, t).d.y;
  const adaptive = s.kind === 'spline' && (isRational(s) || s.degree > 10);
  const br = smoothBreaks(s);
  let L = 1e-300;
  for (const t of br) {
    const p = evalSegment(s, t).p;
    L = Math.max(L, Math.abs(p.x - o.x), Math.abs(p.y - o.y));
  }
  const floor: [number, number] = [L * L, L * L * L];
  const out: MonotonePiece[] = [];
  const N = 32;
  for (let i = 0; i + 1 < br.length; i++) {
    const t0 = br[i]!;
    const t1 = br[i + 1]!;
    const ts = [t0];
    let prevT = t0;
    let prev = dy(t0);
    for (let k = 1; k <= N; k++) {
      const t = k === N ? t1 : t0 + ((t1 - t0) * k) / N;
      const d = dy(t);
      if (prev > 0 !== d > 0 && k < N) ts.push(root(dy, prevT, t));
      prevT = t;
      prev = d;
    }
    ts.push(t1);
    for (let k = 0; k + 1 < ts.length; k++) {
      const ta = ts[k]!;
      const tb = ts[k + 1]!;
      if (ta === tb) continue;
      const r = adaptive ? integrateAdaptive(f, ta, tb, 2, floor) : integrate(f, ta, tb, 2);
      const y0 = evalSegment(s, ta).p.y - o.y;
      const y1 = evalSegment(s, tb).p.y - o.y;
      out.push({ s, t0: ta, t1: tb, y0, y1, a: r[0]!, q: r[1]!, adaptive, floor });
    }
  }
  return out;
}

function addPieceBelow(m: MonotonePiece, o: Point, c: number, a: CompensatedSum, q: CompensatedSum) {
  const in0 = m.y0 <= c;
  const in1 = m.y1 <= c;
  if (in0 && in1) {
    a.add(m.a);
    q.add(m.q);
    return;
  }
  if (!in0 && !in1) return;
  const tc = root((t) => evalSegment(m.s, t).p.y - o.y - c, m.t0, m.t1);
  const f = cutForms(m.s, o);
  const [ta, tb] = in0 ? [m.t0, tc] : [tc, m.t1];
  const r = m.adaptive ? integrateAdaptive(f, ta, tb, 2, m.floor) : integrate(f, ta, tb, 2);
  a.add(r[0]!);
  q.add(r[1]!);
}

/** Area and first moment below y = c, with the curve pieces prepared once per region. */
function cutter(region: Region, o: Point): (c: number) => Below {
  const straight: Segment[] = [];
  const pieces: MonotonePiece[] = [];
  for (const loop of allLoops(region))
    for (const s of loop) {
      if (s.kind === 'line' || s.kind === 'arc') straight.push(s);
      else pieces.push(...monotonePieces(s, o));
    }
  // The search cuts every arc at every trial line, but most arcs lie wholly above or below it:
  // their height range and whole-arc integrals are computed once, and only the arcs the line
  // crosses are cut (the same sums as cutting them all, a few times faster).
  const n = straight.length;
  const ylo = new Float64Array(n);
  const yhi = new Float64Array(n);
  const wholeA = new Float64Array(n);
  const wholeQ = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const s = straight[i]!;
    if (s.kind !== 'arc') continue;
    [ylo[i], yhi[i]] = segmentRange(s, 0, 1, o);
    const h = s.c.x - o.x;
    const k = s.c.y - o.y;
    arcForms(h, k, s.r, s.start, FA);
    arcForms(h, k, s.r, s.start + s.sweep, FB);
    wholeA[i] = FB[0]! - FA[0]!;
    wholeQ[i] = FB[1]! - FA[1]!;
  }
  return (c) => {
    const a = new CompensatedSum();
    const q = new CompensatedSum();
    for (let i = 0; i < n; i++) {
      const s = straight[i]!;
      if (s.kind === 'line') addLineBelow(s.a.x - o.x, s.a.y - o.y, s.b.x - o.x, s.b.y - o.y, c, a, q);
      else if (s.kind === 'arc') {
        if (yhi[i]! < c) {
          a.add(wholeA[i]!);
          q.add(wholeQ[i]!);
        } else if (ylo[i]! <= c) addArcBelow(s, o, c, a, q);
      }
    }
    for (const m of pieces) addPieceBelow(m, o, c, a, q);
    return { a: a.value, q: q.value };
  };
}

/**
 * Root of a non-decreasing function with f(lo) < 0 < f(hi), by a safeguarded secant (Illinois)
 * iteration that bisects every fourth step: superlinear where f is smooth, never slower than
 * bisection where it is flat or kinked.
 */
function increasingRoot(f: (x: number) => number, lo: number, hi: number, scale: number): number {
  let flo = -scale;
  let fhi = scale;
  let side = 0;
  for (let i = 0; i < 200; i++) {
    let mid = (lo * fhi - hi * flo) / (fhi - flo);
    if (!(mid > lo && mid < hi) || i % 4 === 3) mid = (lo + hi) / 2;
    if (mid <= lo || mid >= hi) break;
    const v = f(mid);
    if (v === 0) return mid;
    if (v < 0) {
      lo = mid;
      flo = v;
      if (side === -1) fhi /= 2;
      side = -1;
    } else {
      hi = mid;
      fhi = v;
      if (side === 1) flo /= 2;
      side = 1;
    }
  }
  return (lo + hi) / 2;
}

export interface PlasticAxis {
  /** Plastic modulus ∫|y − c| dA about the equal-area axis. */
  readonly Z: number;
  /** Position of the equal-area (plastic neutral) axis, measured from o. */
  readonly c: number;
}

/**
 * Plastic modulus about the axis parallel to x that halves the area (Gere & Goodno, plastic bending).
 * The axis is found by a safeguarded secant search on the exact area below it; Z is stationary there, so its error
 * is second order in the axis position.
 */
export function plasticAboutHorizontal(region: Region, o: Point, area: number): PlasticAxis {
  const below = cutter(region, o);
  const [ylo, yhi] = regionRange(region, 0, 1, o);
  // Where parts are separated by a gap every axis in the gap halves the area: report the middle
  // of that interval, bracketed by where the area below reaches A/2 ∓ 1e-12·A.
  const tolA = 1e-12 * area;
  const cLo = increasingRoot((y) => below(y).a - area / 2 + tolA, ylo, yhi, area);
  const cHi = increasingRoot((y) => below(y).a - area / 2 - tolA, ylo, yhi, area);
  const c = (cLo + cHi) / 2;
  const b = below(c);
  const whole = below(Infinity);
  // ∫|y−c| dA = (Q − Qb − c(A − Ab)) − (Qb − c·Ab)
  const Z = whole.q - 2 * b.q - c * whole.a + 2 * c * b.a;
  return { Z, c };
}
