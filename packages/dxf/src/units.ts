import type { LengthUnit } from '@keelson/geometry';
import { DxfError } from './errors';

/** `$INSUNITS` codes Keelson reads (AutoCAD DXF Reference, HEADER section variables). */
const READ: Readonly<Record<number, LengthUnit>> = { 1: 'in', 2: 'ft', 4: 'mm', 5: 'cm', 6: 'm' };

/** Names of the other codes, for messages (same reference). */
const NAMES: Readonly<Record<number, string>> = {
  0: 'unitless',
  3: 'miles',
  7: 'kilometres',
  8: 'microinches',
  9: 'mils',
  10: 'yards',
  11: 'ångströms',
  12: 'nanometres',
  13: 'microns',
  14: 'decimetres',
  15: 'decametres',
  16: 'hectometres',
  17: 'gigametres',
  18: 'astronomical units',
  19: 'light years',
  20: 'parsecs',
  21: 'US survey feet',
  22: 'US survey inches',
  23: 'US survey yards',
  24: 'US survey miles',
};

const HINT = 'pass --drawing-units mm|cm|m|in|ft';

/**
 * The drawing's length unit from `$INSUNITS`. A unit given by the caller wins (with a warning when
 * the file says otherwise); a missing or unitless header is never guessed.
 */
export function drawingUnit(insunits: unknown, file: string, given: LengthUnit | undefined, warnings: string[]): LengthUnit {
  const code = typeof insunits === 'number' && Number.isInteger(insunits) ? insunits : undefined;
  const declared = code === undefined ? undefined : READ[code];
  if (given) {
    if (code !== undefined && code !== 0 && declared !== given)
      warnings.push(`drawing declares $INSUNITS ${code} (${declared ?? NAMES[code] ?? 'unknown'}); read as ${given} as requested`);
    return given;
  }
  if (declared) return declared;
  if (code === undefined || code === 0) {
    const why = code === 0 ? '$INSUNITS is 0 (unitless)' : 'no $INSUNITS in the header';
    throw new DxfError('MISSING_UNIT', file, `drawing unit unknown: ${why}; ${HINT}`);
  }
  const name = NAMES[code] ? ` (${NAMES[code]})` : '';
  throw new DxfError('UNKNOWN_UNIT', file, `unsupported unit $INSUNITS ${code}${name}: Keelson reads mm, cm, m, in and ft; ${HINT}`);
}
