import { propertyUnit, type OutputUnit } from '@keelson/geometry';
import { PROPERTY_KEYS, type Profile } from './profile';

/** RFC 4180 field: quoted when it holds a comma, quote or line break. */
const field = (s: string) => (/[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

/**
 * Header `name,source,units,A [mm²],…` (every property, its unit in the header) and one row per
 * profile at full precision. The header names one unit, so every row must be in it.
 */
export function formatCsv(profiles: readonly Profile[], units: OutputUnit): string {
  const header = ['name', 'source', 'units', ...PROPERTY_KEYS.map((k) => `${k} [${propertyUnit(k, units)}]`)];
  const rows = profiles.map((p) => [p.name, p.source, p.units, ...PROPERTY_KEYS.map((k) => String(p.properties[k]))]);
  return [header, ...rows].map((r) => r.map(field).join(',')).join('\n') + '\n';
}
