import type { OutputUnit } from '@keelson/geometry';
import { csvText } from './csv';
import { VERIFY_KEYS, keyFactor, keyUnit } from './keys';
import type { RunRecord } from './run';

/**
 * The run as one CSV row per profile for a PLM import. Column names are stable and carry their unit:
 * `run_id, profile_id, drawing, revision, material, status, failed_properties, fault, drawing_sha256`,
 * then for every key in a fixed order `<key> [unit]` (computed), `<key> published [unit]` and
 * `<key> pass` (true, false or blank when not published). Every value is converted to `unit` so that
 * one header fits all rows; numbers at full precision.
 */
export function verificationCsv(run: RunRecord, unit: OutputUnit = 'mm'): string {
  const header = ['run_id', 'profile_id', 'drawing', 'revision', 'material', 'status', 'failed_properties', 'fault', 'drawing_sha256'];
  for (const k of VERIFY_KEYS) header.push(`${k} [${keyUnit(k, unit)}]`, `${k} published [${keyUnit(k, unit)}]`, `${k} pass`);
  const rows = run.profiles.map((p) => {
    const checks = new Map(p.checks.map((c) => [c.key, c]));
    const cells = [
      run.id,
      p.id,
      p.drawing,
      p.revision,
      p.material,
      p.status,
      p.checks.filter((c) => !c.pass).map((c) => c.key).join(' '),
      p.fault ? `${p.fault.code}: ${p.fault.message}` : '',
      p.drawingHash ?? '',
    ];
    for (const k of VERIFY_KEYS) {
      const f = keyFactor(k, p.units, unit);
      const v = p.values[k];
      const c = checks.get(k);
      cells.push(v === undefined ? '' : String(v * f), c ? String(c.published * f) : '', c ? String(c.pass) : '');
    }
    return cells;
  });
  return csvText([header, ...rows]);
}
