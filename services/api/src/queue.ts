import { randomUUID } from 'node:crypto';
import { hostname } from 'node:os';
import type { FastifyBaseLogger } from 'fastify';
import type { Computer } from './computer';
import type { Config } from './config';
import type { Metrics } from './metrics';
import type { ComputePool } from './pool/pool';
import type { Settings } from './settings';
import type { Claim, Store } from './store';

/**
 * Where job drawings get computed. The in-process queue below claims drawings from the store for
 * this process's worker threads; a distributed queue (Redis) will implement the same seam for many
 * machines. Either way the store holds the truth: jobs are durable before they are acknowledged,
 * and a drawing is recorded done exactly once.
 */
export interface JobQueue {
  /** Takes over drawings left running by a crash (embedded store) and starts dispatching. */
  start(): Promise<void>;
  /** A job was created: look for work now rather than at the next poll. */
  notify(): void;
  /** Stops the drawings of a cancelled job that this process is computing. */
  cancel(jobId: string): void;
  /** Stops claiming, waits up to `graceMs` for running drawings, hands the rest back. */
  stop(graceMs: number): Promise<void>;
  readonly owner: string;
}

class Cancelled extends Error {}
class Stopping extends Error {}

export class LocalQueue implements JobQueue {
  readonly owner = `${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;
  private readonly inflight = new Map<number, { claim: Claim; abort: AbortController; done: Promise<void> }>();
  private stopping = false;
  private wake: (() => void) | null = null;
  private loop: Promise<void> | null = null;
  private renewTimer: NodeJS.Timeout | null = null;

  constructor(
    private readonly store: Store,
    private readonly pool: ComputePool,
    private readonly computer: Computer,
    private readonly metrics: Metrics,
    private readonly cfg: Config,
    private readonly log: FastifyBaseLogger,
  ) {}

  async start(): Promise<void> {
    if (this.store.kind === 'sqlite') {
      const n = await this.store.expireAllLeases();
      if (n) this.log.info({ drawings: n }, 'resuming drawings left running by the previous process');
    }
    this.renewTimer = setInterval(() => void this.renew(), Math.max(100, this.cfg.leaseMs / 3));
    this.renewTimer.unref();
    this.loop = this.run();
  }

  notify(): void {
    this.wake?.();
  }

  cancel(jobId: string): void {
    for (const f of this.inflight.values()) if (f.claim.jobId === jobId) f.abort.abort(new Cancelled());
  }

  private async renew(): Promise<void> {
    if (!this.inflight.size) return;
    try {
      await this.store.renewLeases(this.owner, [...this.inflight.keys()], Date.now() + this.cfg.leaseMs);
    } catch (e) {
      this.log.warn({ err: e }, 'could not renew leases');
    }
  }

  private async run(): Promise<void> {
    while (!this.stopping) {
      try {
        await this.fill();
      } catch (e) {
        this.log.error({ err: e }, 'job dispatch failed; retrying');
      }
      if (this.stopping) break;
      await new Promise<void>((resolve) => {
        const t = setTimeout(resolve, this.cfg.pollMs);
        this.wake = () => {
          clearTimeout(t);
          resolve();
        };
      });
      this.wake = null;
    }
  }

  /** Claims as many drawings as there are free threads (interactive requests first). */
  private async fill(): Promise<void> {
    for (;;) {
      const room = Math.min(this.pool.idle, this.pool.threads - this.inflight.size);
      if (room <= 0 || this.stopping) return;
      const claims = await this.store.claimItems({
        owner: this.owner,
        limit: room,
        now: Date.now(),
        leaseMs: this.cfg.leaseMs,
        maxAttempts: this.cfg.maxAttempts,
      });
      if (!claims.length) return;
      for (const c of claims) this.process(c);
    }
  }

  private process(claim: Claim): void {
    const abort = new AbortController();
    const done = this.compute(claim, abort.signal).finally(() => {
      this.inflight.delete(claim.seq);
      this.notify();
    });
    this.inflight.set(claim.seq, { claim, abort, done });
  }

  private async compute(claim: Claim, signal: AbortSignal): Promise<void> {
    try {
      const bytes = await this.store.getBlob(claim.blobSha256);
      const out = bytes
        ? await this.computer.compute(claim.tenant, { name: claim.name, source: claim.source, bytes, sha256: claim.blobSha256 }, claim.settings as unknown as Settings, {
            path: 'job',
            signal,
          })
        : { error: { code: 'INTERNAL', message: `${claim.source}: the stored upload is missing` }, internal: true };
      if ('error' in out && out.internal) this.log.error({ job: claim.jobId, drawing: claim.source, detail: out.error.message }, 'internal fault computing a drawing');
      const recorded = await this.store.completeItem(claim, 'profiles' in out ? { resultKey: out.key } : { error: out.error }, Date.now());
      if (!recorded) this.log.info({ job: claim.jobId, drawing: claim.source }, 'drawing finished after its claim ended (cancelled or taken over)');
    } catch (e) {
      if (signal.aborted) return; // cancelled (item already cancelled) or stopping (released in stop())
      this.log.error({ err: e, job: claim.jobId, drawing: claim.source }, 'could not finish a drawing; its lease will hand it on');
    }
  }

  async stop(graceMs: number): Promise<void> {
    this.stopping = true;
    this.wake?.();
    if (this.renewTimer) clearInterval(this.renewTimer);
    await this.loop;
    const running = [...this.inflight.values()];
    if (running.length) {
      let timer: NodeJS.Timeout | undefined;
      await Promise.race([Promise.all(running.map((f) => f.done)), new Promise((r) => (timer = setTimeout(r, graceMs)))]);
      clearTimeout(timer);
      for (const f of this.inflight.values()) f.abort.abort(new Stopping());
      await Promise.all([...this.inflight.values()].map((f) => f.done));
    }
    const released = await this.store.releaseClaims(this.owner);
    if (released) this.log.info({ drawings: released }, 'handed unfinished drawings back to the queue');
  }
}
