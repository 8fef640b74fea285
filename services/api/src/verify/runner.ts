import type { FastifyBaseLogger } from 'fastify';
import {
  RUN_COMPLETED,
  Scheduler,
  deliverWebhook,
  diffRuns,
  newRunId,
  runCompletedPayload,
  runVerification,
  systemClock,
  type Clock,
  type ComputeSection,
  type RunRecord,
  type WebhookTransport,
} from '@keelson/verify';
import { codeVersion, fetchTransport, loadCatalogue, type FileRunHistory } from '@keelson/verify-io';
import type { CatalogueRecord, CatalogueRegistry } from './registry';

export interface RunnerOptions {
  readonly registry: CatalogueRegistry;
  readonly history: FileRunHistory;
  readonly compute: ComputeSection;
  readonly log: FastifyBaseLogger;
  readonly clock?: Clock;
  readonly transport?: WebhookTransport;
  /** Base of report links in webhook payloads, e.g. http://127.0.0.1:8080. */
  readonly baseUrl?: () => string | undefined;
}

/**
 * Runs catalogue verifications for the service: on request and on each catalogue's cron schedule,
 * one at a time per catalogue; each run stored in the history, then announced to the catalogue's
 * webhook (signed, retried with backoff, every attempt in the delivery log beside the run).
 */
export class VerificationRunner {
  private readonly scheduler: Scheduler;
  private readonly running = new Map<string, Promise<void>>();
  private closing = false;

  constructor(private readonly opts: RunnerOptions) {
    this.scheduler = new Scheduler({
      clock: opts.clock ?? systemClock,
      run: (id) => this.runScheduled(id),
      onEvent: (e) => opts.log.info({ catalogue: e.catalogue, event: e.type, ...('reason' in e ? { reason: e.reason } : {}) }, 'verification schedule'),
    });
  }

  /** Arms every schedule; a run missed while the service was down is caught up once. */
  async startSchedules(): Promise<void> {
    for (const c of this.opts.registry.all()) await this.schedule(c);
    this.scheduler.start();
  }

  /** Stops the schedules and waits for runs in progress (their drawings are on the pool, which closes after). */
  async stop(): Promise<void> {
    this.closing = true;
    this.scheduler.stop();
    await Promise.allSettled(this.running.values());
  }

  /** (Re)arms a catalogue's schedule after it was registered or changed. */
  async schedule(c: CatalogueRecord): Promise<void> {
    if (!c.schedule) return this.scheduler.remove(c.id);
    const last = await this.opts.history.latest(c.historyKey);
    this.scheduler.set({ catalogue: c.id, cron: c.schedule.cron, timezone: c.schedule.timezone, lastFired: last ? new Date(last.startedAt) : null });
  }

  nextRun(id: string): Date | null {
    return this.scheduler.nextDue(id);
  }

  isRunning(id: string): boolean {
    return this.running.has(id);
  }

  /** Starts a run now and returns its id; null when one of this catalogue is already going. */
  runNow(c: CatalogueRecord): string | null {
    if (this.running.has(c.id) || this.closing) return null;
    const runId = newRunId((this.opts.clock ?? systemClock).now());
    const p = this.execute(c, runId).finally(() => this.running.delete(c.id));
    this.running.set(c.id, p);
    return runId;
  }

  private async runScheduled(id: string): Promise<void> {
    const c = this.opts.registry.all().find((r) => r.id === id);
    if (!c) return;
    // A run started by hand counts as this one: never two at once.
    const existing = this.running.get(id);
    if (existing) return existing;
    this.runNow(c);
    await this.running.get(id);
  }

  private async execute(c: CatalogueRecord, runId: string): Promise<void> {
    const log = this.opts.log.child({ catalogue: c.id, run: runId });
    try {
      const loaded = await loadCatalogue(c.path);
      const previous = await this.opts.history.latest(c.historyKey);
      const run = await runVerification({
        catalogue: { ...loaded.catalogue, name: c.name },
        manifest: loaded.manifest,
        manifestDir: loaded.manifestDir,
        codeVersion: await codeVersion(),
        previous,
        compute: this.opts.compute,
        runId,
        now: () => (this.opts.clock ?? systemClock).now(),
      });
      // A run cut short by shutdown would be stored with its drawings failed: dropped instead.
      if (this.closing) return;
      await this.opts.history.save(c.historyKey, run);
      log.info({ summary: run.summary }, 'verification run stored');
      // Announced apart from the run: a receiver that is down holds its retries, not the next run.
      this.announce(c, run, previous).catch((e: unknown) => log.error({ err: e }, 'webhook delivery failed'));
    } catch (e) {
      log.error({ err: e }, 'verification run failed');
    }
  }

  private async announce(c: CatalogueRecord, run: RunRecord, previous: RunRecord | null): Promise<void> {
    if (!c.webhook) return;
    const base = this.opts.baseUrl?.();
    const payload = runCompletedPayload(run, {
      diff: previous && previous.catalogue.name === run.catalogue.name ? diffRuns(previous, run) : null,
      reportUrl: base ? `${base}/v1/runs/${run.id}/report` : undefined,
    });
    // Log writes in attempt order, each after the one before.
    let logged = Promise.resolve();
    await deliverWebhook(c.webhook, RUN_COMPLETED, payload, {
      transport: this.opts.transport ?? fetchTransport(),
      clock: this.opts.clock ?? systemClock,
      onAttempt: (a) => {
        this.opts.log.info({ run: run.id, attempt: a.attempt, status: a.status, outcome: a.outcome }, 'webhook delivery');
        logged = logged.then(() => this.opts.history.appendDeliveries(run.id, [a]));
      },
    });
    await logged;
  }
}
