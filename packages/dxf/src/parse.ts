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

type Reply =
  | { id: number; ok: true; header: Record<string, unknown>; entities: ParsedEntity[]; notes: string[] }
  | { id: number; ok: false; message: string; notes: string[] };

interface Job {
  readonly id: number;
  readonly text: string;
  readonly file: string;
  readonly timeoutMs: number;
  readonly maxMemoryMb: number;
  readonly resolve: (p: Parsed) => void;
  readonly reject: (e: unknown) => void;
}

/**
 * One parser thread serving files in turn (a thread costs ~0.1 s to start; a small file parses in
 * ~1 ms). A job past its time limit, or a thread past its heap limit, ends the thread; the next job
 * starts a fresh one. The thread does not keep the process alive while idle.
 */
class ParserThread {
  private worker: Worker | null = null;
  private memoryMb = 0;
  private readonly queue: Job[] = [];
  private busy: { job: Job; timer: NodeJS.Timeout } | null = null;
  private nextId = 1;

  parse(text: string, file: string, limits: ParseLimits): Promise<Parsed> {
    return new Promise<Parsed>((resolve, reject) => {
      const timeoutMs = limits.timeoutMs ?? 10_000;
      const maxMemoryMb = limits.maxMemoryMb ?? 1024;
      this.queue.push({ id: this.nextId++, text, file, timeoutMs, maxMemoryMb, resolve, reject });
      this.pump();
    });
  }

  private pump(): void {
    if (this.busy) return;
    const job = this.queue.shift();
    if (!job) {
      this.worker?.unref();
      return;
    }
    if (this.worker && this.memoryMb !== job.maxMemoryMb) this.kill();
    const w = this.worker ?? this.spawn(job.maxMemoryMb);
    w.ref();
    const timer = setTimeout(() => {
      this.kill();
      this.settle(() =>
        job.reject(new DxfError('PARSE_TIMEOUT', job.file, `the DXF parser did not finish within ${job.timeoutMs / 1000} s (malformed structure?)`)),
      );
    }, job.timeoutMs);
    this.busy = { job, timer };
    w.postMessage({ id: job.id, text: job.text });
  }

  private spawn(maxMemoryMb: number): Worker {
    // Its console is replaced inside the thread; stdout: true would keep an idle process alive.
    const w = new Worker(WORKER, { execArgv: [], resourceLimits: { maxOldGenerationSizeMb: maxMemoryMb } });
    w.on('message', (m: Reply) => {
      const job = this.busy?.job;
      if (!job || m.id !== job.id) return;
      this.settle(() => (m.ok ? job.resolve({ header: m.header ?? {}, entities: m.entities, notes: m.notes }) : job.reject(parserFailure(m.message, job.file))));
    });
    w.on('error', (e: Error & { code?: string }) => {
      if (this.worker !== w) return;
      this.worker = null;
      const job = this.busy?.job;
      if (!job) return;
      this.settle(() =>
        job.reject(
          e.code === 'ERR_WORKER_OUT_OF_MEMORY'
            ? new DxfError('PARSE_MEMORY', job.file, `the DXF parser ran out of its ${job.maxMemoryMb} MiB memory limit`)
            : e,
        ),
      );
    });
    w.on('exit', (code) => {
      if (this.worker !== w) return;
      this.worker = null;
      const job = this.busy?.job;
      if (job) this.settle(() => job.reject(new Error(`DXF parser thread exited with code ${code} without a result`)));
    });
    this.worker = w;
    this.memoryMb = maxMemoryMb;
    return w;
  }

  private kill(): void {
    const w = this.worker;
    this.worker = null;
    if (w) void w.terminate();
  }

  /** Ends the current job with `f` and starts the next one. */
  private settle(f: () => void): void {
    if (this.busy) clearTimeout(this.busy.timer);
    this.busy = null;
    f();
    this.pump();
  }
}

const thread = new ParserThread();

/**
 * dxf-parser in a worker thread with a time and a heap limit: it can loop forever or print to the
 * console on malformed input, and neither may reach the caller's thread.
 */
export function parseInWorker(text: string, file: string, limits: ParseLimits = {}): Promise<Parsed> {
  return thread.parse(text, file, limits);
}

/** The scan before the parser has already refused truncated and malformed files; what is left is structure. */
function parserFailure(message: string, file: string): DxfError {
  if (/Unexpected end of input|EOF group not read/.test(message))
    return new DxfError('TRUNCATED', file, `file ends before the parser expected: ${oneLine(message)}`);
  return new DxfError('MALFORMED', file, `the DXF parser failed: ${oneLine(message)}`);
}
