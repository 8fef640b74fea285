/**
 * The service's one error catalogue. Every error leaves as an RFC 9457 problem document
 * (`application/problem+json`) with a stable `code`; clients branch on `code`, never on text.
 * `type` is `/docs/errors#<code>` on this service, where the docs page lists this table.
 * A test checks that every code raised anywhere is in here and documented.
 */
export interface ErrorSpec {
  readonly status: number;
  readonly title: string;
  /** When it happens and what to do: shown on the docs page. */
  readonly doc: string;
}

export const ERRORS = {
  BAD_REQUEST: { status: 400, title: 'Bad request', doc: 'A parameter, field or header is missing or invalid; `errors` lists each one.' },
  EMPTY_UPLOAD: { status: 400, title: 'Empty upload', doc: 'The multipart field `file` is missing or holds no bytes.' },
  MALFORMED_UPLOAD: { status: 400, title: 'Malformed upload', doc: 'The multipart body could not be read to its end (truncated, or not multipart/form-data).' },
  UNAUTHENTICATED: { status: 401, title: 'Authentication required', doc: 'No `Authorization: Bearer <key>` header; the service has API keys configured.' },
  INVALID_API_KEY: { status: 401, title: 'Invalid API key', doc: 'The bearer key is not one of the configured keys.' },
  NOT_FOUND: { status: 404, title: 'Not found', doc: 'No such route.' },
  JOB_NOT_FOUND: { status: 404, title: 'Job not found', doc: 'No job with this id belongs to your tenant (jobs of other tenants are not visible).' },
  METHOD_NOT_ALLOWED: { status: 405, title: 'Method not allowed', doc: 'The route exists but not with this method.' },
  NOT_ACCEPTABLE: { status: 406, title: 'Not acceptable', doc: 'The `Accept` header allows neither application/json nor text/csv.' },
  UPLOAD_TOO_LARGE: { status: 413, title: 'Upload too large', doc: 'The file is over the upload limit (`KEELSON_MAX_UPLOAD_MB`); split the catalogue.' },
  ARCHIVE_TOO_LARGE: { status: 413, title: 'Archive too large', doc: 'The ZIP lists too many entries or inflates past the limit on bytes actually inflated (a zip bomb stops here).' },
  TOO_MANY_DRAWINGS: { status: 413, title: 'Too many drawings', doc: '`/v1/compute` answers small inputs; send a catalogue this size to `/v1/jobs`.' },
  UNSUPPORTED_MEDIA_TYPE: { status: 415, title: 'Not a DXF drawing or ZIP archive', doc: 'The upload is neither an ASCII DXF drawing nor a ZIP archive of them.' },
  UNPROCESSABLE_DRAWING: { status: 422, title: 'Drawing cannot be resolved', doc: 'The drawing was read but is at fault; `detail` is the one-line cause the command line prints and `drawingCode` the reader\'s code (see below).' },
  BAD_ARCHIVE: { status: 422, title: 'Unreadable archive', doc: 'The upload starts like a ZIP archive but cannot be read (corrupt), or holds no DXF drawing.' },
  RATE_LIMITED: { status: 429, title: 'Too many requests', doc: 'Over the request rate allowed per key (per address without keys); wait for `Retry-After` seconds.' },
  INTERNAL: { status: 500, title: 'Internal error', doc: 'A fault of the service, not of the input; the log has it under the request id.' },
  OVERLOADED: { status: 503, title: 'Overloaded', doc: 'The computation queue is full; retry after `Retry-After` seconds, or send the input as a job.' },
  SHUTTING_DOWN: { status: 503, title: 'Shutting down', doc: 'The service is stopping; retry on another instance or shortly.' },
  DRAWING_TIMEOUT: { status: 422, title: 'Drawing took too long', doc: 'Computing one drawing passed the per-drawing time limit (`KEELSON_DRAWING_TIMEOUT_MS`); try `torsion=false`.' },
  DRAWING_MEMORY: { status: 422, title: 'Drawing took too much memory', doc: 'Computing one drawing passed the worker thread\'s memory limit.' },
  FOLDER_NOT_ALLOWED: { status: 403, title: 'Folder not allowed', doc: 'A catalogue folder must lie inside a folder the administrator allowed (`KEELSON_CATALOGUE_FOLDERS`); otherwise upload the catalogue as a ZIP.' },
  CATALOGUE_NOT_FOUND: { status: 404, title: 'Catalogue not found', doc: 'No catalogue with this id belongs to your tenant.' },
  RUN_NOT_FOUND: { status: 404, title: 'Run not found', doc: 'No verification run with this id belongs to one of your catalogues (or, for a diff, there is no earlier run to compare with).' },
  RUN_IN_PROGRESS: { status: 409, title: 'Run in progress', doc: 'A verification of this catalogue is running; one at a time per catalogue. Its result appears in the catalogue\'s runs.' },
  INVALID_CATALOGUE: { status: 422, title: 'Catalogue cannot be verified', doc: 'The catalogue has no drawings or no manifest, or the manifest is at fault; `detail` names the file, line and column, `reason` the code.' },
} as const satisfies Record<string, ErrorSpec>;

