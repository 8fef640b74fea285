import { stat } from 'node:fs/promises';
import { VerifyError, diffRuns, percent, significantText, type RunDiff, type RunRecord } from '@keelson/verify';
import { FileRunHistory, SourceError, catalogueKey } from '@keelson/verify-io';
import { UsageError } from './args';
import type { Io } from './props-command';
import { dataDir } from './verify-command';

export const DIFF_USAGE =
  'usage: keelson diff <run> <run> | keelson diff <run> (against the run before it) | keelson diff <catalogue.zip|folder> (its last two runs) | keelson diff --list [catalogue]   [--json]';

const pct = (r: number | null) => (r === null ? '' : `  (${percent(r)})`);

/** The diff as a person reads it: what changed, then each moved value with its units. */
export function formatDiff(d: RunDiff, catalogue: string): string {
  const list = (xs: string[]) => (xs.length ? xs.join(', ') : 'none');
  const lines = [
    `Changes in ${catalogue} from run ${d.from.id} (${d.from.startedAt}) to run ${d.to.id} (${d.to.startedAt}):`,
    `  code ${d.codeChanged ? `changed (${d.from.codeVersion} → ${d.to.codeVersion})` : 'unchanged'}; manifest ${d.manifestChanged ? 'changed' : 'unchanged'}`,
    `  profiles added (${d.added.length}): ${list(d.added.map((a) => a.id))}`,
    `  profiles removed (${d.removed.length}): ${list(d.removed.map((a) => a.id))}`,
    `  drawings changed (${d.drawingsChanged.length}): ${list(d.drawingsChanged.map((c) => `${c.id} (${c.drawing})`))}`,
    `  values moved beyond tolerance (${d.moved.length}):${d.moved.length ? '' : ' none'}`,
  ];
  for (const m of d.moved) lines.push(`    ${m.id}  ${m.key.padEnd(9)} ${significantText(m.from)} → ${significantText(m.to)} ${m.unit}${pct(m.relative)}`);
  const item = (f: RunDiff['newFailures'][number]) => (f.key ? `${f.id} ${f.key}` : `${f.id} (${f.status})`);
  lines.push(`  new failures (${d.newFailures.length}): ${list(d.newFailures.map(item))}`, `  fixed (${d.fixed.length}): ${list(d.fixed.map(item))}`);
  return `${lines.join('\n')}\n`;
}

/** The two runs the arguments name: two ids; one id and the run before it; a catalogue's last two runs. */
async function pick(history: FileRunHistory, args: string[]): Promise<[RunRecord, RunRecord]> {
  if (args.length === 2) return [await history.load(args[0]!), await history.load(args[1]!)];
  const arg = args[0]!;
  const isPath = await stat(arg).then(
    () => true,
    () => false,
  );
  if (isPath) {
    const runs = await history.list(catalogueKey(arg));
    if (runs.length < 2) throw new SourceError('RUN_NOT_FOUND', arg, `${runs.length ? 'one run' : 'no run'} of this catalogue stored; a diff needs two (keelson verify ${arg})`);
    return [await history.load(runs.at(-2)!.id), await history.load(runs.at(-1)!.id)];
  }
  const to = await history.load(arg);
  const from = await history.previous(arg);
  if (!from) throw new SourceError('RUN_NOT_FOUND', arg, 'the first run of its catalogue: nothing before it to compare with');
  return [from, to];
}

/**
 * `keelson diff`: what changed between two stored verification runs of a catalogue (profiles added
 * or removed, drawings changed, values moved beyond tolerance, new failures, fixed ones); `--list`
 * shows the stored runs. Exit 0, or 2 when a run or catalogue cannot be found.
 */
export async function diffCommand(argv: readonly string[], io: Io): Promise<number> {
  if (argv.some((a) => a === '--help' || a === '-h')) {
    io.out(`${DIFF_USAGE}\n`);
    return 0;
  }
  const json = argv.includes('--json');
  const listing = argv.includes('--list');
  const bad = argv.find((a) => a.startsWith('--') && a !== '--json' && a !== '--list');
  const rest = argv.filter((a) => !a.startsWith('--'));
  try {
    if (bad) throw new UsageError(`unknown option ${bad}; ${DIFF_USAGE}`);
    const history = new FileRunHistory(dataDir());
    if (listing) {
      if (rest.length > 1) throw new UsageError(`--list takes at most one catalogue; ${DIFF_USAGE}`);
      const runs = await history.list(rest[0] ? catalogueKey(rest[0]) : undefined);
      if (json) io.out(`${JSON.stringify({ runs }, null, 2)}\n`);
      else for (const r of runs) io.out(`${r.id}  ${r.catalogue}  ${r.summary.pass}/${r.summary.profiles} pass, ${r.summary.fail} fail, ${r.summary.error + r.summary.missing} not verified\n`);
      return 0;
    }
    if (rest.length < 1 || rest.length > 2) throw new UsageError(`${rest.length ? 'at most two runs' : 'no run or catalogue given'}; ${DIFF_USAGE}`);
    const [from, to] = await pick(history, rest);
    const d = diffRuns(from, to);
    io.out(json ? `${JSON.stringify(d, null, 2)}\n` : formatDiff(d, to.catalogue.name));
    return 0;
  } catch (e) {
    if (e instanceof SourceError || e instanceof UsageError || e instanceof VerifyError) {
      io.err(`keelson: ${(e as Error).message}`);
      return 2;
    }
    throw e;
  }
}
