import { allLoops, flattenSegment, regionBox, type Region } from '@keelson/geometry';

/** A section's outline for drawing: an SVG path (y up, as drawn) and its bounding box. */
export interface Outline {
  /** Every loop as a closed subpath; fill it with `fill-rule="evenodd"` and holes stay open. */
  readonly d: string;
  readonly box: { readonly xmin: number; readonly ymin: number; readonly xmax: number; readonly ymax: number };
}

/**
 * Flattens a region for display only (chords within 1/2000 of its size, then scaled by `factor`
 * into the result's unit), coordinates rounded to 1/100 000 of its size: enough for a picture,
 * a few kilobytes per profile in a stored run.
 */
export function outlineOf(region: Region, factor = 1): Outline {
  const b = regionBox(region);
  const size = Math.max(b.xmax - b.xmin, b.ymax - b.ymin);
  const digits = Math.min(20, Math.max(0, -Math.floor(Math.log10(size * factor * 1e-5))));
  const n = (v: number) => String(Number((v * factor).toFixed(digits)));
  const parts: string[] = [];
  for (const loop of allLoops(region)) {
    const pts = loop.flatMap((s, i) => flattenSegment(s, size / 2000).slice(i ? 1 : 0));
    pts.pop(); // the closing point repeats the first
    parts.push(`M${pts.map((p) => `${n(p.x)} ${n(p.y)}`).join('L')}Z`);
  }
  return { d: parts.join(''), box: { xmin: b.xmin * factor, ymin: b.ymin * factor, xmax: b.xmax * factor, ymax: b.ymax * factor } };
}
