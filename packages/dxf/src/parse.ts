import { Worker } from 'node:worker_threads';
import { DxfError, oneLine } from './errors';

/** What dxf-parser returns for one entity, as far as Keelson reads it (every field may be missing). */
export interface ParsedEntity {
  readonly type?: string;
  readonly handle?: string | number;
  readonly layer?: string;
  readonly inPaperSpace?: boolean;
  readonly [field: string]: unknown;
}

export interface Parsed {
  readonly header: Readonly<Record<string, unknown>>;
  readonly entities: readonly ParsedEntity[];
  /** What the parser printed (it complains on the console about odd input). */
  readonly notes: readonly string[];
}

export interface ParseLimits {
  /** Wall-time limit of the parser, ms (default 10 000). */
  readonly timeoutMs?: number;
  /** Heap limit of the parser's thread, MiB (default 1024). */
  readonly maxMemoryMb?: number;
}

const WORKER = new URL('./parse-worker.mjs', import.meta.url);

/**
 * dxf-parser in a worker thread with a time and a heap limit: it can loop forever or print to the
 * console on malformed input, and neither may reach the caller's thread.
 */
export function parseInWorker(text: string, file: string, limits: ParseLimits = {}): Promise<Parsed> {
  const timeoutMs = limits.timeoutMs ?? 10_000;
  const maxMemoryMb = limits.maxMemoryMb ?? 1024;
  return new Promise<Parsed>((resolve, reject) => {
    const worker = new Worker(WORKER, {
      workerData: { text },
      execArgv: [],
      stdout: true,
      stderr: true,
      resourceLimits: { maxOldGenerationSizeMb: maxMemoryMb },
    });
    worker.stdout.resume();
    worker.stderr.resume();
    let done = false;
    const finish = (f: () => void) => {
      if (done) return;
      done = true;
      clearTimeout(timer);
      f();
    };
    const timer = setTimeout(
      () =>
        finish(() => {
          void worker.terminate();
          reject(new DxfError('PARSE_TIMEOUT', file, `the DXF parser did not finish within ${timeoutMs / 1000} s (malformed structure?)`));
        }),
      timeoutMs,
    );
    worker.once('message', (m: { ok: true; header: Record<string, unknown>; entities: ParsedEntity[]; notes: string[] } | { ok: false; message: string; notes: string[] }) =>
      finish(() => {
        if (m.ok) resolve({ header: m.header ?? {}, entities: m.entities, notes: m.notes });
        else reject(parserFailure(m.message, file));
      }),
    );
    worker.once('error', (e: Error & { code?: string }) =>
      finish(() => {
        if (e.code === 'ERR_WORKER_OUT_OF_MEMORY')
          reject(new DxfError('PARSE_MEMORY', file, `the DXF parser ran out of its ${maxMemoryMb} MiB memory limit`));
        else reject(e);
      }),
    );
    worker.once('exit', (code) => finish(() => reject(new Error(`DXF parser thread exited with code ${code} without a result`))));
  });
}

/** The scan before the parser has already refused truncated and malformed files; what is left is structure. */
function parserFailure(message: string, file: string): DxfError {
  if (/Unexpected end of input|EOF group not read/.test(message))
    return new DxfError('TRUNCATED', file, `file ends before the parser expected: ${oneLine(message)}`);
  return new DxfError('MALFORMED', file, `the DXF parser failed: ${oneLine(message)}`);
}
