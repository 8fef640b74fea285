import type { Clock } from '../src';

/**
 * A clock that moves only when told: `advance(ms)` steps through the timers due in that span in
 * time order, firing each at its own time, so a test checks schedules without sleeping.
 */
export class ManualClock implements Clock {
  private t: number;
  private seq = 0;
  private timers = new Map<number, { at: number; f: () => void }>();

  constructor(start: Date | string) {
    this.t = new Date(start).getTime();
  }

  now(): Date {
    return new Date(this.t);
  }

  setTimer(f: () => void, ms: number): unknown {
    const id = ++this.seq;
    this.timers.set(id, { at: this.t + Math.max(0, ms), f });
    return id;
  }

  clearTimer(handle: unknown): void {
    this.timers.delete(handle as number);
  }

  /** Timers waiting, by due time. */
  pending(): Date[] {
    return [...this.timers.values()].map((x) => new Date(x.at)).sort((a, b) => a.getTime() - b.getTime());
  }

  /** Moves time forward by `ms`, firing due timers in order (timers set while firing are honoured). */
  advance(ms: number): void {
    const end = this.t + ms;
    for (;;) {
      let next: [number, { at: number; f: () => void }] | null = null;
      for (const e of this.timers) if (e[1].at <= end && (!next || e[1].at < next[1].at)) next = e;
      if (!next) break;
      this.timers.delete(next[0]);
      this.t = next[1].at;
      next[1].f();
    }
    this.t = end;
  }

  /** Jumps to a time without firing anything: the process was down meanwhile. */
  jump(to: Date | string): void {
    this.t = new Date(to).getTime();
  }
}
