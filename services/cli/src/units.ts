import { PROPERTY_DIMENSION, propertyUnit, type LengthUnit, type PropertyKey } from '@keelson/geometry';
import { TORSION_DIMENSION, type ProfileKey } from '@keelson/profile/keys';

/** Unit label of any profile key: "mm⁴" for I and J, "mm⁶" for Cw, "deg" for theta. */
export function profileUnit(key: ProfileKey, unit: LengthUnit): string {
  if (key in PROPERTY_DIMENSION) return propertyUnit(key as PropertyKey, unit);
  return unit + ['', '', '²', '³', '⁴', '⁵', '⁶'][TORSION_DIMENSION[key as keyof typeof TORSION_DIMENSION]];
}
