import { SPLIT_MODES, type SplitMode } from '@keelson/dxf';
import { isLengthUnit, isOutputUnit, type LengthUnit, type OutputUnit } from '@keelson/geometry';

export const USAGE =
  'usage: keelson props <file.dxf|folder|catalogue.zip> [--units mm|cm|m|in] [--json|--csv] [--drawing-units mm|cm|m|in|ft] ' +
  '[--split none|blocks|layers|islands] [--layers PATTERN,…] [--exclude-layers PATTERN,…] [--hidden-layers] [--join-tolerance LENGTH] ' +
  '[--torsion-target REL|--no-torsion]';

export type Format = 'table' | 'json' | 'csv';

export interface PropsArgs {
  readonly command: 'props';
  readonly target: string;
  readonly format: Format;
  /** Unit of the results; default the drawing's own (feet reported in inches). */
  readonly units?: OutputUnit;
  /** Unit of drawings that do not declare one (or declare it wrongly). */
  readonly drawingUnits?: LengthUnit;
  /** How each drawing becomes profiles (default none: one profile a drawing). */
  readonly split?: SplitMode;
  /** Layer name patterns to read (default all), and to leave out. */
  readonly layers?: string[];
  readonly excludeLayers?: string[];
  /** Read frozen and switched-off layers too. */
  readonly hiddenLayers?: boolean;
  /** Segment ends closer than this join, in drawing units (default 1e-6 of each drawing's extent). */
  readonly joinTolerance?: number;
  /** Relative error wanted on J (default 1e-3), or false: no torsion and warping (faster). */
  readonly torsion?: number | false;
}

export type Args = PropsArgs | { readonly command: 'help' };

/** A mistake on the command line: exit 2 with one line. */
export class UsageError extends Error {
  override readonly name = 'UsageError';
}

const FLAGS = new Set(['--json', '--csv', '--hidden-layers', '--no-torsion']);
const VALUED = new Set(['--units', '--drawing-units', '--split', '--layers', '--exclude-layers', '--join-tolerance', '--torsion-target']);

/** "A,B*" → ["A", "B*"]; empty items dropped. */
const patterns = (v: string) =>
  v
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean);

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
    if (FLAGS.has(name)) {
      if (eq >= 0) throw new UsageError(`${name} takes no value`);
      opts.set(name, true);
    } else if (VALUED.has(name)) {
      const v = eq >= 0 ? a.slice(eq + 1) : rest[++i];
      if (v === undefined || v.startsWith('--')) throw new UsageError(`${name} needs a value`);
      opts.set(name, v);
    } else throw new UsageError(`unknown option ${name}; ${USAGE}`);
  }
  if (positional.length !== 1)
    throw new UsageError(`${positional.length ? 'one file or folder at a time' : 'no file or folder given'}; ${USAGE}`);
  if (opts.has('--json') && opts.has('--csv')) throw new UsageError('--json and --csv exclude each other');
  const str = (name: string) => opts.get(name) as string | undefined;
  const units = str('--units');
  if (units !== undefined && !isOutputUnit(units)) throw new UsageError(`--units must be mm, cm, m or in, not "${units}"`);
  const drawingUnits = str('--drawing-units');
  if (drawingUnits !== undefined && !isLengthUnit(drawingUnits))
    throw new UsageError(`--drawing-units must be mm, cm, m, in or ft, not "${drawingUnits}"`);
  const split = str('--split');
  if (split !== undefined && !(SPLIT_MODES as readonly string[]).includes(split))
    throw new UsageError(`--split must be ${SPLIT_MODES.join(', ')}, not "${split}"`);
  const tol = str('--join-tolerance');
  const joinTolerance = tol === undefined ? undefined : Number(tol);
  if (joinTolerance !== undefined && !(joinTolerance > 0 && Number.isFinite(joinTolerance)))
    throw new UsageError(`--join-tolerance must be a positive length in drawing units, not "${tol}"`);
  const target = str('--torsion-target');
  const torsionTarget = target === undefined ? undefined : Number(target);
  if (torsionTarget !== undefined && !(torsionTarget >= 1e-6 && torsionTarget <= 0.1))
    throw new UsageError(`--torsion-target must be a relative error between 1e-6 and 0.1, not "${target}"`);
  if (torsionTarget !== undefined && opts.has('--no-torsion')) throw new UsageError('--torsion-target and --no-torsion exclude each other');
  const layers = str('--layers');
  const excludeLayers = str('--exclude-layers');
  return {
    command: 'props',
    target: positional[0]!,
    format: opts.has('--json') ? 'json' : opts.has('--csv') ? 'csv' : 'table',
    units,
    drawingUnits,
    split: split as SplitMode | undefined,
    layers: layers === undefined ? undefined : patterns(layers),
    excludeLayers: excludeLayers === undefined ? undefined : patterns(excludeLayers),
    hiddenLayers: opts.has('--hidden-layers') || undefined,
    joinTolerance,
    torsion: opts.has('--no-torsion') ? false : torsionTarget,
  };
}
