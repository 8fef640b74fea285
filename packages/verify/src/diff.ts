import { VerifyError } from './errors';
import { VERIFY_KEYS, keyFactor, keyUnit, type VerifyKey } from './keys';
import type { ProfileResult, ProfileStatus, RunRecord } from './run';
import { allowance, defaultTolerance } from './tolerance';

export interface RunRef {
  readonly id: string;
  readonly startedAt: string;
  readonly codeVersion: string;
}

/** A computed value that moved between two runs by more than its tolerance (values in the newer run's units). */
export interface Movement {
  readonly id: string;
  readonly key: VerifyKey;
  readonly unit: string;
  readonly from: number;
  readonly to: number;
  readonly change: number;
  /** change / |from|; null when from is 0. */
  readonly relative: number | null;
  readonly allowed: number;
}

/** Something failing: a property outside tolerance (key), or the whole profile (key null: error or missing). */
export interface FailureItem {
  readonly id: string;
  readonly key: VerifyKey | null;
  readonly status: ProfileStatus;
}

/** What changed from one run of a catalogue to a later one. */
export interface RunDiff {
  readonly from: RunRef;
  readonly to: RunRef;
  readonly codeChanged: boolean;
  readonly manifestChanged: boolean;
  readonly added: { readonly id: string; readonly drawing: string }[];
  readonly removed: { readonly id: string; readonly drawing: string }[];
  /** Rows whose drawing bytes differ (or appeared, or vanished). */
  readonly drawingsChanged: { readonly id: string; readonly drawing: string; readonly from: string | null; readonly to: string | null }[];
  readonly moved: Movement[];
  readonly newFailures: FailureItem[];
  readonly fixed: FailureItem[];
}

const ref = (r: RunRecord): RunRef => ({ id: r.id, startedAt: r.startedAt, codeVersion: r.codeVersion });

/** Everything failing in a profile, keyed "id key". */
function failures(p: ProfileResult): Map<string, FailureItem> {
  const out = new Map<string, FailureItem>();
  if (p.status === 'error' || p.status === 'missing') out.set(`${p.id}\0`, { id: p.id, key: null, status: p.status });
  for (const c of p.checks) if (!c.pass) out.set(`${p.id}\0${c.key}`, { id: p.id, key: c.key, status: p.status });
  return out;
}

/**
 * Values that moved by more than their tolerance: the newer run's `<key>_tol` where the key is
 * published, else the default, applied to the older value (plus both computations' error bounds).
 */
function movements(a: ProfileResult, b: ProfileResult): Movement[] {
  const out: Movement[] = [];
  for (const key of VERIFY_KEYS) {
    const va = a.values[key];
    const to = b.values[key];
    if (va === undefined || to === undefined) continue;
    const from = va * keyFactor(key, a.units, b.units);
    const tolerance = b.checks.find((c) => c.key === key)?.tolerance ?? defaultTolerance(key, b.units);
    const accuracy = Math.max(a.accuracy[key] ?? 0, b.accuracy[key] ?? 0);
    const scale = key === 'Ixy' ? Math.abs(b.values.I1 ?? 0) : 0;
    const allowed = allowance(tolerance, from, to, accuracy, scale);
    const change = to - from;
    if (Math.abs(change) > allowed)
      out.push({ id: b.id, key, unit: keyUnit(key, b.units), from, to, change, relative: from !== 0 ? change / Math.abs(from) : null, allowed });
  }
  return out;
}

/**
 * Compares two runs of the same catalogue, `from` the older: profiles added and removed, drawings
 * changed (by hash), values moved beyond tolerance, failures that are new and ones that were fixed.
 */
export function diffRuns(from: RunRecord, to: RunRecord): RunDiff {
  if (from.catalogue.name !== to.catalogue.name)
    throw new VerifyError('RUN_MISMATCH', `runs ${from.id} and ${to.id} are of different catalogues (${from.catalogue.name}, ${to.catalogue.name})`);
  const before = new Map(from.profiles.map((p) => [p.id, p]));
  const after = new Map(to.profiles.map((p) => [p.id, p]));
  const added = to.profiles.filter((p) => !before.has(p.id)).map((p) => ({ id: p.id, drawing: p.drawing }));
  const removed = from.profiles.filter((p) => !after.has(p.id)).map((p) => ({ id: p.id, drawing: p.drawing }));
  const drawingsChanged: RunDiff['drawingsChanged'][number][] = [];
  const moved: Movement[] = [];
  const failedBefore = new Map<string, FailureItem>();
  const failedAfter = new Map<string, FailureItem>();
  for (const b of to.profiles) {
    for (const [k, f] of failures(b)) failedAfter.set(k, f);
    const a = before.get(b.id);
    if (!a) continue;
    for (const [k, f] of failures(a)) failedBefore.set(k, f);
    if (a.drawingHash !== b.drawingHash || a.drawing !== b.drawing)
      drawingsChanged.push({ id: b.id, drawing: b.drawing, from: a.drawingHash, to: b.drawingHash });
    moved.push(...movements(a, b));
  }
  return {
    from: ref(from),
    to: ref(to),
    codeChanged: from.codeVersion !== to.codeVersion,
    manifestChanged: from.manifest.hash !== to.manifest.hash,
    added,
    removed,
    drawingsChanged,
    moved,
    newFailures: [...failedAfter].filter(([k]) => !failedBefore.has(k)).map(([, f]) => f),
    fixed: [...failedBefore].filter(([k]) => !failedAfter.has(k)).map(([, f]) => f),
  };
}

/** True when nothing differs that a person would act on. */
export const diffIsEmpty = (d: RunDiff): boolean =>
  !d.added.length && !d.removed.length && !d.drawingsChanged.length && !d.moved.length && !d.newFailures.length && !d.fixed.length;
