/**
 * Stable codes for faults in a drawing; services map them to exit codes and HTTP problems.
 * Every one of them means "bad input": the file, not the program, is at fault.
 */
export const DXF_ERROR_CODES = [
  'EMPTY_FILE', // nothing but whitespace
  'TOO_LARGE', // over the input size cap
  'BINARY_DXF', // "AutoCAD Binary DXF" sentinel: only ASCII DXF is read
  'NOT_DXF', // does not start like a DXF group-code/value file
  'MALFORMED', // a group code that is not an integer, a structure that does not hold together
  'TRUNCATED', // ends before the EOF marker
  'PARSE_TIMEOUT', // reading ran past its time limit
  'PARSE_MEMORY', // reading would pass its memory limit
  'MISSING_UNIT', // $INSUNITS absent or 0 ("unitless") and no unit given by the caller
  'UNKNOWN_UNIT', // $INSUNITS names a unit Keelson does not read (miles, microns, ...)
  'NON_FINITE', // NaN or infinite coordinate, radius, angle or bulge
  'INVALID_ENTITY', // zero or negative radius, missing points, entity out of the drawing plane
  'UNSUPPORTED_ENTITY', // an entity whose exact shape the file does not hold (a SPLINE of fit points only)
  'INVALID_BLOCK', // INSERT of an undefined block, a block inserting itself, nesting too deep
  'TOO_COMPLEX', // blocks and arrays expand past the segment limit
  'NO_CLOSED_OUTLINE', // no loop closes
  'OPEN_OUTLINE', // some loops close, but other segments leave open ends
  'BRANCHING_OUTLINE', // three or more segment ends meet at one point
  'CROSSING_OUTLINE', // an outline crosses itself, or loops still meet after they were united
  'INVALID_GEOMETRY', // the exact core rejected the loops (zero area), coordinates out of range
] as const;

export type DxfErrorCode = (typeof DXF_ERROR_CODES)[number];

/** A fault in one drawing. `message` is one line: "<file>: <detail>". */
export class DxfError extends Error {
  override readonly name = 'DxfError';
  constructor(
    readonly code: DxfErrorCode,
    readonly file: string,
    readonly detail: string,
  ) {
    super(`${file}: ${oneLine(detail)}`);
  }
}

/** Collapses line breaks so a message stays on one line of a terminal or log. */
export function oneLine(s: string): string {
  return s.replace(/\s*[\r\n]+\s*/g, ' ').trim();
}
