import { readDrawing, type ParseLimits } from '@keelson/dxf';
import type { LengthUnit, OutputUnit } from '@keelson/geometry';
import { decodeDrawing } from './decode';
import { profileOf, type Profile } from './profile';

export interface ComputeOptions extends ParseLimits {
  /** Profile name (the CLI uses the file's base name). */
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
}

/**
 * One drawing, bytes or text, to one profile of the JSON contract: read (parser in a worker thread
 * with limits), resolved into a region, properties in the requested unit. Throws DxfError or
 * GeometryError on a drawing at fault (see `drawingFault`).
 */
export async function computeDrawing(input: Uint8Array | string, opts: ComputeOptions): Promise<Profile> {
  const text = typeof input === 'string' ? input : decodeDrawing(input);
  const drawing = await readDrawing(text, {
    file: opts.source,
    drawingUnits: opts.drawingUnits,
    maxBytes: opts.maxBytes,
    timeoutMs: opts.timeoutMs,
    maxMemoryMb: opts.maxMemoryMb,
  });
  return profileOf(drawing, opts.name, opts.source, { units: opts.units, torsion: opts.torsion });
}
