import { readProfiles, type Drawing, type ReadOptions } from '@keelson/dxf';
import type { PropsArgs } from './args';
import { faultOf, type Fault } from './faults';
import { formatCsv } from './format-csv';
import { formatJson, type FailedProfile } from './format-json';
import { formatTable } from './format-table';
import { listInputs, type Input } from './inputs';
import { defaultOutputUnit, type Profile } from '@keelson/profile/keys';

export interface Io {
  out(text: string): void;
  err(line: string): void;
  /** KEELSON_DEBUG=1: stacks of internal faults go to stderr too. */
  readonly debug: boolean;
}

/** One profile of a drawing as read, or why a drawing (or one profile of it) was not. */
type Read = { readonly drawing: Drawing; readonly source: string } | { readonly name: string; readonly source: string; readonly fault: Fault };

/** Every profile of one input: a fault of the drawing is one entry, a split drawing's faulty profile another. */
async function load(input: Input, args: PropsArgs): Promise<Read[]> {
  try {
    const opts: ReadOptions = {
      file: input.source,
      name: input.name,
      drawingUnits: args.drawingUnits,
      split: args.split,
      layers: args.layers,
      excludeLayers: args.excludeLayers,
      hiddenLayers: args.hiddenLayers,
      joinTolerance: args.joinTolerance,
    };
    const set = await readProfiles(await input.text(), opts);
    return set.profiles.map((p) => ('error' in p ? { name: p.name, source: input.source, fault: faultOf(p.error) } : { drawing: p, source: input.source }));
  } catch (e) {
    return [{ name: input.name, source: input.source, fault: faultOf(e, input.source) }];
  }
}

function report(io: Io, fault: Fault): void {
  io.err(fault.line);
  if (fault.exit === 1 && io.debug && fault.stack) io.err(fault.stack);
}

const failed = (name: string, source: string, f: Fault): FailedProfile => ({
  name,
  source,
  error: { code: f.code, message: f.line.replace(/^keelson: /, '') },
});

/**
 * `keelson props <file|folder|catalogue.zip>`: the profiles of every drawing, printed as a table,
 * JSON or CSV. A drawing (or a profile of a split drawing) that cannot be read gets its one-line
 * error on stderr, and in JSON an entry with `error` in its place; the others still print. Exit 0
 * when everything was read, 1 on an internal fault, else 2.
 */
export async function propsCommand(args: PropsArgs, io: Io): Promise<number> {
  let inputs: Input[];
  try {
    inputs = await listInputs(args.target);
  } catch (e) {
    const f = faultOf(e, args.target);
    report(io, f);
    return f.exit;
  }
  // Drawings are read one after another: reading is CPU-bound on this thread.
  const reads: Read[] = [];
  for (const input of inputs) reads.push(...(await load(input, args)));
  // CSV states one unit in its header: without --units, that of the first drawing read.
  const first = reads.find((r) => 'drawing' in r);
  const csvUnits = args.units ?? (first && 'drawing' in first ? defaultOutputUnit(first.drawing.unit) : 'mm');
  const units = args.format === 'csv' ? csvUnits : args.units;

  // The finite-element code loads only once a drawing has been read: a bad file fails fast.
  const { profileOf } = reads.some((r) => 'drawing' in r) ? await import('@keelson/profile') : { profileOf: null };
  const entries: (Profile | FailedProfile)[] = [];
  const faults: Fault[] = [];
  for (const r of reads) {
    let f: Fault;
    if ('drawing' in r)
      try {
        entries.push(profileOf!(r.drawing, r.drawing.name, r.source, { units, torsion: args.torsion }));
        continue;
      } catch (e) {
        f = faultOf(e, r.source);
      }
    else f = r.fault;
    faults.push(f);
    report(io, f);
    entries.push(failed('drawing' in r ? r.drawing.name : r.name, r.source, f));
  }

  const profiles = entries.filter((e): e is Profile => !('error' in e));
  if (args.format === 'json' && (profiles.length || inputs.length > 1 || entries.length > 1)) io.out(formatJson(entries));
  else if (profiles.length && args.format === 'csv') {
    io.out(formatCsv(profiles, csvUnits));
    for (const p of profiles) for (const w of p.warnings) io.err(`keelson: ${p.source}: warning: ${w}`);
  } else if (profiles.length && args.format === 'table') io.out(formatTable(profiles));
  return faults.some((f) => f.exit === 1) ? 1 : faults.length ? 2 : 0;
}
