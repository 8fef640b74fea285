import type { FailedProfile, Profile } from '@keelson/profile';
import type { Config } from './config';
import { resultKey, sha256 } from './keys';
import type { Metrics } from './metrics';
import type { ComputePool } from './pool/pool';
import type { Settings } from './settings';
import type { ItemError, Store, StoredResult } from './store';

/** A drawing's entries (profiles, and failed profiles of a split drawing) or the drawing's fault. */
export type Entry = Profile | FailedProfile;
export type Computed = ({ readonly profiles: Entry[] } | { readonly error: ItemError; readonly internal?: boolean }) & {
  readonly key: string;
  readonly cached: boolean;
};

/** Faults that depend on the machine or the moment, not only on the drawing: never stored. */
const TRANSIENT = new Set(['DRAWING_TIMEOUT', 'DRAWING_MEMORY', 'INTERNAL']);

/**
 * One drawing to its result: answered from the store when the same tenant sent the same bytes,
 * name and settings to the same code before; otherwise computed in the pool and stored (faults of
 * the drawing too, since they are as deterministic as profiles).
 */
export class Computer {
  constructor(
    private readonly store: Store,
    private readonly pool: ComputePool,
    private readonly metrics: Metrics,
    private readonly cfg: Config,
  ) {}

  keyOf(tenant: string, d: { name: string; source: string; sha256: string }, settings: Settings): string {
    return resultKey(tenant, sha256(JSON.stringify([d.sha256, d.name, d.source])), settings);
  }

  async compute(
    tenant: string,
    d: { readonly name: string; readonly source: string; readonly bytes: Uint8Array; readonly sha256?: string },
    settings: Settings,
    opts: { path: 'compute' | 'job'; signal?: AbortSignal },
  ): Promise<Computed> {
    const key = this.keyOf(tenant, { name: d.name, source: d.source, sha256: d.sha256 ?? sha256(d.bytes) }, settings);
    const stored = await this.store.getResult(key);
    if (stored) {
      this.metrics.drawings.inc({ path: opts.path, outcome: 'cached' });
      return { ...(stored as { profiles: Entry[] } | { error: ItemError }), key, cached: true };
    }
    const t0 = performance.now();
    const out = await this.pool.run(
      { bytes: d.bytes, name: d.name, source: d.source, settings, maxBytes: this.cfg.maxUploadBytes },
      { priority: opts.path === 'compute' ? 'interactive' : 'background', signal: opts.signal },
    );
    this.metrics.drawingSeconds.observe({ path: opts.path }, (performance.now() - t0) / 1000);
    this.metrics.drawings.inc({ path: opts.path, outcome: out.ok ? 'done' : 'failed' });
    if (out.ok) {
      await this.store.putResult(key, { profiles: out.profiles }, Date.now());
      return { profiles: out.profiles, key, cached: false };
    }
    const error = { code: out.code, message: out.message };
    if (!TRANSIENT.has(out.code)) await this.store.putResult(key, { error } satisfies StoredResult, Date.now());
    return { error, internal: out.internal, key, cached: false };
  }
}
