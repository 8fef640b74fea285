import { describe, expect, it } from 'vitest';
import { Scheduler, VerifyError, type ScheduleEvent } from '../src';
import { ManualClock } from './manual-clock';

const MIN = 60_000;
const HOUR = 60 * MIN;
const DAY = 24 * HOUR;

/** A run that stays open until the test finishes it, recording when it started. */
function harness(clock: ManualClock) {
  const started: { catalogue: string; at: string }[] = [];
  const open = new Map<string, () => void>();
  const events: ScheduleEvent[] = [];
  const scheduler = new Scheduler({
    clock,
    run: (catalogue) => {
      started.push({ catalogue, at: clock.now().toISOString() });
      return new Promise<void>((resolve) => open.set(catalogue, resolve));
    },
    onEvent: (e) => events.push(e),
  });
  const finish = async (catalogue: string) => {
    open.get(catalogue)!();
    open.delete(catalogue);
    await Promise.resolve();
    await Promise.resolve();
  };
  return { scheduler, started, events, finish };
}

describe('Scheduler on a controllable clock', () => {
  it('starts a run when its cron time falls due, and the next one at the next due time', async () => {
    const clock = new ManualClock('2026-03-02T01:00:00Z');
    const { scheduler, started, finish } = harness(clock);
    scheduler.set({ catalogue: 'plant', cron: '0 2 * * *', timezone: 'UTC' });
    scheduler.start();
    expect(started).toEqual([]);
    expect(clock.pending()).toEqual([new Date('2026-03-02T02:00:00Z')]);
    clock.advance(HOUR - 1);
    expect(started).toEqual([]);
    clock.advance(1);
    expect(started).toEqual([{ catalogue: 'plant', at: '2026-03-02T02:00:00.000Z' }]);
    await finish('plant');
    clock.advance(DAY);
    expect(started.map((s) => s.at)).toEqual(['2026-03-02T02:00:00.000Z', '2026-03-03T02:00:00.000Z']);
    scheduler.stop();
    expect(clock.pending()).toEqual([]);
  });

  it('does not overlap runs of one catalogue: a time due while it runs is skipped; others go on', async () => {
    const clock = new ManualClock('2026-03-02T00:00:30Z');
    const { scheduler, started, events, finish } = harness(clock);
    scheduler.set({ catalogue: 'slow', cron: '* * * * *' });
    scheduler.set({ catalogue: 'other', cron: '* * * * *' });
    scheduler.start();
    clock.advance(30_000); // 00:01
    expect(started.map((s) => s.catalogue)).toEqual(['slow', 'other']);
    await finish('other');
    clock.advance(MIN); // 00:02: slow still running
    await finish('other');
    clock.advance(MIN); // 00:03: still running
    expect(started.filter((s) => s.catalogue === 'slow')).toHaveLength(1);
    expect(started.filter((s) => s.catalogue === 'other')).toHaveLength(3);
    expect(events.filter((e) => e.type === 'skipped').map((e) => e.catalogue)).toEqual(['slow', 'slow']);
    expect(scheduler.isRunning('slow')).toBe(true);
    expect(scheduler.runNow('slow')).toBe(false);
    await finish('slow');
    expect(scheduler.isRunning('slow')).toBe(false);
    clock.advance(MIN); // 00:04: free again
    expect(started.filter((s) => s.catalogue === 'slow').map((s) => s.at)).toEqual(['2026-03-02T00:01:00.000Z', '2026-03-02T00:04:00.000Z']);
  });

  it('catches up the runs missed during downtime with exactly one run, then keeps the schedule', async () => {
    // Last nightly run Monday 02:00; the service was down until Thursday 09:30.
    const clock = new ManualClock('2026-03-05T09:30:00Z');
    const { scheduler, started, events, finish } = harness(clock);
    scheduler.set({ catalogue: 'plant', cron: '0 2 * * *', timezone: 'UTC', lastFired: new Date('2026-03-02T02:00:00Z') });
    scheduler.start();
    expect(started).toEqual([{ catalogue: 'plant', at: '2026-03-05T09:30:00.000Z' }]);
    expect(events[0]).toMatchObject({ type: 'started', reason: 'catch-up', missed: 3, due: new Date('2026-03-03T02:00:00Z') });
    await finish('plant');
    clock.advance(HOUR);
    expect(started).toHaveLength(1);
    expect(scheduler.nextDue('plant')).toEqual(new Date('2026-03-06T02:00:00Z'));
    clock.advance(DAY);
    expect(started.map((s) => s.at)).toEqual(['2026-03-05T09:30:00.000Z', '2026-03-06T02:00:00.000Z']);
    expect(events.filter((e) => e.type === 'started').map((e) => (e as { reason: string }).reason)).toEqual(['catch-up', 'schedule']);
  });

  it('catches nothing up for a schedule that never ran (no last time) or ran on time', () => {
    const clock = new ManualClock('2026-03-05T09:30:00Z');
    const { scheduler, started } = harness(clock);
    scheduler.set({ catalogue: 'new', cron: '0 2 * * *', timezone: 'UTC' });
    scheduler.set({ catalogue: 'fresh', cron: '0 2 * * *', timezone: 'UTC', lastFired: new Date('2026-03-05T02:00:00Z') });
    scheduler.start();
    expect(started).toEqual([]);
  });

  it('reports a failed run and runs again at the next due time', async () => {
    const clock = new ManualClock('2026-03-02T00:00:00Z');
    const events: ScheduleEvent[] = [];
    let calls = 0;
    const scheduler = new Scheduler({
      clock,
      run: () => {
        calls++;
        return Promise.reject(new Error('disk full'));
      },
      onEvent: (e) => events.push(e),
    });
    scheduler.set({ catalogue: 'c', cron: '*/5 * * * *' });
    scheduler.start();
    clock.advance(5 * MIN);
    await new Promise((r) => setImmediate(r));
    expect(events.map((e) => e.type)).toEqual(['started', 'failed']);
    clock.advance(5 * MIN);
    expect(calls).toBe(2);
  });

  it('refuses a bad cron expression with a typed error', () => {
    const s = new Scheduler({ clock: new ManualClock('2026-01-01T00:00:00Z'), run: async () => undefined });
    expect(() => s.set({ catalogue: 'x', cron: 'every night' })).toThrow(VerifyError);
    try {
      s.set({ catalogue: 'x', cron: '61 * * * *' });
    } catch (e) {
      expect((e as VerifyError).code).toBe('BAD_SCHEDULE');
    }
  });
});
