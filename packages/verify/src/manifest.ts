import { OUTPUT_UNITS, type OutputUnit } from '@keelson/geometry';
import { z } from 'zod';
import { parseCsv } from './csv';
import { VerifyError } from './errors';
import { sha256 } from './hash';
import { VERIFY_KEYS, type VerifyKey } from './keys';
import { materialSchema, materialTable, type Material, type MaterialInput } from './materials';
import { parseTolerance, type Tolerance } from './tolerance';

/** One profile of a catalogue with the values its datasheet publishes. */
export interface ManifestRow {
  readonly id: string;
  /** Drawing path relative to the manifest, `/`-separated. */
  readonly drawing: string;
  readonly revision: string;
  /** Id in the materials table. */
  readonly material: string;
  /** Unit of the published values (and of the results reported for this profile). */
  readonly units: OutputUnit;
  readonly description?: string;
  /** Published values by key; a key absent (a blank cell) is not checked. */
  readonly published: Partial<Record<VerifyKey, number>>;
  /** Tolerances from `<key>_tol` cells; other keys take the defaults. */
  readonly tolerances: Partial<Record<VerifyKey, Tolerance>>;
}

export interface Manifest {
  /** Where it was read from, as messages name it. */
  readonly source: string;
  /** SHA-256 of its text: runs record which manifest they checked against. */
  readonly hash: string;
  readonly rows: ManifestRow[];
  /** Built-in materials plus the custom ones declared. */
  readonly materials: Record<string, Material>;
}

const keyEnum = z.enum(VERIFY_KEYS as [VerifyKey, ...VerifyKey[]]);

const toleranceSchema = z.union([z.number().nonnegative(), z.string()]).transform((v, ctx): Tolerance => {
  const t = typeof v === 'number' ? { kind: 'absolute' as const, value: v } : parseTolerance(v);
  if (!t) {
    ctx.addIssue({ code: 'custom', message: `"${String(v)}" is not a tolerance: write 0.5% (relative) or a plain number (absolute)` });
    return z.NEVER;
  }
  return t;
});

const rowSchema = z.strictObject({
  id: z.string().trim().min(1, 'id is empty'),
  drawing: z.string().trim().min(1, 'drawing is empty'),
  revision: z.string().trim().default(''),
  material: z.string().trim().min(1, 'material is empty'),
  units: z.enum(OUTPUT_UNITS, { error: `units must be one of ${OUTPUT_UNITS.join(', ')}` }),
  description: z.string().optional(),
  published: z.partialRecord(keyEnum, z.number().refine(Number.isFinite, 'not a finite number')).default({}),
  tolerances: z.partialRecord(keyEnum, toleranceSchema).default({}),
});

/** The JSON manifest: `{ "materials"?: {id: {density, E, G}}, "profiles": [row, …] }`. */
export const manifestSchema = z.strictObject({
  materials: z.record(z.string(), materialSchema).optional(),
  profiles: z.array(rowSchema).min(1, 'the manifest lists no profile'),
});

const fail = (code: 'MANIFEST_SYNTAX' | 'MANIFEST_INVALID', msg: string): never => {
  throw new VerifyError(code, msg);
};

/** Columns a CSV manifest may have besides property keys and `<key>_tol`. */
const CSV_FIELDS = ['id', 'drawing', 'revision', 'material', 'units', 'description'] as const;
const NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;

