import { PROPERTY_DIMENSION, type LengthUnit, type OutputUnit, type PropertyKey, type SectionProperties } from '@keelson/geometry';

// Names, units and bounds of the profile contract, without the computation: light enough for
// callers that only format or check results (the CLI loads the finite-element code only when a
// drawing has been read).

/** Torsion and warping, by finite elements: J (L⁴), Cw about the shear centre (L⁶), shear centre xs, ys (L). */
export interface TorsionValues {
  J: number;
  Cw: number;
  xs: number;
  ys: number;
}

export type ProfileKey = PropertyKey | keyof TorsionValues;

/** One profile of the CLI's JSON contract. */
export interface Profile {
  readonly name: string;
  readonly source: string;
  readonly units: OutputUnit;
  /** Exact properties, plus J, Cw, xs, ys unless torsion was switched off. */
  readonly properties: SectionProperties & Partial<TorsionValues>;
  /**
   * Relative error of each key: the closed-form bound for exact ones, the finite-element estimate
   * (two mesh levels, Richardson) for J, Cw, and for xs, ys relative to the section's size.
   */
  readonly accuracy: Partial<Record<ProfileKey, number>>;
  readonly warnings: string[];
}

/** Every exact property key, in the order SectionProperties declares them. */
export const PROPERTY_KEYS = Object.keys(PROPERTY_DIMENSION) as PropertyKey[];

/** Power of length of each torsion key. */
export const TORSION_DIMENSION: Record<keyof TorsionValues, number> = { J: 4, Cw: 6, xs: 1, ys: 1 };

export interface ProfileOptions {
  /** Unit of the results; default the drawing's own (feet reported in inches). */
  readonly units?: OutputUnit;
  /** Relative error wanted on J (default 1e-3), or false to skip torsion and warping. */
  readonly torsion?: number | false;
}

/**
 * Bound on the relative error of the closed-form properties: Green's-theorem sums with compensated
 * summation, arcs exact, plastic axes bisected to the last bit; relative to each quantity's natural
 * scale (the section's size for positions, I1 for Ixy).
 */
export const EXACT = 1e-10;

/** Results are reported in the drawing's unit, but drawings in feet in inches. */
export const defaultOutputUnit = (u: LengthUnit): OutputUnit => (u === 'ft' ? 'in' : u);

