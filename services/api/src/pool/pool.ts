import { Piscina } from 'piscina';
import type { TaskInput, TaskOutput } from './task';

export interface PoolOptions {
  readonly threads: number;
  /** Wall-time limit of one drawing from the moment a thread takes it, ms. */
  readonly timeoutMs: number;
  /** Heap limit of each thread, MiB. */
  readonly memoryMb: number;
  /** Drawings allowed to wait for a thread; past that `run` refuses with PoolFullError. */
  readonly maxWaiting: number;
  /** Module the threads run (default ./worker.mjs); tests swap in failing ones. */
  readonly filename?: string;
}

export class PoolFullError extends Error {
  override readonly name = 'PoolFullError';
}

type Priority = 'interactive' | 'background';

interface Waiting {
  readonly input: TaskInput;
  readonly signal?: AbortSignal;
  readonly resolve: (o: TaskOutput) => void;
  readonly reject: (e: unknown) => void;
}

/**
 * Worker threads computing drawings, off the event loop. At most `threads` drawings are handed to
 * piscina at once, so each one's time limit counts from when it starts, not from when it queued;
 * interactive requests (`/v1/compute`) go before background jobs. A drawing past its time limit or
 * memory limit ends its thread (piscina replaces it) and comes back as DRAWING_TIMEOUT or
 * DRAWING_MEMORY; the other threads and the service go on.
 */
export class ComputePool {
  private readonly piscina: Piscina;
  private readonly queues: Record<Priority, Waiting[]> = { interactive: [], background: [] };
  private running = 0;
  private closed = false;

  constructor(private readonly opts: PoolOptions) {
    this.piscina = new Piscina({
      filename: opts.filename ?? new URL('./worker.mjs', import.meta.url).href,
      minThreads: opts.threads,
      maxThreads: opts.threads,
      idleTimeout: Number.MAX_SAFE_INTEGER,
      // Our own queue holds the waiting drawings; piscina's would start their clocks early.
      maxQueue: opts.threads,
      resourceLimits: { maxOldGenerationSizeMb: opts.memoryMb },
    });
  }

  get threads(): number {
    return this.opts.threads;
  }

  /** Threads free now (the dispatcher claims background work only for them). */
  get idle(): number {
    return Math.max(0, this.opts.threads - this.running - this.queues.interactive.length - this.queues.background.length);
  }

  get waiting(): number {
    return this.queues.interactive.length + this.queues.background.length;
  }

  get busy(): number {
    return this.running;
  }

  run(input: TaskInput, opts: { priority?: Priority; signal?: AbortSignal } = {}): Promise<TaskOutput> {
    if (this.closed) return Promise.reject(new Error('the computation pool is closed'));
    const priority = opts.priority ?? 'interactive';
    if (priority === 'interactive' && this.queues.interactive.length >= this.opts.maxWaiting)
      return Promise.reject(new PoolFullError(`${this.opts.maxWaiting} drawings are already waiting`));
    return new Promise((resolve, reject) => {
      this.queues[priority].push({ input, signal: opts.signal, resolve, reject });
      this.pump();
    });
  }

  private pump(): void {
    while (this.running < this.opts.threads) {
      const w = this.queues.interactive.shift() ?? this.queues.background.shift();
      if (!w) return;
      if (w.signal?.aborted) {
        w.reject(w.signal.reason);
        continue;
      }
      this.running++;
      void this.start(w).finally(() => {
        this.running--;
        this.pump();
      });
    }
  }

  private async start(w: Waiting): Promise<void> {
    const timeout = new AbortController();
    const timer = setTimeout(() => timeout.abort(), this.opts.timeoutMs);
    const signal = w.signal ? AbortSignal.any([w.signal, timeout.signal]) : timeout.signal;
    try {
      // An exact-size copy, moved to the thread: a Buffer may view a larger pooled ArrayBuffer, which
      // structured cloning would copy whole.
      const bytes = new Uint8Array(w.input.bytes);
      w.resolve((await this.piscina.run({ ...w.input, bytes }, { signal, transferList: [bytes.buffer] })) as TaskOutput);
    } catch (e) {
      if (timeout.signal.aborted)
        w.resolve({ ok: false, code: 'DRAWING_TIMEOUT', message: `${w.input.source}: computing took longer than ${this.opts.timeoutMs / 1000} s` });
      else if (w.signal?.aborted) w.reject(w.signal.reason ?? e);
      else if ((e as { code?: string }).code === 'ERR_WORKER_OUT_OF_MEMORY')
        w.resolve({ ok: false, code: 'DRAWING_MEMORY', message: `${w.input.source}: computing needed more than ${this.opts.memoryMb} MiB` });
      else w.reject(e);
    } finally {
      clearTimeout(timer);
    }
  }

  /** Refuses new work, rejects what waits, and ends the threads (running drawings are abandoned). */
  async close(): Promise<void> {
    this.closed = true;
    for (const q of [this.queues.interactive, this.queues.background]) for (const w of q.splice(0)) w.reject(new Error('the computation pool is closed'));
    await this.piscina.destroy();
  }
}