/** CSV rows to the JSON manifest's object form, each with the line it came from. */
function csvProfiles(text: string, file: string): { profiles: unknown[]; lines: number[] } {
  const records = parseCsv(text, file);
  const header = records.shift();
  if (!header) return fail('MANIFEST_INVALID', `${file}: empty manifest`);
  const columns = header.cells.map((c) => c.trim());
  const seen = new Set<string>();
  for (const c of columns) {
    if (seen.has(c)) fail('MANIFEST_INVALID', `${file}: column "${c}" appears twice`);
    seen.add(c);
    const key = c.endsWith('_tol') ? c.slice(0, -4) : c;
    const known = (CSV_FIELDS as readonly string[]).includes(c) || (VERIFY_KEYS as string[]).includes(key);
    // A misspelt key would silently check nothing: refuse it.
    if (!known) fail('MANIFEST_INVALID', `${file}: unknown column "${c}"; columns are ${CSV_FIELDS.join(', ')}, property keys (A, Ix, …) and <key>_tol`);
  }
  const profiles = records.map(({ line, cells }) => {
    if (cells.length > columns.length) fail('MANIFEST_SYNTAX', `${file}: line ${line}: ${cells.length} cells for ${columns.length} columns`);
    const row: Record<string, unknown> = {};
    const published: Record<string, number> = {};
    const tolerances: Record<string, string> = {};
    columns.forEach((c, i) => {
      const v = (cells[i] ?? '').trim();
      if (v === '') return;
      if ((CSV_FIELDS as readonly string[]).includes(c)) row[c] = v;
      else if (c.endsWith('_tol')) tolerances[c.slice(0, -4)] = v;
      else if (NUMBER.test(v)) published[c] = Number(v);
      else fail('MANIFEST_INVALID', `${file}: line ${line}, column ${c}: "${v}" is not a number (use a decimal point, no thousands separator)`);
    });
    return { ...row, published, tolerances };
  });
  return { profiles, lines: records.map((r) => r.line) };
}

/** "profiles[2].published.Ix" → "line 4, published.Ix" for CSV, "profiles[2] (id X).published.Ix" for JSON. */
function where(path: readonly PropertyKey[], lines: number[] | null, input: { profiles?: unknown }): string {
  const [top, index, ...rest] = path.map(String);
  if (top !== 'profiles' || index === undefined) return path.map(String).join('.') || 'manifest';
  const n = Number(index);
  const tail = rest.filter((p) => p !== 'published' && p !== 'tolerances');
  const field = rest[0] === 'tolerances' ? `${tail.join('.')}_tol` : tail.join('.');
  if (lines) return `line ${lines[n]}${field ? `, column ${field}` : ''}`;
  const id = (input.profiles as { id?: unknown }[] | undefined)?.[n]?.id;
  return `profiles[${n}]${typeof id === 'string' ? ` (${id})` : ''}${rest.length ? `.${rest.join('.')}` : ''}`;
}

export interface ManifestOptions {
  /** Materials added to (or redefining) the built-in table, e.g. from a materials file. */
  readonly materials?: Readonly<Record<string, MaterialInput>>;
}

/**
 * Reads a manifest, CSV or JSON (told apart by `format`, else by the file name, else by a leading
 * `{`), validates it against the zod schema and checks ids are unique and materials known. Faults
 * are VerifyErrors naming the file and the line/column (CSV) or path (JSON).
 */
export function parseManifest(text: string, source: string, opts: ManifestOptions & { format?: 'csv' | 'json' } = {}): Manifest {
  const format = opts.format ?? (/\.json$/i.test(source) ? 'json' : /\.csv$/i.test(source) ? 'csv' : text.trimStart().startsWith('{') ? 'json' : 'csv');
  let input: { profiles?: unknown; materials?: unknown };
  let lines: number[] | null = null;
  if (format === 'json') {
    try {
      input = JSON.parse(text) as typeof input;
    } catch (e) {
      return fail('MANIFEST_SYNTAX', `${source}: not valid JSON (${(e as Error).message})`);
    }
  } else {
    const csv = csvProfiles(text, source);
    input = { profiles: csv.profiles };
    lines = csv.lines;
  }
  const parsed = manifestSchema.safeParse(input);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    const more = parsed.error.issues.length > 1 ? ` (and ${parsed.error.issues.length - 1} more)` : '';
    return fail('MANIFEST_INVALID', `${source}: ${where(issue.path, lines, input)}: ${issue.message}${more}`);
  }
  const materials = materialTable({ ...opts.materials, ...parsed.data.materials });
  const ids = new Map<string, number>();
  parsed.data.profiles.forEach((p, i) => {
    const at = lines ? `line ${lines[i]}` : `profiles[${i}]`;
    if (ids.has(p.id)) throw new VerifyError('DUPLICATE_ID', `${source}: ${at}: id "${p.id}" already used`);
    ids.set(p.id, i);
    if (!Object.hasOwn(materials, p.material))
      throw new VerifyError('UNKNOWN_MATERIAL', `${source}: ${at}: unknown material "${p.material}"; known: ${Object.keys(materials).join(', ')}`);
  });
  return { source, hash: sha256(text), rows: parsed.data.profiles, materials };
}
