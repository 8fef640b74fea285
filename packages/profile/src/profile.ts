import {
  convertProperties,
  lengthFactor,
  symmetries,
  sectionProperties,
  type PropertyKey,
  type SectionProperties,
} from '@keelson/geometry';
import { deviationBounds, type Drawing } from '@keelson/dxf';
import { torsionProperties } from '@keelson/torsion';
import { EXACT, PROPERTY_KEYS, defaultOutputUnit, type Profile, type ProfileOptions, type TorsionValues } from './keys';

/**
 * Replaces values below the accuracy floor by 0: a centroid 1e-13 off a symmetric section's axis,
 * or Ixy = 1e-9 mm⁴ beside I = 1e6 mm⁴, is rounding noise and reads as 0 within the stated bound.
 */
function tidy(p: SectionProperties): SectionProperties {
  const out = { ...p };
  const size = Math.max(p.xmax - p.xmin, p.ymax - p.ymin);
  for (const k of ['cx', 'cy', 'xmin', 'xmax', 'ymin', 'ymax', 'xpna', 'ypna'] as const)
    if (Math.abs(out[k]) <= EXACT * size) out[k] = 0;
  if (Math.abs(out.Ixy) <= EXACT * p.I1) out.Ixy = 0;
  if (Math.abs(out.theta) <= 1e-9) out.theta = 0;
  return out;
}

/** Properties of a drawing's region, converted to `units` (default: the drawing's own). */
export function profileOf(drawing: Drawing, name: string, source: string, opts: ProfileOptions = {}): Profile {
  const out = opts.units ?? defaultOutputUnit(drawing.unit);
  const raw = sectionProperties(drawing.region);
  const properties = tidy(convertProperties(raw, drawing.unit, out));
  const warnings = [...drawing.warnings];
  const accuracy: Partial<Record<PropertyKey, number>> = {};
  // With I1 ≈ I2 the principal directions are ill-conditioned: theta and the moduli about them are not exact.
  const split = (raw.I1 - raw.I2) / (raw.I1 + raw.I2);
  const isotropic = split <= 1e-6;
  if (raw.theta === 0 && split <= 1e-12) warnings.push('I1 = I2: every centroidal axis is principal; theta shown as 0');
  else if (isotropic) warnings.push('I1 ≈ I2 (within 1e-6): the principal directions, theta, S1 and S2 are ill-conditioned');
  // Where the region is not the drawing to rounding (gaps closed, curves flattened), the first-order bound of each key.
  const bounds = deviationBounds(raw, drawing.deviation, drawing.stats.segments);
  const exact = !(drawing.deviation > 0);
  for (const k of PROPERTY_KEYS) {
    if (isotropic && (k === 'theta' || k === 'S1' || k === 'S2')) continue;
    const b = bounds[k];
    if (exact || b !== undefined) accuracy[k] = Math.max(EXACT, b ?? 0);
  }
  if (opts.torsion === false) return { name, source, units: out, properties, accuracy, warnings };

  const t = torsionProperties(drawing.region, { target: opts.torsion ?? 1e-3 });
  const f = lengthFactor(drawing.unit, out);
  // The shear centre lies on every axis of symmetry (and at the centre of a point-symmetric
  // section): where the drawing has one, that coordinate is exact, not a finite-element estimate.
  const sym = symmetries(drawing.region, { x: raw.cx, y: raw.cy }, EXACT * Math.max(raw.xmax - raw.xmin, raw.ymax - raw.ymin));
  // The centroid taken from `properties` is converted and tidied already (no 1e-18 for 0).
  const tAccuracy = { ...t.accuracy };
  let xs = t.xs * f;
  let ys = t.ys * f;
  if (sym.includes('mirror-x') || sym.includes('point')) [xs, tAccuracy.xs] = [properties.cx, EXACT];
  if (sym.includes('mirror-y') || sym.includes('point')) [ys, tAccuracy.ys] = [properties.cy, EXACT];
  const torsion: TorsionValues = { J: t.J * f ** 4, Cw: t.Cw * f ** 6, xs, ys };
  if (!t.converged) warnings.push(`torsion: target accuracy not reached within the mesh limit (J to ${t.accuracy.J.toPrecision(2)})`);
  return {
    name,
    source,
    units: out,
    properties: { ...properties, ...torsion },
    accuracy: { ...accuracy, ...tAccuracy },
    warnings,
  };
}
