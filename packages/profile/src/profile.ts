import {
  PROPERTY_DIMENSION,
  convertProperties,
  lengthFactor,
  symmetries,
  sectionProperties,
  type LengthUnit,
  type OutputUnit,
  type PropertyKey,
  type SectionProperties,
} from '@keelson/geometry';
import { deviationBounds, type Drawing } from '@keelson/dxf';
import { torsionProperties } from '@keelson/torsion';

/** Torsion and warping, by finite elements: J (L⁴), Cw about the shear centre (L⁶), shear centre xs, ys (L). */
export interface TorsionValues {
  J: number;
  Cw: number;
  xs: number;
  ys: number;
}

export type ProfileKey = PropertyKey | keyof TorsionValues;

/** One profile of the CLI's JSON contract. */
export interface Profile {
  readonly name: string;
  readonly source: string;
  readonly units: OutputUnit;
  /** Exact properties, plus J, Cw, xs, ys unless torsion was switched off. */
  readonly properties: SectionProperties & Partial<TorsionValues>;
  /**
   * Relative error of each key: the closed-form bound for exact ones, the finite-element estimate
   * (two mesh levels, Richardson) for J, Cw, and for xs, ys relative to the section's size.
   */
  readonly accuracy: Partial<Record<ProfileKey, number>>;
  readonly warnings: string[];
}

/** Every exact property key, in the order SectionProperties declares them. */
export const PROPERTY_KEYS = Object.keys(PROPERTY_DIMENSION) as PropertyKey[];

/** Power of length of each torsion key. */
export const TORSION_DIMENSION: Record<keyof TorsionValues, number> = { J: 4, Cw: 6, xs: 1, ys: 1 };

export interface ProfileOptions {
  /** Unit of the results; default the drawing's own (feet reported in inches). */
  readonly units?: OutputUnit;
  /** Relative error wanted on J (default 1e-3), or false to skip torsion and warping. */
  readonly torsion?: number | false;
}

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
  const tAccuracy = { ...t.accuracy };
  let { xs, ys } = t;
  if (sym.includes('mirror-x') || sym.includes('point')) [xs, tAccuracy.xs] = [raw.cx, EXACT];
  if (sym.includes('mirror-y') || sym.includes('point')) [ys, tAccuracy.ys] = [raw.cy, EXACT];
  const torsion: TorsionValues = { J: t.J * f ** 4, Cw: t.Cw * f ** 6, xs: xs * f, ys: ys * f };
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
