import {
  PROPERTY_DIMENSION,
  convertProperties,
  sectionProperties,
  type LengthUnit,
  type OutputUnit,
  type PropertyKey,
  type SectionProperties,
} from '@keelson/geometry';
import { deviationBounds, type Drawing } from '@keelson/dxf';

/** One profile of the CLI's JSON contract. */
export interface Profile {
  readonly name: string;
  readonly source: string;
  readonly units: OutputUnit;
  readonly properties: SectionProperties;
  /** Relative error bound of each key: closed form, widened where the region departs from the drawing (`Drawing.deviation`). */
  readonly accuracy: Partial<Record<PropertyKey, number>>;
  readonly warnings: string[];
}

/** Every property key, in the order SectionProperties declares them. */
export const PROPERTY_KEYS = Object.keys(PROPERTY_DIMENSION) as PropertyKey[];

/**
 * Bound on the relative error of the closed-form properties: Green's-theorem sums with compensated
 * summation, arcs exact, plastic axes bisected to the last bit; relative to each quantity's natural
 * scale (the section's size for positions, I1 for Ixy).
 */
export const EXACT = 1e-10;

/** Results are reported in the drawing's unit, but drawings in feet in inches. */
export const defaultOutputUnit = (u: LengthUnit): OutputUnit => (u === 'ft' ? 'in' : u);

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
export function profileOf(drawing: Drawing, name: string, source: string, units?: OutputUnit): Profile {
  const out = units ?? defaultOutputUnit(drawing.unit);
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
  return { name, source, units: out, properties, accuracy, warnings };
}
