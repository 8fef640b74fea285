import type { PropertyKey, SectionProperties } from './properties';

export const LENGTH_UNITS = ['mm', 'cm', 'm', 'in', 'ft'] as const;
export type LengthUnit = (typeof LENGTH_UNITS)[number];

/** Units a result may be reported in (feet are read from drawings but reported in inches). */
export const OUTPUT_UNITS = ['mm', 'cm', 'm', 'in'] as const;
export type OutputUnit = (typeof OUTPUT_UNITS)[number];

/** Length of one unit in millimetres (the inch is exactly 25.4 mm by the 1959 international agreement). */
const MM_PER_UNIT: Record<LengthUnit, number> = { mm: 1, cm: 10, m: 1000, in: 25.4, ft: 304.8 };

export function isLengthUnit(u: string): u is LengthUnit {
  return (LENGTH_UNITS as readonly string[]).includes(u);
}

export function isOutputUnit(u: string): u is OutputUnit {
  return (OUTPUT_UNITS as readonly string[]).includes(u);
}

/** Factor that turns a length in `from` into a length in `to`. */
export function lengthFactor(from: LengthUnit, to: LengthUnit): number {
  return MM_PER_UNIT[from] / MM_PER_UNIT[to];
}

/** Power of length of each property (0: angle in degrees, unchanged by a change of unit). */
export const PROPERTY_DIMENSION: Record<PropertyKey, number> = {
  A: 2,
  P: 1,
  cx: 1,
  cy: 1,
  xmin: 1,
  xmax: 1,
  ymin: 1,
  ymax: 1,
  Ix: 4,
  Iy: 4,
  Ixy: 4,
  I1: 4,
  I2: 4,
  theta: 0,
  rx: 1,
  ry: 1,
  r1: 1,
  r2: 1,
  Sx_top: 3,
  Sx_bottom: 3,
  Sx: 3,
  Sy_right: 3,
  Sy_left: 3,
  Sy: 3,
  S1: 3,
  S2: 3,
  Zx: 3,
  Zy: 3,
  ypna: 1,
  xpna: 1,
};

export function convertProperties(p: SectionProperties, from: LengthUnit, to: LengthUnit): SectionProperties {
  const k = lengthFactor(from, to);
  const out = { ...p };
  for (const key of Object.keys(PROPERTY_DIMENSION) as PropertyKey[]) out[key] = p[key] * k ** PROPERTY_DIMENSION[key];
  return out;
}

/** Unit label of a property in a given length unit, e.g. "mm⁴", "deg". */
export function propertyUnit(key: PropertyKey, unit: LengthUnit): string {
  const d = PROPERTY_DIMENSION[key];
  if (d === 0) return 'deg';
  return unit + ['', '', '²', '³', '⁴'][d];
}
