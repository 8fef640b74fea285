import type { SplineSegment, WeightedPoint } from '@keelson/geometry';
import type { Fields } from './fields';

/** Highest degree the geometry core evaluates. */
const MAX_DEGREE = 25;

/**
 * Checks a NURBS read from a SPLINE or a HATCH spline edge: degree, counts, knots non-decreasing
 * over a non-empty range, weights positive. `what` names the curve in messages.
 */
export function checkNurbs(f: Fields, what: string, degree: number, knots: readonly number[], controls: readonly WeightedPoint[]): SplineSegment {
  if (!Number.isInteger(degree) || degree < 1 || degree > MAX_DEGREE) f.fail('INVALID_ENTITY', `${what} degree ${degree} is outside 1…${MAX_DEGREE}`);
  if (controls.length < degree + 1) f.fail('INVALID_ENTITY', `${what} of degree ${degree} has ${controls.length} control points; it needs ${degree + 1}`);
  if (knots.length !== controls.length + degree + 1)
    f.fail('INVALID_ENTITY', `${what} has ${knots.length} knots; ${controls.length} control points of degree ${degree} need ${controls.length + degree + 1}`);
  for (let i = 1; i < knots.length; i++) if (!(knots[i]! >= knots[i - 1]!)) f.fail('INVALID_ENTITY', `${what} knots decrease at knot ${i + 1}`);
  if (!(knots[controls.length]! > knots[degree]!)) f.fail('INVALID_ENTITY', `${what} has an empty parameter range`);
  for (const [i, c] of controls.entries()) if (!(c.w > 0)) f.fail('INVALID_ENTITY', `${what} weight ${c.w} of control point ${i + 1} is not positive`);
  return { kind: 'spline', degree, knots, controls };
}

/**
 * A SPLINE as the NURBS it stores: degree (71), knots (40), control points (10/20/30) and weights
 * (41, all 1 when absent), rational or not (AutoCAD DXF Reference, SPLINE). The curve lies in world
 * coordinates and must be flat in a plane parallel to the xy-plane.
 *
 * A SPLINE given by fit points only (11) is refused: its curve is whatever the drawing program's
 * fitting made of those points (knot spacing, end tangents, its own tolerance 44), which the file
 * does not pin down; interpolating them here would report the properties of a different curve.
 */
export function splineSegment(f: Fields): SplineSegment {
  const { tags } = f;
  const knots: number[] = [];
  const weights: number[] = [];
  const controls: { x: number; y: number; z: number }[] = [];
  let fit = 0;
  for (let k = f.at + 1; k < f.end; k++) {
    const code = tags.codes[k];
    if (code === 40) knots.push(f.numAt(k));
    else if (code === 41) weights.push(f.numAt(k));
    else if (code === 10) {
      if (tags.codes[k + 1] !== 20 || k + 1 >= f.end) f.fail('INVALID_ENTITY', `control point ${controls.length + 1} has no y (group 20) at line ${tags.line(k + 1)}`);
      const z = tags.codes[k + 2] === 30 && k + 2 < f.end ? f.numAt(k + 2) : 0;
      controls.push({ x: f.numAt(k), y: f.numAt(k + 1), z });
    } else if (code === 11) fit++;
  }
  if (!controls.length) {
    if (fit) f.fail('UNSUPPORTED_ENTITY', `defined by ${fit} fit points only: its exact curve is not in the file; save it with control points (e.g. convert to a control-vertex spline)`);
    f.fail('INVALID_ENTITY', 'has no control points');
  }
  if (weights.length && weights.length !== controls.length)
    f.fail('INVALID_ENTITY', `has ${weights.length} weights (group 41) for ${controls.length} control points`);
  const declared = [f.int(72, knots.length), f.int(73, controls.length)];
  if (declared[0] !== knots.length || declared[1] !== controls.length)
    f.fail('MALFORMED', `declares ${declared[0]} knots and ${declared[1]} control points (groups 72, 73) but ${knots.length} and ${controls.length} follow`);
  let [zmin, zmax, size] = [Infinity, -Infinity, 0];
  for (const c of controls) [zmin, zmax, size] = [Math.min(zmin, c.z), Math.max(zmax, c.z), Math.max(size, Math.abs(c.x), Math.abs(c.y))];
  if (zmax - zmin > 1e-9 * size) f.fail('INVALID_ENTITY', 'not drawn in a plane parallel to the xy-plane (control points at different heights)');
  return checkNurbs(
    f,
    'spline',
    f.int(71, 3),
    knots,
    controls.map((c, i) => ({ x: c.x, y: c.y, w: weights[i] ?? 1 })),
  );
}
