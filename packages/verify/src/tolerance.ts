import { lengthFactor, type OutputUnit } from '@keelson/geometry';
import { KEY_DIMENSION, type VerifyKey } from './keys';

/**
 * How far a computed value may lie from the published one. Relative: a fraction of the published
 * value (of the larger of it and I1 for Ixy, which crosses zero). Absolute: in the key's own unit
 * (the row's length unit to the key's power, degrees for theta, kg/m for m).
 */
export type Tolerance =
  | { readonly kind: 'relative'; readonly value: number }
  | { readonly kind: 'absolute'; readonly value: number };

/** Relative default for moduli, areas and the like: 3 significant figures round by up to 0.5 %. */
const PRINTED = { kind: 'relative', value: 0.01 } as const;
/**
 * Published J and Cw come from thin-wall and fillet approximations that differ from a finite-element
 * solution by up to 8 % (It) and 6 % (Iw) for rolled I-sections (BRIEF §3, European section tables).
 */
const TORSION = { kind: 'relative', value: 0.1 } as const;
/** Positions (centroid, fibres, neutral axes, shear centre) may be 0: absolute, 0.2 mm. */
const POSITION_MM = 0.2;
export const POSITION_KEYS: readonly VerifyKey[] = ['cx', 'cy', 'xmin', 'xmax', 'ymin', 'ymax', 'ypna', 'xpna', 'xs', 'ys'];

/** Documented defaults, used where the manifest has no `<key>_tol` cell. Positions are in millimetres. */
export const DEFAULT_TOLERANCES: Readonly<Record<VerifyKey, Tolerance>> = Object.fromEntries(
  (Object.keys(KEY_DIMENSION) as VerifyKey[]).map((k) => {
    if (k === 'J' || k === 'Cw') return [k, TORSION];
    if (k === 'theta') return [k, { kind: 'absolute', value: 0.5 }];
    if (POSITION_KEYS.includes(k)) return [k, { kind: 'absolute', value: POSITION_MM }];
    return [k, PRINTED];
  }),
) as Record<VerifyKey, Tolerance>;

/** The default tolerance of a key for values in `unit` (absolute position defaults converted from mm). */
export function defaultTolerance(key: VerifyKey, unit: OutputUnit): Tolerance {
  const t = DEFAULT_TOLERANCES[key];
  if (t.kind === 'absolute' && POSITION_KEYS.includes(key)) return { kind: 'absolute', value: t.value * lengthFactor('mm', unit) };
  return t;
}

/** Reads a `<key>_tol` cell: "0.5%" (relative) or a plain non-negative number (absolute); null if malformed. */
export function parseTolerance(text: string): Tolerance | null {
  const s = text.trim();
  const pct = /^([0-9]*\.?[0-9]+(?:[eE][-+]?[0-9]+)?)\s*%$/.exec(s);
  if (pct) return { kind: 'relative', value: Number(pct[1]) / 100 };
  if (!/^[0-9]*\.?[0-9]+(?:[eE][-+]?[0-9]+)?$/.test(s)) return null;
  return { kind: 'absolute', value: Number(s) };
}

/** "0.5 %" or "±0.2 mm" (the unit label supplied by the caller). */
export function formatTolerance(t: Tolerance, unit: string): string {
  return t.kind === 'relative' ? `${+(t.value * 100).toPrecision(6)} %` : `±${+t.value.toPrecision(6)} ${unit}`;
}

/**
 * The largest |computed − reference| accepted: the tolerance, plus the computation's own error bound
 * (relative `accuracy` × |computed|: exact properties 1e-10, finite-element J and Cw about 1e-3), so a
 * value is never failed for the method's noise. `scale` replaces a reference near zero for relative
 * tolerances (I1 for Ixy).
 */
export function allowance(t: Tolerance, reference: number, computed: number, accuracy = 0, scale = 0): number {
  const base = t.kind === 'relative' ? t.value * Math.max(Math.abs(reference), scale) : t.value;
  return base + accuracy * Math.abs(computed);
}
