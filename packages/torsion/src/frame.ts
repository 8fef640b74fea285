import {
  flattenSegment,
  line,
  regionBox,
  type ArcSegment,
  type EllipseSegment,
  type LineSegment,
  type Region,
  type Segment,
} from '@keelson/geometry';

/**
 * Meshing and solving run in a normalised frame: x' = (x − ox)/s, y' = (y − oy)/s with (ox, oy)
 * the centre of the region's bounding box and s its larger side, so every region fits the unit
 * square about the origin. Results are scaled back (lengths ×s, J ×s⁴, Cw ×s⁶): the same section
 * drawn in metres or in nanometres gives the same mesh and the same relative answers.
 */
export interface Frame {
  readonly ox: number;
  readonly oy: number;
  readonly s: number;
}

/**
 * A boundary curve in the normalised frame, parametrised by t ∈ [0, 1]: a line from (ax, ay) to
 * (bx, by), or (arc) a circular or elliptical arc p = c + u·cos θ + v·sin θ, θ = a0 + t·sweep
 * (a circle has u = (r, 0), v = (0, r)). r is then the smallest radius of curvature, b²/a for
 * semi-axes a ≥ b: the size that bounds how far one boundary side may turn.
 */
export interface Curve {
  readonly arc: boolean;
  readonly ux: number;
  readonly uy: number;
  readonly vx: number;
  readonly vy: number;
  readonly ax: number;
  readonly ay: number;
  readonly bx: number;
  readonly by: number;
  readonly cx: number;
  readonly cy: number;
  readonly r: number;
  readonly a0: number;
  readonly sweep: number;
  /** Index of the loop the curve belongs to, and of the curves before and after it in that loop. */
  readonly loop: number;
  readonly prev: number;
  readonly next: number;
}

export function frameOf(region: Region): Frame {
  const b = regionBox(region);
  const s = Math.max(b.xmax - b.xmin, b.ymax - b.ymin);
  return { ox: (b.xmin + b.xmax) / 2, oy: (b.ymin + b.ymax) / 2, s };
}

/** Curves of every loop (outer loops counter-clockwise, holes clockwise: the solid lies on the left). */
export function curvesOf(region: Region, f: Frame): { curves: Curve[]; loops: number[][] } {
  const curves: Curve[] = [];
  const loops: number[][] = [];
  const add = (drawn: readonly Segment[]) => {
    // Splines enter the mesh as chords within 1e-7 of the section's size, far below the
    // finite-element error the solver states; circular and elliptical arcs are followed exactly.
    const loop = drawn.flatMap((seg): (LineSegment | ArcSegment | EllipseSegment)[] => {
      if (seg.kind !== 'spline') return [seg];
      const pts = flattenSegment(seg, 1e-7 * f.s);
      return pts.slice(1).map((p, i) => line(pts[i]!, p));
    });
    const first = curves.length;
    const n = loop.length;
    const li = loops.length;
    const ids: number[] = [];
    loop.forEach((seg, i) => {
      const prev = first + ((i + n - 1) % n);
      const next = first + ((i + 1) % n);
      ids.push(curves.length);
      if (seg.kind === 'line')
        curves.push({
          arc: false,
          ax: (seg.a.x - f.ox) / f.s,
          ay: (seg.a.y - f.oy) / f.s,
          bx: (seg.b.x - f.ox) / f.s,
          by: (seg.b.y - f.oy) / f.s,
          ux: 0,
          uy: 0,
          vx: 0,
          vy: 0,
          cx: 0,
          cy: 0,
          r: 0,
          a0: 0,
          sweep: 0,
          loop: li,
          prev,
          next,
        });
      else {
        const cx = (seg.c.x - f.ox) / f.s;
        const cy = (seg.c.y - f.oy) / f.s;
        const [ux, uy, vx, vy] =
          seg.kind === 'arc' ? [seg.r / f.s, 0, 0, seg.r / f.s] : [seg.u.x / f.s, seg.u.y / f.s, seg.v.x / f.s, seg.v.y / f.s];
        // Semi-axes are the singular values of [u v].
        const pp = ux * ux + uy * uy + vx * vx + vy * vy;
        const q = Math.abs(ux * vy - uy * vx);
        const disc = Math.sqrt(Math.max(0, pp * pp - 4 * q * q));
        const a = Math.sqrt((pp + disc) / 2);
        const b = q / a;
        const at = (th: number) => [cx + ux * Math.cos(th) + vx * Math.sin(th), cy + uy * Math.cos(th) + vy * Math.sin(th)] as const;
        const [ax, ay] = at(seg.start);
        const [bx, by] = at(seg.start + seg.sweep);
        curves.push({ arc: true, ux, uy, vx, vy, ax, ay, bx, by, cx, cy, r: (b * b) / a, a0: seg.start, sweep: seg.sweep, loop: li, prev, next });
      }
    });
    loops.push(ids);
  };
  for (const p of region.parts) {
    add(p.outer);
    for (const h of p.holes) add(h);
  }
  return { curves, loops };
}

