import { mkdir, readFile, writeFile } from 'node:fs/promises';
import { dirname, extname } from 'node:path';
import { isLengthUnit, type LengthUnit } from '@keelson/geometry';
import {
  REPORT_CAUTION,
  VerifyError,
  diffRuns,
  formatTolerance,
  parseMaterials,
  percent,
  renderHtmlReport,
  runPassed,
  runVerification,
  significantText,
  verificationCsv,
  verificationJson,
  type RunDiff,
  type RunRecord,
} from '@keelson/verify';
import { FileRunHistory, SourceError, codeVersion, loadCatalogue } from '@keelson/verify-io';
import { UsageError } from './args';
import { progressBar } from './progress';
import type { Io } from './props-command';

export const VERIFY_USAGE =
  'usage: keelson verify <catalogue.zip|folder> [--manifest m.csv|m.json] [--report out.html|out.csv|out.json]… ' +
  '[--materials materials.json] [--drawing-units mm|cm|m|in|ft]   (runs stored in ./data or KEELSON_DATA_DIR)';

export interface VerifyArgs {
  readonly target: string;
  readonly manifest?: string;
  readonly reports: string[];
  readonly materials?: string;
  readonly drawingUnits?: LengthUnit;
}

const REPORT_KINDS = ['.html', '.csv', '.json'];

/** Parses `verify <target> [options]`; `--opt value` or `--opt=value`; --report may repeat. */
export function parseVerifyArgs(argv: readonly string[]): VerifyArgs {
  const positional: string[] = [];
  const reports: string[] = [];
  const one = new Map<string, string>();
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    if (!a.startsWith('--')) {
      positional.push(a);
      continue;
    }
    const eq = a.indexOf('=');
    const name = eq < 0 ? a : a.slice(0, eq);
    if (!['--manifest', '--report', '--materials', '--drawing-units'].includes(name)) throw new UsageError(`unknown option ${name}; ${VERIFY_USAGE}`);
    const v = eq >= 0 ? a.slice(eq + 1) : argv[++i];
    if (v === undefined || v === '' || v.startsWith('--')) throw new UsageError(`${name} needs a value`);
    if (name === '--report') {
      if (!REPORT_KINDS.includes(extname(v).toLowerCase())) throw new UsageError(`--report ${v}: name a .html, .csv or .json file`);
      reports.push(v);
    } else if (one.has(name)) throw new UsageError(`${name} given twice`);
    else one.set(name, v);
  }
  if (positional.length !== 1) throw new UsageError(`${positional.length ? 'one catalogue at a time' : 'no catalogue given'}; ${VERIFY_USAGE}`);
  const drawingUnits = one.get('--drawing-units');
  if (drawingUnits !== undefined && !isLengthUnit(drawingUnits)) throw new UsageError(`--drawing-units must be mm, cm, m, in or ft, not "${drawingUnits}"`);
  return { target: positional[0]!, manifest: one.get('--manifest'), reports, materials: one.get('--materials'), drawingUnits };
}

/** Where runs are stored: KEELSON_DATA_DIR, else ./data (as the service keeps its data). */
export const dataDir = (): string => process.env.KEELSON_DATA_DIR || 'data';

async function readMaterials(file: string) {
  const text = await readFile(file, 'utf8').catch((e: NodeJS.ErrnoException) => Promise.reject(new SourceError('UNREADABLE_INPUT', file, e.code === 'ENOENT' ? 'no such file' : e.message)));
  return parseMaterials(text, file);
}

/** One line per value outside tolerance, and per profile that could not be verified. */
function attentionLines(run: RunRecord): string[] {
  const lines: string[] = [];
  for (const p of run.profiles) {
    if (p.fault) lines.push(`  ${p.status.toUpperCase().padEnd(7)} ${p.id}  ${p.fault.message}`);
    for (const c of p.checks.filter((k) => !k.pass)) {
      const rel = c.relative === null ? '' : `${percent(c.relative)}, `;
      const computed = c.computed === null ? 'no value' : `${significantText(c.computed)} ${c.unit}`;
      lines.push(`  FAIL    ${p.id}  ${c.key}: computed ${computed}, published ${c.published} (${rel}tolerance ${formatTolerance(c.tolerance, c.unit)})`);
    }
  }
  return lines;
}

