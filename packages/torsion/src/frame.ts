import { flattenSegment, line, regionBox, type ArcSegment, type LineSegment, type Region, type Segment } from '@keelson/geometry';

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
 * (bx, by), or an arc about (cx, cy) of radius r from angle a0 through the signed angle sweep.
 */
export interface Curve {
  readonly arc: boolean;
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
    // Elliptical arcs and splines enter the mesh as chords within 1e-7 of the section's size,
    // far below the finite-element error the solver states.
    const loop = drawn.flatMap((seg): (LineSegment | ArcSegment)[] => {
      if (seg.kind === 'line' || seg.kind === 'arc') return [seg];
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
        const r = seg.r / f.s;
        curves.push({
          arc: true,
          ax: cx + r * Math.cos(seg.start),
          ay: cy + r * Math.sin(seg.start),
          bx: cx + r * Math.cos(seg.start + seg.sweep),
          by: cy + r * Math.sin(seg.start + seg.sweep),
          cx,
          cy,
          r,
          a0: seg.start,
          sweep: seg.sweep,
          loop: li,
          prev,
          next,
        });
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
  return c.arc ? c.cx + c.r * Math.cos(c.a0 + t * c.sweep) : c.ax + t * (c.bx - c.ax);
}

export function curveY(c: Curve, t: number): number {
  return c.arc ? c.cy + c.r * Math.sin(c.a0 + t * c.sweep) : c.ay + t * (c.by - c.ay);
}

/** Unit tangent in the direction of travel at parameter t. */
export function curveTangent(c: Curve, t: number): [number, number] {
  if (!c.arc) {
    const l = Math.hypot(c.bx - c.ax, c.by - c.ay);
    return [(c.bx - c.ax) / l, (c.by - c.ay) / l];
  }
  const a = c.a0 + t * c.sweep;
  const sg = Math.sign(c.sweep);
  return [-Math.sin(a) * sg, Math.cos(a) * sg];
}

export function curveLength(c: Curve): number {
  return c.arc ? c.r * Math.abs(c.sweep) : Math.hypot(c.bx - c.ax, c.by - c.ay);
}
