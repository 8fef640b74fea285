import type { Profile, ProfileKey } from '@keelson/profile/keys';
import { sig4 } from './number';
import { profileUnit } from './units';

export const CAUTION =
  'Computed geometric properties only; structural adequacy must be checked by a licensed engineer under local codes.';

/** Rows of the readable table: label (blank continues the one above), key. */
const ROWS: readonly (readonly [string, ProfileKey])[] = [
  ['Area', 'A'],
  ['Perimeter', 'P'],
  ['Centroid', 'cx'],
  ['', 'cy'],
  ['Second moment of area', 'Ix'],
  ['', 'Iy'],
  ['Product moment of area', 'Ixy'],
  ['Principal second moments', 'I1'],
  ['', 'I2'],
  ['Angle of the I1 axis from x', 'theta'],
  ['Radius of gyration', 'rx'],
  ['', 'ry'],
  ['Elastic modulus (least)', 'Sx'],
  ['', 'Sy'],
  ['Plastic modulus', 'Zx'],
  ['', 'Zy'],
  ['Torsion constant', 'J'],
  ['Warping constant', 'Cw'],
  ['Shear centre', 'xs'],
  ['', 'ys'],
];

/** Finite-element values carry their estimated error; closed-form ones are exact to the digits shown. */
function estimate(p: Profile, key: ProfileKey): string {
  const a = p.accuracy[key];
  return a !== undefined && a > 1e-9 && key !== 'xs' && key !== 'ys' ? `  ±${(a * 100).toPrecision(1)} %` : '';
}

function block(p: Profile): string[] {
  // Mantissas right-aligned, powers of ten and units in their own columns: 1695 above 4.126×10⁶.
  const cells = ROWS.filter(([, key]) => p.properties[key] !== undefined).map(([label, key]) => {
    const [mantissa, power = ''] = sig4(p.properties[key]!).split(/(?=×)/);
    return [label, key, mantissa!, power, profileUnit(key, p.units) + estimate(p, key)] as const;
  });
  const w = [0, 1, 2, 3].map((i) => Math.max(...cells.map((c) => c[i]!.length)));
  const lines = [`${p.name}  (${p.source}, ${p.units})`];
  for (const [label, key, mantissa, power, unit] of cells)
    lines.push(`  ${label.padEnd(w[0]!)}  ${key.padEnd(w[1]!)}  ${mantissa.padStart(w[2]!)}${power.padEnd(w[3]!)}  ${unit}`);
  for (const warning of p.warnings) lines.push(`  note: ${warning}`);
  return lines;
}

/** One block per profile, the main properties with units to four significant figures, then the caution. */
export function formatTable(profiles: readonly Profile[]): string {
  return [...profiles.flatMap((p) => [...block(p), '']), CAUTION].join('\n') + '\n';
}
