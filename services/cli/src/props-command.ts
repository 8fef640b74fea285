import { availableParallelism } from 'node:os';
import { readDrawing, type Drawing } from '@keelson/dxf';
import type { PropsArgs } from './args';
import { faultOf, type Fault } from './faults';
import { formatCsv } from './format-csv';
import { formatJson } from './format-json';
import { formatTable } from './format-table';
import { listInputs, readText, type Input } from './inputs';
import { defaultOutputUnit, profileOf, type Profile } from './profile';

export interface Io {
  out(text: string): void;
  err(line: string): void;
  /** KEELSON_DEBUG=1: stacks of internal faults go to stderr too. */
  readonly debug: boolean;
}

type Outcome<T> = { ok: true; value: T } | { ok: false; fault: Fault };

/** Runs `f` on each item, at most `limit` at a time, results in item order. */
async function mapLimited<T, R>(items: readonly T[], limit: number, f: (t: T) => Promise<R>): Promise<R[]> {
  const out: R[] = new Array(items.length);
  let next = 0;
  const lane = async () => {
    while (next < items.length) {
      const i = next++;
      out[i] = await f(items[i]!);
    }
  };
  await Promise.all(Array.from({ length: Math.min(limit, items.length) }, lane));
  return out;
}

async function load(input: Input, args: PropsArgs): Promise<Outcome<Drawing>> {
  try {
    const text = await readText(input.source);
    return { ok: true, value: await readDrawing(text, { file: input.source, drawingUnits: args.drawingUnits }) };
  } catch (e) {
    return { ok: false, fault: faultOf(e, input.source) };
  }
}

function report(io: Io, fault: Fault): void {
  io.err(fault.line);
  if (fault.exit === 1 && io.debug && fault.stack) io.err(fault.stack);
}

/**
 * `keelson props <file|folder>`: one profile per drawing, printed as a table, JSON or CSV. A drawing
 * that cannot be read gets its one-line error and the others still print. Exit 0 when every drawing
 * was read, 1 on an internal fault, else 2.
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
  const loaded = await mapLimited(inputs, Math.max(1, Math.min(4, availableParallelism())), (i) => load(i, args));
  // CSV states one unit in its header: without --units, that of the first drawing read.
  const first = loaded.find((o) => o.ok);
  const csvUnits = args.units ?? (first?.ok ? defaultOutputUnit(first.value.unit) : 'mm');
  const units = args.format === 'csv' ? csvUnits : args.units;

  const profiles: Profile[] = [];
  const faults: Fault[] = [];
  loaded.forEach((o, i) => {
    const input = inputs[i]!;
    try {
      if (!o.ok) throw o;
      profiles.push(profileOf(o.value, input.name, input.source, units));
    } catch (e) {
      const f = (e as Outcome<Drawing>).ok === false ? (e as { fault: Fault }).fault : faultOf(e, input.source);
      faults.push(f);
      report(io, f);
    }
  });

  if (profiles.length) {
    if (args.format === 'json') io.out(formatJson(profiles));
    else if (args.format === 'csv') {
      io.out(formatCsv(profiles, csvUnits));
      for (const p of profiles) for (const w of p.warnings) io.err(`keelson: ${p.source}: warning: ${w}`);
    } else io.out(formatTable(profiles));
  }
  return faults.some((f) => f.exit === 1) ? 1 : faults.length ? 2 : 0;
}
