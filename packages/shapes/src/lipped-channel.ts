import { GeometryError, makeRegion, type Region } from '@keelson/geometry';
import { filletedPolygon } from './fillet';

/**
 * Cold-formed lipped channel (a C with stiffening lips) of constant thickness, as a folded strip:
 * web along the y-axis at x ∈ [0, t], flanges to +x, lips turned back towards the x-axis.
 * - h: overall depth (outside of flange to outside of flange)
 * - b: overall flange width (outside of web to outside of lip)
 * - c: overall lip length (outside of flange to lip tip)
 * - t: thickness
 * - ri: inside bend radius (default t); the outside radius is ri + t, so every bend is concentric
 *   and the wall stays t thick round it.
 * Lower-left outside corner at the origin.
 */
export function lippedChannel(d: { h: number; b: number; c: number; t: number; ri?: number }): Region {
  const { h, b, c, t } = d;
  const ri = d.ri ?? t;
  const ro = ri + t;
  if (!(t > 0 && ri >= 0)) throw new GeometryError('DEGENERATE_LOOP', `lipped channel needs t > 0 and ri ≥ 0`);
  if (!(c >= ro && h >= c + ro && b >= 2 * ro))
    throw new GeometryError('DEGENERATE_LOOP', `lipped channel ${h}×${b}×${c}×${t}: bends of radius ${ro} do not fit`);
  return makeRegion([
    {
      outer: filletedPolygon([
        { x: 0, y: 0, r: ro },
        { x: b, y: 0, r: ro },
        { x: b, y: c },
        { x: b - t, y: c },
        { x: b - t, y: t, r: ri },
        { x: t, y: t, r: ri },
        { x: t, y: h - t, r: ri },
        { x: b - t, y: h - t, r: ri },
        { x: b - t, y: h - c },
        { x: b, y: h - c },
        { x: b, y: h, r: ro },
        { x: 0, y: h, r: ro },
      ]),
      holes: [],
    },
  ]);
}

/**
 * Length of the lipped channel's mid-thickness line: straight parts plus four quarter bends of
 * radius ri + t/2. For a constant-thickness strip with concentric bends the area is exactly this
 * length times t.
 */
export function lippedChannelCentreline(d: { h: number; b: number; c: number; t: number; ri?: number }): number {
  const ri = d.ri ?? d.t;
  const ro = ri + d.t;
  return d.h - 2 * ro + 2 * (d.b - 2 * ro) + 2 * (d.c - ro) + 2 * Math.PI * (ri + d.t / 2);
}
