import { Cron } from 'croner';
import { MAX_TIMER_MS, type Clock } from './clock';
import { VerifyError } from './errors';

export interface ScheduleEntry {
  /** Catalogue id: one schedule and at most one running verification each. */
  readonly catalogue: string;
  /** Cron expression (croner: 5 fields, or 6 with seconds first). */
  readonly cron: string;
  /** IANA zone the expression is read in; default the process's own. */
  readonly timezone?: string;
  /**
   * When the schedule last fired (from stored runs). Due times between then and now were missed
   * while the service was down: they are caught up by one run. Default: now (nothing to catch up).
   */
  readonly lastFired?: Date | null;
}

export type ScheduleEvent =
  | { readonly type: 'started'; readonly catalogue: string; readonly due: Date; readonly reason: 'schedule' | 'catch-up' | 'manual'; readonly missed: number }
  | { readonly type: 'skipped'; readonly catalogue: string; readonly due: Date; readonly reason: 'already-running' }
  | { readonly type: 'finished'; readonly catalogue: string }
  | { readonly type: 'failed'; readonly catalogue: string; readonly error: unknown };

export interface SchedulerOptions {
  readonly clock: Clock;
  /** Starts one verification of the catalogue; the scheduler waits for it before starting another. */
  readonly run: (catalogue: string, due: Date) => Promise<unknown>;
  readonly onEvent?: (e: ScheduleEvent) => void;
}

interface Slot {
  readonly cron: Cron;
  lastFired: Date;
  running: boolean;
}

/** Most due times counted when reporting how many were missed (the run happens once whatever the count). */
const MISSED_COUNT_CAP = 1000;

/** A validated cron expression, or a VerifyError saying what is wrong with it. */
export function parseCron(expr: string, timezone?: string): Cron {
  try {
    // No callback: croner computes times only and arms no timer of its own; ours follow the injected clock.
    return new Cron(expr, { timezone, paused: true });
  } catch (e) {
    throw new VerifyError('BAD_SCHEDULE', `cron "${expr}": ${e instanceof Error ? e.message : String(e)}`);
  }
}

/**
 * Runs each catalogue's verification when its cron expression falls due, on an injected clock.
 * One run at a time per catalogue: a time that falls due while the last run is still going is
 * skipped, not queued. After downtime the due times missed since `lastFired` are caught up by a
 * single run when the scheduler starts. One timer is armed for the earliest next due time.
 */
export class Scheduler {
  private readonly slots = new Map<string, Slot>();
  private timer: unknown = null;
  private started = false;

  constructor(private readonly opts: SchedulerOptions) {}

  /** Adds or replaces a catalogue's schedule; throws VerifyError BAD_SCHEDULE on a bad expression. */
  set(entry: ScheduleEntry): void {
    const cron = parseCron(entry.cron, entry.timezone);
    const old = this.slots.get(entry.catalogue);
    this.slots.set(entry.catalogue, { cron, lastFired: entry.lastFired ?? this.opts.clock.now(), running: old?.running ?? false });
    if (this.started) this.tick();
  }

  remove(catalogue: string): void {
    this.slots.delete(catalogue);
    if (this.started) this.arm();
  }

  /** Catches up missed runs, then follows the clock. */
  start(): void {
    this.started = true;
    this.tick();
  }

  stop(): void {
    this.started = false;
    if (this.timer !== null) this.opts.clock.clearTimer(this.timer);
    this.timer = null;
  }

  isRunning(catalogue: string): boolean {
    return this.slots.get(catalogue)?.running ?? false;
  }

  /** Next due time of a catalogue, or null (unknown catalogue, or an expression that never fires again). */
  nextDue(catalogue: string): Date | null {
    const s = this.slots.get(catalogue);
    return s ? s.cron.nextRun(s.lastFired) : null;
  }

  /** Starts a run now unless one is going (returns false then): "run now" from a person or an API call. */
  runNow(catalogue: string): boolean {
    const s = this.slots.get(catalogue);
    if (!s || s.running) return false;
    this.launch(catalogue, s, this.opts.clock.now(), 'manual', 0);
    return true;
  }

  /** Starts every run that is due at the clock's time, then re-arms the timer. */
  tick(): void {
    const now = this.opts.clock.now();
    for (const [catalogue, s] of this.slots) {
      const due = s.cron.nextRun(s.lastFired);
      if (!due || due > now) continue;
      let missed = 0;
      for (let t: Date | null = due; t && t <= now && missed < MISSED_COUNT_CAP; t = s.cron.nextRun(t)) missed++;
      // Every due time up to now is handled by this one decision: run once, or skip if busy.
      s.lastFired = now;
      if (s.running) this.opts.onEvent?.({ type: 'skipped', catalogue, due, reason: 'already-running' });
      else this.launch(catalogue, s, due, missed > 1 ? 'catch-up' : 'schedule', missed);
    }
    this.arm();
  }

  private launch(catalogue: string, s: Slot, due: Date, reason: 'schedule' | 'catch-up' | 'manual', missed: number): void {
    s.running = true;
    this.opts.onEvent?.({ type: 'started', catalogue, due, reason, missed });
    const done = (e?: { error: unknown }) => {
      s.running = false;
      this.opts.onEvent?.(e ? { type: 'failed', catalogue, error: e.error } : { type: 'finished', catalogue });
    };
    let p: Promise<unknown>;
    try {
      p = this.opts.run(catalogue, due);
    } catch (error) {
      p = Promise.reject(error);
    }
    p.then(
      () => done(),
      (error: unknown) => done({ error }),
    );
  }

  private arm(): void {
    if (this.timer !== null) this.opts.clock.clearTimer(this.timer);
    this.timer = null;
    if (!this.started) return;
    const now = this.opts.clock.now().getTime();
    let next = Infinity;
    for (const s of this.slots.values()) next = Math.min(next, s.cron.nextRun(s.lastFired)?.getTime() ?? Infinity);
    if (next === Infinity) return;
    this.timer = this.opts.clock.setTimer(() => this.tick(), Math.min(Math.max(0, next - now), MAX_TIMER_MS));
  }
}
