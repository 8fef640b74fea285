import { readDrawing, readProfiles, type LayerSelection, type ParseLimits, type SplitMode } from '@keelson/dxf';
import type { LengthUnit, OutputUnit } from '@keelson/geometry';
import { decodeDrawing } from './decode';
import { drawingFault } from './fault';
import type { Profile } from './keys';
import { profileOf } from './profile';

export interface ComputeOptions extends ParseLimits, LayerSelection {
  /** Profile name (the CLI uses the file's base name); the stem of numbered profiles of a split drawing. */
  readonly name: string;
  /** Where the drawing came from, as shown to the user (a path, an upload or an archive entry name). */
  readonly source: string;
  /** Unit of the results; default the drawing's own (feet reported in inches). */
  readonly units?: OutputUnit;
  /** Relative error wanted on J (default 1e-3), or false to skip torsion and warping. */
  readonly torsion?: number | false;
  /** Unit of a drawing whose `$INSUNITS` is missing or wrong. */
  readonly drawingUnits?: LengthUnit;
  /** Largest drawing accepted, in bytes. */
  readonly maxBytes?: number;
  /** Segment ends closer than this join, in drawing units (default: the reader's, relative to the extent). */
  readonly joinTolerance?: number;
  /** How the drawing becomes profiles (default `none`: one profile). Only `computeProfiles` reads it. */
  readonly split?: SplitMode;
}

/** A profile of a split drawing that could not be computed: its entry in place of the profile (as in the CLI's JSON). */
export interface FailedProfile {
  readonly name: string;
  readonly source: string;
  readonly error: { readonly code: string; readonly message: string };
}

const readOptions = (opts: ComputeOptions) => ({
  file: opts.source,
  name: opts.name,
  drawingUnits: opts.drawingUnits,
  maxBytes: opts.maxBytes,
  timeoutMs: opts.timeoutMs,
  maxMemoryMb: opts.maxMemoryMb,
  layers: opts.layers,
  excludeLayers: opts.excludeLayers,
  hiddenLayers: opts.hiddenLayers,
  joinTolerance: opts.joinTolerance,
});

/**
 * One drawing, bytes or text, to one profile of the JSON contract: read, resolved into a region,
 * properties in the requested unit. Throws DxfError or GeometryError on a drawing at fault (see
 * `drawingFault`).
 */
export async function computeDrawing(input: Uint8Array | string, opts: ComputeOptions): Promise<Profile> {
  const text = typeof input === 'string' ? input : decodeDrawing(input);
  const drawing = await readDrawing(text, readOptions(opts));
  return profileOf(drawing, opts.name, opts.source, { units: opts.units, torsion: opts.torsion });
}

/**
 * Every profile of one drawing as `split` groups it (one without a split). A fault of the whole
 * drawing throws, as in `computeDrawing`; with a split, a profile at fault becomes its entry and
 * the others are computed.
 */
export async function computeProfiles(input: Uint8Array | string, opts: ComputeOptions): Promise<(Profile | FailedProfile)[]> {
  const text = typeof input === 'string' ? input : decodeDrawing(input);
  const set = await readProfiles(text, { ...readOptions(opts), split: opts.split });
  return set.profiles.map((d) => {
    if ('error' in d) return { name: d.name, source: opts.source, error: { code: d.error.code, message: d.error.message } };
    try {
      return profileOf(d, d.name, opts.source, { units: opts.units, torsion: opts.torsion });
    } catch (e) {
      const f = drawingFault(e, opts.source);
      if (!f || set.profiles.length === 1) throw e;
      return { name: d.name, source: opts.source, error: { code: f.code, message: f.message } };
    }
  });
}
