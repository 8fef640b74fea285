import { PROPERTY_DIMENSION, lengthFactor, type OutputUnit } from '@keelson/geometry';
import { PROPERTY_KEYS, TORSION_DIMENSION, type Profile } from '@keelson/profile';

const SUPERSCRIPT = ['', '', '²', '³', '⁴', '⁵', '⁶'];
const DIMENSION: Record<string, number> = { ...PROPERTY_DIMENSION, ...TORSION_DIMENSION };

const unitOf = (key: string, u: OutputUnit) => (DIMENSION[key] === 0 ? 'deg' : `${u}${SUPERSCRIPT[DIMENSION[key]!] ?? ''}`);

/** RFC 4180 field: quoted when it holds a comma, quote or line break. */
const field = (s: string) => (/[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

/**
 * `name,source,units,A [mm²],…` and one row per profile at full precision, as the CLI's `--csv`.
 * The header states one unit, so profiles in another unit are converted to it; torsion columns
 * (J, Cw, xs, ys) appear when any profile has them, empty where one does not.
 */
export function profilesCsv(profiles: readonly Profile[], units: OutputUnit): string {
  const torsion = Object.keys(TORSION_DIMENSION).filter((k) => profiles.some((p) => k in p.properties));
  const keys: string[] = [...PROPERTY_KEYS, ...torsion];
  const header = ['name', 'source', 'units', ...keys.map((k) => `${k} [${unitOf(k, units)}]`)];
  const rows = profiles.map((p) => {
    const f = lengthFactor(p.units, units);
    const props = p.properties as unknown as Record<string, number | undefined>;
    return [p.name, p.source, units, ...keys.map((k) => (props[k] === undefined ? '' : String(props[k]! * f ** DIMENSION[k]!)))];
  });
  return [header, ...rows].map((r) => r.map(field).join(',')).join('\r\n') + '\r\n';
}
