import { VERIFY_KEYS, keyUnit, type VerifyKey } from './keys';
import { REPORT_CAUTION } from './caution';
import type { RunRecord } from './run';
import { formatTolerance } from './tolerance';

/** One value of the JSON export: always with its unit; the check's fields only where a value is published. */
export interface ExportValue {
  readonly value: number | null;
  readonly unit: string;
  readonly published?: number;
  readonly difference?: number | null;
  readonly tolerance?: string;
  readonly pass?: boolean;
}

/**
 * The run for machines: `schema`, the run's identity, summary and caution, then per profile its
 * identity, status, fault, warnings and `properties` keyed by the JSON contract's keys (plus `m`),
 * each `{value, unit}` and, where published, `published`, `difference`, `tolerance`, `pass`.
 * Values stay in each profile's own units, stated beside every number. No outlines: the report has those.
 */
export function verificationJson(run: RunRecord): string {
  const profiles = run.profiles.map((p) => {
    const checks = new Map(p.checks.map((c) => [c.key, c]));
    const properties: Partial<Record<VerifyKey, ExportValue>> = {};
    for (const k of VERIFY_KEYS) {
      const c = checks.get(k);
      const value = p.values[k];
      if (value === undefined && !c) continue;
      const unit = keyUnit(k, p.units);
      properties[k] = c
        ? { value: value ?? null, unit, published: c.published, difference: c.difference, tolerance: formatTolerance(c.tolerance, unit), pass: c.pass }
        : { value: value!, unit };
    }
    return {
      id: p.id,
      drawing: p.drawing,
      drawingSha256: p.drawingHash,
      revision: p.revision,
      material: p.material,
      units: p.units,
      status: p.status,
      fault: p.fault,
      warnings: p.warnings,
      properties,
    };
  });
  const doc = {
    schema: 'keelson.verification-export/1',
    run: {
      id: run.id,
      catalogue: run.catalogue,
      startedAt: run.startedAt,
      finishedAt: run.finishedAt,
      codeVersion: run.codeVersion,
      manifest: run.manifest,
    },
    caution: REPORT_CAUTION,
    summary: run.summary,
    materials: run.materials,
    profiles,
    unlisted: run.unlisted,
  };
  return `${JSON.stringify(doc, null, 2)}\n`;
}
