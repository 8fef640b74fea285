import { diffIsEmpty, type RunDiff } from './diff';
import { runPassed, type RunRecord } from './run';

/** Event name of a finished verification run. */
export const RUN_COMPLETED = 'verification.completed';

/**
 * The webhook body for a finished run, small enough for any PLM inbox: identity, pass/fail, the
 * summary, the profiles needing attention with their failing keys, the changes since the previous
 * run in counts and ids, and where the full report can be fetched (when served).
 */
export function runCompletedPayload(run: RunRecord, opts: { diff?: RunDiff | null; reportUrl?: string } = {}) {
  const d = opts.diff;
  return {
    event: RUN_COMPLETED,
    run: { id: run.id, catalogue: run.catalogue.name, startedAt: run.startedAt, finishedAt: run.finishedAt, codeVersion: run.codeVersion },
    passed: runPassed(run),
    summary: run.summary,
    attention: run.profiles
      .filter((p) => p.status !== 'pass')
      .map((p) => ({ id: p.id, revision: p.revision, status: p.status, failed: p.checks.filter((c) => !c.pass).map((c) => c.key), fault: p.fault?.code ?? null })),
    changes: d
      ? {
          since: d.from.id,
          empty: diffIsEmpty(d),
          added: d.added.map((a) => a.id),
          removed: d.removed.map((a) => a.id),
          drawingsChanged: d.drawingsChanged.map((c) => c.id),
          moved: d.moved.map((m) => ({ id: m.id, key: m.key })),
          newFailures: d.newFailures,
          fixed: d.fixed,
        }
      : null,
    reportUrl: opts.reportUrl ?? null,
  };
}
