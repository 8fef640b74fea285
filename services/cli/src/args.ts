import { isLengthUnit, isOutputUnit, type LengthUnit, type OutputUnit } from '@keelson/geometry';

export const USAGE =
  'usage: keelson props <file.dxf|folder> [--units mm|cm|m|in] [--json|--csv] [--drawing-units mm|cm|m|in|ft]';

export type Format = 'table' | 'json' | 'csv';

export interface PropsArgs {
  readonly command: 'props';
  readonly target: string;
  readonly format: Format;
  /** Unit of the results; default the drawing's own (feet reported in inches). */
  readonly units?: OutputUnit;
  /** Unit of drawings that do not declare one (or declare it wrongly). */
  readonly drawingUnits?: LengthUnit;
}

export type Args = PropsArgs | { readonly command: 'help' };

/** A mistake on the command line: exit 2 with one line. */
export class UsageError extends Error {
  override readonly name = 'UsageError';
}

/** Parses `props <target> [options]`; accepts `--opt value` and `--opt=value`. */
export function parseArgs(argv: readonly string[]): Args {
  if (argv.some((a) => a === '--help' || a === '-h') || argv[0] === 'help') return { command: 'help' };
  const [command, ...rest] = argv;
  if (command === undefined) throw new UsageError(`no command; ${USAGE}`);
  if (command !== 'props') throw new UsageError(`unknown command "${command}"; ${USAGE}`);
  const positional: string[] = [];
  const opts = new Map<string, string | true>();
  for (let i = 0; i < rest.length; i++) {
    const a = rest[i]!;
    if (!a.startsWith('--') || a === '--') {
      positional.push(a);
      continue;
    }
    const eq = a.indexOf('=');
    const name = eq < 0 ? a : a.slice(0, eq);
    if (opts.has(name)) throw new UsageError(`${name} given twice`);
    if (name === '--json' || name === '--csv') {
      if (eq >= 0) throw new UsageError(`${name} takes no value`);
      opts.set(name, true);
    } else if (name === '--units' || name === '--drawing-units') {
      const v = eq >= 0 ? a.slice(eq + 1) : rest[++i];
      if (v === undefined || v.startsWith('--')) throw new UsageError(`${name} needs a value`);
      opts.set(name, v);
    } else throw new UsageError(`unknown option ${name}; ${USAGE}`);
  }
  if (positional.length !== 1)
    throw new UsageError(`${positional.length ? 'one file or folder at a time' : 'no file or folder given'}; ${USAGE}`);
  if (opts.has('--json') && opts.has('--csv')) throw new UsageError('--json and --csv exclude each other');
  const units = opts.get('--units');
  if (units !== undefined && !(typeof units === 'string' && isOutputUnit(units)))
    throw new UsageError(`--units must be mm, cm, m or in, not "${String(units)}"`);
  const drawingUnits = opts.get('--drawing-units');
  if (drawingUnits !== undefined && !(typeof drawingUnits === 'string' && isLengthUnit(drawingUnits)))
    throw new UsageError(`--drawing-units must be mm, cm, m, in or ft, not "${String(drawingUnits)}"`);
  return {
    command: 'props',
    target: positional[0]!,
    format: opts.has('--json') ? 'json' : opts.has('--csv') ? 'csv' : 'table',
    units: units as OutputUnit | undefined,
    drawingUnits: drawingUnits as LengthUnit | undefined,
  };
}
