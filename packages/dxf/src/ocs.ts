import { transformSegment, type Affine, type Segment } from '@keelson/geometry';
import type { Fields, Vec3 } from './fields';

const cross = (a: Vec3, b: Vec3): Vec3 => ({ x: a.y * b.z - a.z * b.y, y: a.z * b.x - a.x * b.z, z: a.x * b.y - a.y * b.x });
const unit = (a: Vec3): Vec3 => {
  const n = Math.hypot(a.x, a.y, a.z);
  return { x: a.x / n, y: a.y / n, z: a.z / n };
};

/**
 * Axes of the object coordinate system of an entity with extrusion direction n, by the DXF
 * arbitrary-axis algorithm (AutoCAD DXF Reference, "Arbitrary Axis Algorithm"): when n is within
 * 1/64 of the world z-axis, Ax = Wy × n, otherwise Ax = Wz × n; then Ay = n × Ax.
 */
export function ocsAxes(n: Vec3): { ax: Vec3; ay: Vec3; az: Vec3 } {
  const az = unit(n);
  const near = Math.abs(az.x) < 1 / 64 && Math.abs(az.y) < 1 / 64;
  const ax = unit(cross(near ? { x: 0, y: 1, z: 0 } : { x: 0, y: 0, z: 1 }, az));
  const ay = unit(cross(az, ax));
  return { ax, ay, az };
}

/** How far the extrusion may lean off ±z (sine of the angle) before the entity leaves the drawing plane. */
const PLANAR = 1e-9;

/**
 * The map from OCS x, y to world x, y for an entity lying in a plane parallel to the world xy-plane:
 * identity for n = (0, 0, 1), the mirror x → −x for n = (0, 0, −1). Null when the entity's plane
 * is tilted, so its circles would project to ellipses: a cross-section is drawn flat.
 */
export function ocsToWorld(n: Vec3): Affine | null {
  const len = Math.hypot(n.x, n.y, n.z);
  if (!(len > 0) || !(Math.hypot(n.x, n.y) <= PLANAR * len)) return null;
  const { ax, ay } = ocsAxes(n);
  return { a: ax.x, b: ay.x, c: ax.y, d: ay.y, tx: 0, ty: 0 };
}

export const isIdentity = (t: Affine): boolean => t.a === 1 && t.b === 0 && t.c === 0 && t.d === 1 && t.tx === 0 && t.ty === 0;

/** OCS → world map of an entity (its extrusion by default), refusing one not drawn parallel to the xy-plane. */
export function planeOf(f: Fields, n: Vec3 = f.extrusion()): (s: Segment) => Segment {
  const t = ocsToWorld(n);
  if (!t) f.fail('INVALID_ENTITY', `not drawn in the xy-plane (extrusion direction ${n.x}, ${n.y}, ${n.z})`);
  return isIdentity(t) ? (s) => s : (s) => transformSegment(t, s);
}
