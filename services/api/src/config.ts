import { availableParallelism } from 'node:os';
import { resolve } from 'node:path';

/** Everything the service can be told, with its defaults; `configFromEnv` reads it from the environment. */
export interface Config {
  /** Folder of the embedded store (SQLite) when no database URL is set. */
  readonly dataDir: string;
  /** PostgreSQL connection string; the embedded SQLite store when absent. */
  readonly databaseUrl?: string;
  /** PostgreSQL schema (default: the connection's search path). */
  readonly databaseSchema?: string;
  /** API keys as `tenant:key` pairs; none means no authentication, on 127.0.0.1 only. */
  readonly apiKeys: readonly { readonly tenant: string; readonly key: string }[];
  /** Worker threads computing drawings (default: the cores, at least 1). */
  readonly workers: number;
  /** Wall-time limit of one drawing, ms. */
  readonly drawingTimeoutMs: number;
  /** Heap limit of one computation thread, MiB. */
  readonly workerMemoryMb: number;
  /** Largest upload, bytes. */
  readonly maxUploadBytes: number;
  /** ZIP caps: entries listed, bytes one entry and all entries may inflate to. */
  readonly zip: { readonly maxEntries: number; readonly maxEntryBytes: number; readonly maxTotalBytes: number };
  /** Most drawings `/v1/compute` answers in one request; more go to `/v1/jobs`. */
  readonly maxComputeDrawings: number;
  /** Drawings waiting for a thread before `/v1/compute` answers 503. */
  readonly maxWaiting: number;
  /** Requests per minute per key (per address without keys). */
  readonly rateLimitPerMinute: number;
  /** Claims of one drawing before it fails as GAVE_UP (each crash of the service counts one). */
  readonly maxAttempts: number;
  /** Lease of a claimed drawing, renewed while it is computed; another process takes it over after. */
  readonly leaseMs: number;
  /** How long SIGTERM waits for running drawings before handing them back to the queue. */
  readonly shutdownGraceMs: number;
  /** How often the dispatcher looks for work it was not told about (other processes' jobs). */
  readonly pollMs: number;
}

const MiB = 2 ** 20;

export const DEFAULTS: Config = {
  dataDir: resolve('data'),
  apiKeys: [],
  workers: Math.max(1, availableParallelism()),
  drawingTimeoutMs: 60_000,
  workerMemoryMb: 1024,
  maxUploadBytes: 64 * MiB,
  zip: { maxEntries: 10_000, maxEntryBytes: 64 * MiB, maxTotalBytes: 512 * MiB },
  maxComputeDrawings: 100,
  maxWaiting: 1_000,
  rateLimitPerMinute: 6_000,
  maxAttempts: 3,
  leaseMs: 30_000,
  shutdownGraceMs: 10_000,
  pollMs: 1_000,
};

/** A malformed setting: the service refuses to start, naming the variable. */
export class ConfigError extends Error {
  override readonly name = 'ConfigError';
}

/** `tenant:key,tenant:key` → pairs; tenants are [A-Za-z0-9_.-]+ and keys at least 16 characters. */
export function parseApiKeys(text: string | undefined): Config['apiKeys'] {
  if (!text?.trim()) return [];
  return text.split(',').map((pair) => {
    const i = pair.indexOf(':');
    const tenant = pair.slice(0, i).trim();
    const key = pair.slice(i + 1).trim();
    if (i < 0 || !/^[A-Za-z0-9_.-]+$/.test(tenant) || key.length < 16)
      throw new ConfigError('KEELSON_API_KEYS must be tenant:key pairs separated by commas, each key at least 16 characters');
    return { tenant, key };
  });
}

function int(env: NodeJS.ProcessEnv, name: string, fallback: number, min = 1): number {
  const v = env[name];
  if (v === undefined || v === '') return fallback;
  const n = Number(v);
  if (!Number.isInteger(n) || n < min) throw new ConfigError(`${name} must be an integer ≥ ${min}, not "${v}"`);
  return n;
}

export function configFromEnv(env: NodeJS.ProcessEnv = process.env): Config {
  return {
    ...DEFAULTS,
    dataDir: resolve(env.KEELSON_DATA_DIR || 'data'),
    databaseUrl: env.KEELSON_DATABASE_URL || undefined,
    databaseSchema: env.KEELSON_DATABASE_SCHEMA || undefined,
    apiKeys: parseApiKeys(env.KEELSON_API_KEYS),
    workers: int(env, 'KEELSON_WORKERS', DEFAULTS.workers),
    drawingTimeoutMs: int(env, 'KEELSON_DRAWING_TIMEOUT_MS', DEFAULTS.drawingTimeoutMs),
    workerMemoryMb: int(env, 'KEELSON_WORKER_MEMORY_MB', DEFAULTS.workerMemoryMb, 64),
    maxUploadBytes: int(env, 'KEELSON_MAX_UPLOAD_MB', DEFAULTS.maxUploadBytes / MiB) * MiB,
    zip: {
      maxEntries: int(env, 'KEELSON_ZIP_MAX_ENTRIES', DEFAULTS.zip.maxEntries),
      maxEntryBytes: int(env, 'KEELSON_ZIP_MAX_ENTRY_MB', DEFAULTS.zip.maxEntryBytes / MiB) * MiB,
      maxTotalBytes: int(env, 'KEELSON_ZIP_MAX_TOTAL_MB', DEFAULTS.zip.maxTotalBytes / MiB) * MiB,
    },
    maxComputeDrawings: int(env, 'KEELSON_MAX_COMPUTE_DRAWINGS', DEFAULTS.maxComputeDrawings),
    rateLimitPerMinute: int(env, 'KEELSON_RATE_LIMIT', DEFAULTS.rateLimitPerMinute),
    shutdownGraceMs: int(env, 'KEELSON_SHUTDOWN_GRACE_MS', DEFAULTS.shutdownGraceMs, 0),
  };
}
