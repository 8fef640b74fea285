import { randomBytes } from 'node:crypto';
import type { OutputUnit } from '@keelson/geometry';
import type { Check } from './check';
import type { VerifyKey } from './keys';
import type { Material } from './materials';
import type { Outline } from './outline';

/**
 * pass: every published value within tolerance; fail: one or more outside; error: the drawing could
 * not be read (fault says why); missing: the manifest names a drawing the catalogue does not have.
 */
export type ProfileStatus = 'pass' | 'fail' | 'error' | 'missing';

/** A drawing fault as stored: its stable code (DxfError, GeometryError, or INTERNAL) and one line. */
export interface Fault {
  readonly code: string;
  readonly message: string;
}

/** One manifest row's outcome. Values are in `units` (m in kg/m), as the manifest publishes them. */
export interface ProfileResult {
  readonly id: string;
  readonly drawing: string;
  readonly revision: string;
  readonly material: string;
  readonly units: OutputUnit;
  readonly description?: string;
  readonly status: ProfileStatus;
  /** SHA-256 of the drawing's bytes; null when it is missing. */
  readonly drawingHash: string | null;
  /** Every computed value (not only the published ones): what a later run's diff compares. */
  readonly values: Partial<Record<VerifyKey, number>>;
  readonly accuracy: Partial<Record<VerifyKey, number>>;
  readonly checks: Check[];
  readonly warnings: string[];
  readonly fault: Fault | null;
  readonly outline: Outline | null;
  /** Values taken from the previous run: same drawing bytes, units and code version. */
  readonly reused: boolean;
}

export interface RunSummary {
  readonly profiles: number;
  readonly pass: number;
  readonly fail: number;
  readonly error: number;
  readonly missing: number;
  /** Drawings of the catalogue no manifest row names: reported, not failed. */
  readonly unlisted: number;
  readonly checks: number;
  readonly checksFailed: number;
}

/** Everything a run found, stored as one JSON document: the report, the exports and diffs come from it. */
export interface RunRecord {
  readonly schema: 'keelson.verification-run/1';
  readonly id: string;
  readonly catalogue: { readonly name: string; readonly source: string };
  readonly startedAt: string;
  readonly finishedAt: string;
  /** Version of the code that computed the values: a change invalidates reused values. */
  readonly codeVersion: string;
  readonly manifest: { readonly source: string; readonly hash: string };
  /** The materials the rows use, as they stood for this run. */
  readonly materials: Readonly<Record<string, Material>>;
  readonly summary: RunSummary;
  /** In manifest order. */
  readonly profiles: ProfileResult[];
  readonly unlisted: { readonly drawing: string; readonly hash: string | null }[];
}

/** True when nothing failed, errored or went missing (unlisted drawings do not fail a run). */
export const runPassed = (run: Pick<RunRecord, 'summary'>): boolean => run.summary.fail + run.summary.error + run.summary.missing === 0;

export function summarise(profiles: readonly ProfileResult[], unlisted: number): RunSummary {
  const count = (s: ProfileStatus) => profiles.filter((p) => p.status === s).length;
  const checks = profiles.flatMap((p) => p.checks);
  return {
    profiles: profiles.length,
    pass: count('pass'),
    fail: count('fail'),
    error: count('error'),
    missing: count('missing'),
    unlisted,
    checks: checks.length,
    checksFailed: checks.filter((c) => !c.pass).length,
  };
}

/**
 * "20261201T223000Z-3fa2c1": sorts by start time, unique without coordination. The suffix is the
 * millisecond (times 4096) plus 12 random bits, in six hex digits, so two runs started within the
 * same second still sort in the order they started (a catalogue verified twice in a second diffs
 * the right way round).
 */
export function newRunId(at: Date): string {
  const stamp = at.toISOString().replace(/[-:]/g, '').replace(/\.\d+Z$/, 'Z');
  const suffix = at.getUTCMilliseconds() * 4096 + (randomBytes(2).readUInt16BE(0) & 0xfff);
  return `${stamp}-${suffix.toString(16).padStart(6, '0')}`;
}
