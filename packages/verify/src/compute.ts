import { readDrawing } from '@keelson/dxf';
import { lengthFactor, type LengthUnit, type OutputUnit } from '@keelson/geometry';
import { decodeDrawing, profileOf, type Profile } from '@keelson/profile';
import { outlineOf, type Outline } from './outline';

/** A drawing's profile (the JSON contract entry) and its outline in the same unit. */
export interface Section {
  readonly profile: Profile;
  readonly outline: Outline;
}

export interface SectionOptions {
  readonly name: string;
  readonly source: string;
  /** Unit of the results: the manifest row's. */
  readonly units: OutputUnit;
  /** Unit of drawings that declare none. */
  readonly drawingUnits?: LengthUnit;
}

/**
 * A fault of one drawing reported by a computation that runs elsewhere (a service's worker thread):
 * code and one-line message as `drawingFault` gives them, recorded against that profile.
 */
export class SectionFault extends Error {
  override readonly name = 'SectionFault';
  constructor(
    readonly code: string,
    message: string,
  ) {
    super(message);
  }
}

/** Computes one drawing the way `computeDrawing` does, keeping the outline for the report. */
export type ComputeSection = (bytes: Uint8Array, opts: SectionOptions) => Promise<Section>;

export const computeSection: ComputeSection = async (bytes, opts) => {
  const drawing = await readDrawing(decodeDrawing(bytes), { file: opts.source, drawingUnits: opts.drawingUnits });
  const profile = profileOf(drawing, opts.name, opts.source, { units: opts.units });
  return { profile, outline: outlineOf(drawing.region, lengthFactor(drawing.unit, opts.units)) };
};
