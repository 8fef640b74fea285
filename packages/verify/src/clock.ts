/** Time as the scheduler, webhooks and runs see it: injected so tests control it without sleeping. */
export interface Clock {
  now(): Date;
  /** Calls `f` after `ms` milliseconds; returns a handle for `clearTimer`. */
  setTimer(f: () => void, ms: number): unknown;
  clearTimer(handle: unknown): void;
}

/** Longest single wait Node's timers accept (2³¹ − 1 ms, about 24.8 days); longer waits re-arm. */
export const MAX_TIMER_MS = 2 ** 31 - 1;

export const systemClock: Clock = {
  now: () => new Date(),
  setTimer: (f, ms) => setTimeout(f, Math.min(ms, MAX_TIMER_MS)),
  clearTimer: (h) => clearTimeout(h as ReturnType<typeof setTimeout>),
};

/** Resolves after `ms` on the given clock. */
export const sleep = (clock: Clock, ms: number): Promise<void> => new Promise((resolve) => void clock.setTimer(resolve, ms));
