import type { OutputUnit } from '@keelson/geometry';
import { VERIFY_KEYS, keyUnit, type VerifyKey } from './keys';
import type { ManifestRow } from './manifest';
import { allowance, defaultTolerance, type Tolerance } from './tolerance';

/** One published value checked against the computed one, both in the row's units. */
export interface Check {
  readonly key: VerifyKey;
  /** Unit label, e.g. "cm⁴". */
  readonly unit: string;
  /** null when the computation gave no value for this key. */
  readonly computed: number | null;
  readonly published: number;
  /** computed − published. */
  readonly difference: number | null;
  /** difference / |published|; null when the published value is 0 or nothing was computed. */
  readonly relative: number | null;
  readonly tolerance: Tolerance;
  readonly toleranceSource: 'manifest' | 'default';
  /** Largest |difference| accepted: the tolerance plus the computation's own error bound. */
  readonly allowed: number;
  readonly pass: boolean;
}

/** The tolerance of a key for a row: its `<key>_tol` cell, else the documented default. */
export function toleranceFor(row: Pick<ManifestRow, 'tolerances'>, key: VerifyKey, units: OutputUnit): { tolerance: Tolerance; source: 'manifest' | 'default' } {
  const t = row.tolerances[key];
  return t ? { tolerance: t, source: 'manifest' } : { tolerance: defaultTolerance(key, units), source: 'default' };
}

/**
 * Checks every published value of a row (in key order) against the computed values. A relative
 * tolerance on Ixy, which is 0 for any section with an axis of symmetry, is taken of I1 when that is
 * larger than the published Ixy.
 */
export function checkRow(
  row: ManifestRow,
  values: Partial<Record<VerifyKey, number>>,
  accuracy: Partial<Record<VerifyKey, number>>,
): Check[] {
  const checks: Check[] = [];
  for (const key of VERIFY_KEYS) {
    const published = row.published[key];
    if (published === undefined) continue;
    const { tolerance, source } = toleranceFor(row, key, row.units);
    const computed = values[key] ?? null;
    const unit = keyUnit(key, row.units);
    if (computed === null) {
      checks.push({ key, unit, computed, published, difference: null, relative: null, tolerance, toleranceSource: source, allowed: 0, pass: false });
      continue;
    }
    const difference = computed - published;
    const scale = key === 'Ixy' ? Math.abs(values.I1 ?? 0) : 0;
    const allowed = allowance(tolerance, published, computed, accuracy[key] ?? 0, scale);
    checks.push({
      key,
      unit,
      computed,
      published,
      difference,
      relative: published !== 0 ? difference / Math.abs(published) : null,
      tolerance,
      toleranceSource: source,
      allowed,
      pass: Math.abs(difference) <= allowed,
    });
  }
  return checks;
}