export type ErrorCode = keyof typeof ERRORS;

/**
 * Codes of faults in a single drawing, as reported per drawing (job results, ZIP entries) and as
 * `drawingCode` of an UNPROCESSABLE_DRAWING problem. The reader's codes come from @keelson/dxf and
 * @keelson/geometry; the rest are the service's own.
 */
export const DRAWING_CODES: Readonly<Record<string, string>> = {
  EMPTY_FILE: 'The drawing is empty or only whitespace.',
  TOO_LARGE: 'The drawing is over the size cap of the reader.',
  BINARY_DXF: 'A binary DXF: only ASCII DXF is read; save as ASCII DXF.',
  NOT_DXF: 'The file does not start like a DXF group-code/value file.',
  MALFORMED: 'A group code that is not an integer, or a structure that does not hold together.',
  TRUNCATED: 'The file ends before its EOF marker.',
  PARSE_TIMEOUT: 'Reading the drawing ran past its time limit.',
  PARSE_MEMORY: 'Reading the drawing would pass its memory limit.',
  MISSING_UNIT: '`$INSUNITS` is missing or 0: give the field `drawingUnits`.',
  UNKNOWN_UNIT: '`$INSUNITS` names a unit Keelson does not read: give the field `drawingUnits`.',
  NON_FINITE: 'A NaN or infinite coordinate, radius, angle or bulge.',
  INVALID_ENTITY: 'An entity with a zero or negative radius, missing points, or out of the drawing plane.',
  UNSUPPORTED_ENTITY: 'An entity whose exact shape the file does not hold (a SPLINE of fit points only).',
  INVALID_BLOCK: 'An INSERT of an undefined block, a block inserting itself, or nesting too deep.',
  TOO_COMPLEX: 'Blocks and arrays expand past the segment limit.',
  NO_CLOSED_OUTLINE: 'No loop of the drawing closes.',
  OPEN_OUTLINE: 'Some loops close, but other segments leave open ends (their coordinates are in the message).',
  BRANCHING_OUTLINE: 'Three or more segment ends meet at one point.',
  CROSSING_OUTLINE: 'An outline crosses, touches or overlaps itself.',
  INVALID_GEOMETRY: 'The exact core rejected the loops (zero area, coordinates out of range).',
  EMPTY_REGION: 'The region has no area.',
  DEGENERATE_LOOP: 'A loop with no area.',
  OPEN_LOOP: 'A loop that does not close.',
  INVALID_SEGMENT: 'A segment the geometry core cannot integrate.',
  BAD_ENTRY: 'A ZIP entry refused by name: absolute path, `../`, NUL character, or a nested archive.',
  ENTRY_TOO_LARGE: 'A ZIP entry that inflates past the per-entry limit.',
  DRAWING_TIMEOUT: ERRORS.DRAWING_TIMEOUT.doc,
  DRAWING_MEMORY: ERRORS.DRAWING_MEMORY.doc,
  GAVE_UP: 'Computing the drawing stopped the service three times (crash); it is not tried again.',
  INTERNAL: 'A fault of the service while computing this drawing; the log has it.',
};

/** An error to send as a problem document. */
export class ApiError extends Error {
  override readonly name = 'ApiError';
  readonly status: number;
  constructor(
    readonly code: ErrorCode,
    detail?: string,
    /** Extension members of the problem document (RFC 9457 §3.2). */
    readonly extra: Readonly<Record<string, unknown>> = {},
    /** Response headers such as Retry-After. */
    readonly headers: Readonly<Record<string, string>> = {},
  ) {
    super(detail ?? ERRORS[code].title);
    this.status = ERRORS[code].status;
  }
  /** Fastify reads `statusCode` off thrown errors (the rate limiter throws what we build). */
  get statusCode(): number {
    return this.status;
  }
}

export interface Problem {
  type: string;
  title: string;
  status: number;
  detail: string;
  code: ErrorCode;
  requestId?: string;
  [extension: string]: unknown;
}

export function problemOf(e: ApiError, requestId?: string): Problem {
  return {
    type: `/docs/errors#${e.code}`,
    title: ERRORS[e.code].title,
    status: e.status,
    detail: e.message,
    code: e.code,
    ...(requestId ? { requestId } : {}),
    ...e.extra,
  };
}
