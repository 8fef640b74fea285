import { lengthFactor, type OutputUnit } from '@keelson/geometry';

/**
 * Mass per metre of a prismatic member, kg/m: m = A · ρ with A converted to m² (area in `unit`²,
 * density ρ in kg/m³). Mass of the section as drawn: no coating, no rolling tolerance.
 */
export function massPerMetre(area: number, unit: OutputUnit, density: number): number {
  return area * lengthFactor(unit, 'm') ** 2 * density;
}