function summaryText(run: RunRecord, manifestSource: string, reused: number, diff: RunDiff | null): string {
  const s = run.summary;
  const lines = [
    `Verified ${run.catalogue.name} (${run.catalogue.source}) against ${manifestSource}: ${s.profiles} profiles, ${s.pass} pass, ${s.fail} fail, ${s.error} unreadable, ${s.missing} missing; ${s.checks} values checked, ${s.checksFailed} outside tolerance.`,
    ...attentionLines(run),
  ];
  for (const u of run.unlisted) lines.push(`  note    ${u.drawing} has no manifest row`);
  if (diff)
    lines.push(
      `Since run ${diff.from.id}: drawings changed ${diff.drawingsChanged.length}, values moved beyond tolerance ${diff.moved.length}, new failures ${diff.newFailures.length}, fixed ${diff.fixed.length}, profiles added ${diff.added.length}, removed ${diff.removed.length} (keelson diff ${run.id}).`,
    );
  lines.push(`Run ${run.id} stored under ${dataDir()}; ${reused} of ${s.profiles - s.missing} drawings unchanged since the last run, their values reused.`);
  return lines.join('\n');
}

/**
 * `keelson verify`: checks a catalogue's drawings against its manifest, stores the run (reusing the
 * values of drawings unchanged since the last run), writes the reports asked for, prints a summary.
 * Exit 0 when every published value is within tolerance, 3 when any is not (or a drawing is
 * missing or unreadable), 2 on bad input (catalogue, manifest, options), 1 on an internal fault.
 */
export async function verifyCommand(argv: readonly string[], io: Io & { progress?: { isTTY?: boolean; columns?: number; write(s: string): unknown } }): Promise<number> {
  if (argv.some((a) => a === '--help' || a === '-h')) {
    io.out(`${VERIFY_USAGE}\n`);
    return 0;
  }
  try {
    const args = parseVerifyArgs(argv);
    const materials = args.materials ? await readMaterials(args.materials) : undefined;
    const loaded = await loadCatalogue(args.target, { manifest: args.manifest, materials });
    const history = new FileRunHistory(dataDir());
    const previous = await history.latest(loaded.key);
    const bar = progressBar(io.progress ?? process.stderr);
    const run = await runVerification({
      catalogue: loaded.catalogue,
      manifest: loaded.manifest,
      manifestDir: loaded.manifestDir,
      codeVersion: await codeVersion(),
      previous,
      drawingUnits: args.drawingUnits,
      onProgress: (p) => bar.update(p.done, p.total, p.id),
    });
    bar.done();
    await history.save(loaded.key, run);
    const diff = previous ? diffRuns(previous, run) : null;
    for (const file of args.reports) {
      const kind = extname(file).toLowerCase();
      const text = kind === '.html' ? renderHtmlReport(run, { diff }) : kind === '.csv' ? verificationCsv(run) : verificationJson(run);
      await mkdir(dirname(file), { recursive: true })
        .then(() => writeFile(file, text))
        .catch((e: NodeJS.ErrnoException) => Promise.reject(new SourceError('UNREADABLE_INPUT', file, `cannot write the report: ${e.code ?? e.message}`)));
    }
    const reused = run.profiles.filter((p) => p.reused).length;
    io.out(`${summaryText(run, loaded.manifest.source, reused, diff)}\n`);
    for (const file of args.reports) io.out(`Report: ${file}\n`);
    io.out(`${REPORT_CAUTION}\n`);
    if (run.profiles.some((p) => p.fault?.code === 'INTERNAL')) return 1;
    return runPassed(run) ? 0 : 3;
  } catch (e) {
    if (e instanceof SourceError || e instanceof VerifyError || e instanceof UsageError) {
      io.err(`keelson: ${e.message}`);
      return 2;
    }
    throw e;
  }
}
