import type { OutputUnit } from '@keelson/geometry';
import { PROPERTY_KEYS, TORSION_DIMENSION, type Profile, type ProfileKey } from '@keelson/profile/keys';
import { profileUnit } from './units';

/** RFC 4180 field: quoted when it holds a comma, quote or line break. */
const field = (s: string) => (/[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

/**
 * Header `name,source,units,A [mm²],…` (every property, its unit in the header) and one row per
 * profile at full precision. The header names one unit, so every row must be in it.
 */
export function formatCsv(profiles: readonly Profile[], units: OutputUnit): string {
  // Torsion columns appear when any profile has them; a profile without them leaves the cells empty.
  const torsion = profiles.some((p) => p.properties.J !== undefined) ? (Object.keys(TORSION_DIMENSION) as ProfileKey[]) : [];
  const keys: ProfileKey[] = [...PROPERTY_KEYS, ...torsion];
  const header = ['name', 'source', 'units', ...keys.map((k) => `${k} [${profileUnit(k, units)}]`)];
  const rows = profiles.map((p) => [p.name, p.source, p.units, ...keys.map((k) => String(p.properties[k] ?? ''))]);
  return [header, ...rows].map((r) => r.map(field).join(',')).join('\n') + '\n';
}