export function curveX(c: Curve, t: number): number {
  if (!c.arc) return c.ax + t * (c.bx - c.ax);
  const th = c.a0 + t * c.sweep;
  return c.cx + c.ux * Math.cos(th) + c.vx * Math.sin(th);
}

export function curveY(c: Curve, t: number): number {
  if (!c.arc) return c.ay + t * (c.by - c.ay);
  const th = c.a0 + t * c.sweep;
  return c.cy + c.uy * Math.cos(th) + c.vy * Math.sin(th);
}

/**
 * Side node of a quadratic element side on an arc between parameters t0 and t1: on the ray to the
 * arc's middle, where the quadratic side through the two ends and this node encloses the same
 * area as the arc (rather than on the arc, where it cuts off 1/16 of the segment's area more or
 * less than the arc). The boundary's area error then vanishes and its first-order effect on J
 * with it, so the remaining geometric error is of higher order than the element's and the
 * Richardson estimate sees one error of one sign. For a circle of radius r and half-turn φ the
 * side's height over the chord is h = 3r(2φ − sin 2φ)/(8 sin φ) (segment area r²(2φ − sin 2φ)/2,
 * parabolic area ⅔·chord·h), i.e. the node at radius ρr, ρ = cos φ + h/r; an elliptical arc is
 * the affine image of a circular one, and both areas scale alike.
 */
export function arcSideNode(c: Curve, t0: number, t1: number): [number, number] {
  const phi = Math.abs((t1 - t0) * c.sweep) / 2;
  const rho = Math.cos(phi) + (3 * (2 * phi - Math.sin(2 * phi))) / (8 * Math.sin(phi));
  const th = c.a0 + ((t0 + t1) / 2) * c.sweep;
  return [c.cx + rho * (c.ux * Math.cos(th) + c.vx * Math.sin(th)), c.cy + rho * (c.uy * Math.cos(th) + c.vy * Math.sin(th))];
}

/** Unit tangent in the direction of travel at parameter t. */
export function curveTangent(c: Curve, t: number): [number, number] {
  if (!c.arc) {
    const l = Math.hypot(c.bx - c.ax, c.by - c.ay);
    return [(c.bx - c.ax) / l, (c.by - c.ay) / l];
  }
  const th = c.a0 + t * c.sweep;
  const sg = Math.sign(c.sweep);
  const dx = (-c.ux * Math.sin(th) + c.vx * Math.cos(th)) * sg;
  const dy = (-c.uy * Math.sin(th) + c.vy * Math.cos(th)) * sg;
  const l = Math.hypot(dx, dy);
  return [dx / l, dy / l];
}

/** Length of a line; for arcs an upper bound (largest semi-axis × |sweep|), enough to size pieces. */
export function curveLength(c: Curve): number {
  if (!c.arc) return Math.hypot(c.bx - c.ax, c.by - c.ay);
  return Math.max(Math.hypot(c.ux, c.uy), Math.hypot(c.vx, c.vy)) * Math.abs(c.sweep);
}
