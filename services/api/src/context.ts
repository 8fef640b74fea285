import type { KeyRing } from './auth';
import type { Computer } from './computer';
import type { Config } from './config';
import type { Metrics } from './metrics';
import type { ComputePool } from './pool/pool';
import type { JobQueue } from './queue';
import type { Store } from './store';

/** What the route plugins share. */
export interface Context {
  readonly cfg: Config;
  readonly store: Store;
  readonly pool: ComputePool;
  readonly computer: Computer;
  readonly queue: JobQueue;
  readonly metrics: Metrics;
  readonly keys: KeyRing;
  /** Set when SIGTERM (or close) starts: readiness fails and new work is refused. */
  readonly state: { shuttingDown: boolean };
}

declare module 'fastify' {
  interface FastifyRequest {
    /** Tenant of the request's key (LOCAL_TENANT without keys); set before any handler runs. */
    tenant: string;
  }
}
