import { z } from 'zod';
import { SPLIT_MODES } from '@keelson/dxf';
import { LENGTH_UNITS, OUTPUT_UNITS } from '@keelson/geometry';

const flag = z.enum(['true', 'false', '1', '0']).transform((v) => v === 'true' || v === '1');
/** "A,B*" → ["A", "B*"], as the CLI's --layers. */
const patterns = z
  .string()
  .max(1000)
  .transform((v) => v.split(',').map((p) => p.trim()).filter(Boolean));

/**
 * Form fields of an upload (multipart text fields, validated after the stream is read: route
 * schemas cannot see inside multipart). All optional, named as the CLI's options in camel case;
 * unknown fields are refused, not ignored.
 */
export const UploadFields = z
  .object({
    units: z.enum(OUTPUT_UNITS).optional(),
    drawingUnits: z.enum(LENGTH_UNITS).optional(),
    split: z.enum(SPLIT_MODES).optional(),
    layers: patterns.optional(),
    excludeLayers: patterns.optional(),
    hiddenLayers: flag.optional(),
    joinTolerance: z.coerce.number().positive().finite().optional(),
    torsion: flag.optional(),
    accuracy: z.coerce.number().gt(0).lte(0.1).optional(),
  })
  .strict();

export type UploadFields = z.infer<typeof UploadFields>;

/** What changes a result: part of its cache key. */
export interface Settings {
  readonly units?: (typeof OUTPUT_UNITS)[number];
  readonly drawingUnits?: (typeof LENGTH_UNITS)[number];
  readonly split?: (typeof SPLIT_MODES)[number];
  readonly layers?: string[];
  readonly excludeLayers?: string[];
  readonly hiddenLayers?: boolean;
  readonly joinTolerance?: number;
  /** Target relative error on J, or false for no torsion. */
  readonly torsion: number | false;
}

export function settingsOf(f: UploadFields): Settings {
  const { torsion, accuracy, ...rest } = f;
  const defined = Object.fromEntries(Object.entries(rest).filter(([, v]) => v !== undefined));
  return { ...defined, torsion: torsion === false ? false : (accuracy ?? 1e-3) };
}

/** Same settings, same string: keys sorted. */
export const canonical = (s: Settings): string =>
  JSON.stringify(Object.fromEntries(Object.entries(s).sort(([a], [b]) => (a < b ? -1 : 1))));
