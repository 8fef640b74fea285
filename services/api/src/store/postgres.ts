import { randomUUID } from 'node:crypto';
import pg from 'pg';
import { MIGRATIONS } from './migrations';
import { addCount, itemOf, jobOf, resultColumns, resultOf, type Row } from './rows';
import {
  emptyCounts,
  type Claim,
  type ClaimOptions,
  type Counts,
  type ItemRecord,
  type ItemStatus,
  type JobRecord,
  type NewItem,
  type NewJob,
  type Outcome,
  type Page,
  type Store,
  type StoredResult,
} from './types';

export interface PostgresOptions {
  readonly connectionString: string;
  /** Schema holding Keelson's tables (created if missing); default the connection's search path. */
  readonly schema?: string;
  readonly maxConnections?: number;
}

/** An advisory-lock key of our own, so that processes starting together migrate one at a time. */
const MIGRATION_LOCK = 0x6b65656c;

const quoteIdent = (s: string) => `"${s.replace(/"/g, '""')}"`;

/**
 * The production store: PostgreSQL through a connection pool. Many service processes may share
 * it: items are claimed with `FOR UPDATE SKIP LOCKED` and leases, so a process that dies leaves
 * its drawings to the others once their leases pass.
 */
export class PostgresStore implements Store {
  readonly kind = 'postgres';
  private readonly pool: pg.Pool;

  constructor(private readonly opts: PostgresOptions) {
    this.pool = new pg.Pool({
      connectionString: opts.connectionString,
      max: opts.maxConnections ?? 10,
      ...(opts.schema ? { options: `-c search_path=${quoteIdent(opts.schema)}` } : {}),
    });
    // An idle client losing its connection must not take the process down; the next query reconnects.
    this.pool.on('error', () => {});
  }

  private async tx<T>(f: (c: pg.PoolClient) => Promise<T>): Promise<T> {
    const c = await this.pool.connect();
    try {
      await c.query('BEGIN');
      const out = await f(c);
      await c.query('COMMIT');
      return out;
    } catch (e) {
      await c.query('ROLLBACK').catch(() => {});
      throw e;
    } finally {
      c.release();
    }
  }

  async migrate(): Promise<void> {
    await this.tx(async (c) => {
      await c.query('SELECT pg_advisory_xact_lock($1)', [MIGRATION_LOCK]);
      if (this.opts.schema) await c.query(`CREATE SCHEMA IF NOT EXISTS ${quoteIdent(this.opts.schema)}`);
      await c.query('CREATE TABLE IF NOT EXISTS schema_migrations (version INTEGER PRIMARY KEY, applied_at BIGINT NOT NULL)');
      const done = new Set((await c.query('SELECT version FROM schema_migrations')).rows.map((r: Row) => Number(r.version)));
      for (const m of MIGRATIONS) {
        if (done.has(m.version)) continue;
        await c.query(m.postgres);
        await c.query('INSERT INTO schema_migrations (version, applied_at) VALUES ($1, $2)', [m.version, Date.now()]);
      }
    });
  }

  async ping(): Promise<void> {
    await this.pool.query('SELECT 1');
  }

  async close(): Promise<void> {
    await this.pool.end();
  }

  async putBlob(sha256: string, bytes: Uint8Array): Promise<void> {
    await this.pool.query('INSERT INTO blobs (sha256, bytes, size, created_at) VALUES ($1, $2, $3, $4) ON CONFLICT (sha256) DO NOTHING', [
      sha256,
      Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength),
      bytes.byteLength,
      Date.now(),
    ]);
  }

  async getBlob(sha256: string): Promise<Buffer | null> {
    const r = await this.pool.query('SELECT bytes FROM blobs WHERE sha256 = $1', [sha256]);
    return (r.rows[0]?.bytes as Buffer | undefined) ?? null;
  }

  async getResult(key: string): Promise<StoredResult | null> {
    const r = await this.pool.query('SELECT profile, error_code, error_message FROM results WHERE key = $1', [key]);
    return r.rows[0] ? resultOf(r.rows[0] as Row) : null;
  }

  async putResult(key: string, result: StoredResult, now: number): Promise<void> {
    const c = resultColumns(result);
    await this.pool.query(
      'INSERT INTO results (key, profile, error_code, error_message, created_at) VALUES ($1, $2, $3, $4, $5) ON CONFLICT (key) DO NOTHING',
      [key, c.profile, c.error_code, c.error_message, now],
    );
  }

  async createJob(job: NewJob, items: readonly NewItem[]): Promise<void> {
    await this.tx(async (c) => {
      const u = job.upload;
      const allFailed = items.every((it) => 'error' in it);
      await c.query(
        `INSERT INTO jobs (id, tenant, created_at, settings, upload_name, upload_sha256, upload_bytes, upload_kind, finished_at)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9)`,
        [job.id, job.tenant, job.createdAt, JSON.stringify(job.settings), u.name, u.sha256, u.bytes, u.kind, allFailed ? job.createdAt : null],
      );
      // Rows in batches: one statement per 500 drawings rather than per drawing.
      for (let start = 0; start < items.length; start += 500) {
        const batch = items.slice(start, start + 500);
        const values: unknown[] = [];
        const rows = batch.map((it, k) => {
          const e = 'error' in it ? it.error : null;
          values.push(job.id, start + k, it.name, it.source, e ? null : (it as { blobSha256: string }).blobSha256, e ? 'failed' : 'pending', e?.code ?? null, e?.message ?? null, job.createdAt);
          const b = k * 9;
          return `($${b + 1}, $${b + 2}, $${b + 3}, $${b + 4}, $${b + 5}, $${b + 6}, $${b + 7}, $${b + 8}, $${b + 9})`;
        });
        await c.query(
          `INSERT INTO job_items (job_id, idx, name, source, blob_sha256, status, error_code, error_message, updated_at) VALUES ${rows.join(', ')}`,
          values,
        );
      }
    });
  }

  private async counts(ids: readonly string[]): Promise<Map<string, Counts>> {
    const out = new Map(ids.map((id) => [id, emptyCounts()]));
    if (!ids.length) return out;
    const r = await this.pool.query('SELECT job_id, status, COUNT(*) AS n FROM job_items WHERE job_id = ANY($1) GROUP BY job_id, status', [ids]);
    for (const row of r.rows as Row[]) addCount(out.get(String(row.job_id))!, String(row.status), Number(row.n));
    return out;
  }

  async getJob(tenant: string, id: string): Promise<JobRecord | null> {
    const r = await this.pool.query('SELECT * FROM jobs WHERE id = $1 AND tenant = $2', [id, tenant]);
    if (!r.rows[0]) return null;
    return jobOf(r.rows[0] as Row, (await this.counts([id])).get(id)!);
  }

  async listJobs(tenant: string, page: Page): Promise<JobRecord[]> {
    const r = page.before
      ? await this.pool.query(
          'SELECT * FROM jobs WHERE tenant = $1 AND (created_at, id) < ($2, $3) ORDER BY created_at DESC, id DESC LIMIT $4',
          [tenant, page.before.createdAt, page.before.id, page.limit],
        )
      : await this.pool.query('SELECT * FROM jobs WHERE tenant = $1 ORDER BY created_at DESC, id DESC LIMIT $2', [tenant, page.limit]);
    const rows = r.rows as Row[];
    const counts = await this.counts(rows.map((row) => String(row.id)));
    return rows.map((row) => jobOf(row, counts.get(String(row.id))!));
  }

  async listItems(tenant: string, id: string, opts: { status?: ItemStatus } = {}): Promise<ItemRecord[]> {
    const r = await this.pool.query(
      `SELECT i.*, r.key AS r_key, r.profile AS r_profile, r.error_code AS r_error_code, r.error_message AS r_error_message
       FROM job_items i JOIN jobs j ON j.id = i.job_id LEFT JOIN results r ON r.key = i.result_key
       WHERE i.job_id = $1 AND j.tenant = $2 ${opts.status ? 'AND i.status = $3' : ''} ORDER BY i.idx`,
      [id, tenant, ...(opts.status ? [opts.status] : [])],
    );
    return (r.rows as Row[]).map(itemOf);
  }

  async cancelJob(tenant: string, id: string, now: number): Promise<JobRecord | null> {
    const found = await this.tx(async (c) => {
      const r = await c.query('UPDATE jobs SET cancelled_at = COALESCE(cancelled_at, $1) WHERE id = $2 AND tenant = $3', [now, id, tenant]);
      if (!r.rowCount) return false;
      await c.query(
        "UPDATE job_items SET status = 'cancelled', owner = NULL, token = NULL, updated_at = $1 WHERE job_id = $2 AND status IN ('pending', 'running')",
        [now, id],
      );
      await c.query('UPDATE jobs SET finished_at = COALESCE(finished_at, $1) WHERE id = $2', [now, id]);
      return true;
    });
    return found ? this.getJob(tenant, id) : null;
  }

  private async finishIfDone(c: pg.PoolClient, jobId: string, now: number): Promise<void> {
    await c.query(
      `UPDATE jobs SET finished_at = $1 WHERE id = $2 AND finished_at IS NULL
       AND NOT EXISTS (SELECT 1 FROM job_items WHERE job_id = $2 AND status IN ('pending', 'running'))`,
      [now, jobId],
    );
  }

  async claimItems(o: ClaimOptions): Promise<Claim[]> {
    return this.tx(async (c) => {
      const r = await c.query(
        `SELECT i.seq, i.job_id, i.idx, i.name, i.source, i.blob_sha256, i.attempts, j.tenant, j.settings
         FROM job_items i JOIN jobs j ON j.id = i.job_id
         WHERE i.status = 'pending' OR (i.status = 'running' AND i.lease_until < $1)
         ORDER BY i.seq LIMIT $2 FOR UPDATE OF i SKIP LOCKED`,
        [o.now, o.limit],
      );
      const claims: Claim[] = [];
      for (const row of r.rows as Row[]) {
        const attempts = Number(row.attempts);
        if (attempts >= o.maxAttempts) {
          await c.query(
            "UPDATE job_items SET status = 'failed', owner = NULL, token = NULL, error_code = 'GAVE_UP', error_message = $1, updated_at = $2 WHERE seq = $3",
            [`${String(row.source)}: computation stopped the service ${attempts} times; not tried again`, o.now, row.seq],
          );
          await this.finishIfDone(c, String(row.job_id), o.now);
          continue;
        }
        const token = randomUUID();
        await c.query(
          "UPDATE job_items SET status = 'running', attempts = attempts + 1, owner = $1, token = $2, lease_until = $3, updated_at = $4 WHERE seq = $5",
          [o.owner, token, o.now + o.leaseMs, o.now, row.seq],
        );
        claims.push({
          seq: Number(row.seq),
          jobId: String(row.job_id),
          idx: Number(row.idx),
          tenant: String(row.tenant),
          name: String(row.name),
          source: String(row.source),
          blobSha256: String(row.blob_sha256),
          settings: JSON.parse(String(row.settings)) as Record<string, unknown>,
          attempts: attempts + 1,
          token,
        });
      }
      return claims;
    });
  }

  async renewLeases(owner: string, seqs: readonly number[], until: number): Promise<void> {
    if (!seqs.length) return;
    await this.pool.query("UPDATE job_items SET lease_until = $1 WHERE seq = ANY($2) AND owner = $3 AND status = 'running'", [until, seqs, owner]);
  }

  async completeItem(claim: Claim, outcome: Outcome, now: number): Promise<boolean> {
    return this.tx(async (c) => {
      const failed = 'error' in outcome;
      const r = await c.query(
        `UPDATE job_items SET status = $1, result_key = $2, error_code = $3, error_message = $4, owner = NULL, token = NULL, updated_at = $5
         WHERE seq = $6 AND status = 'running' AND token = $7`,
        [
          failed ? 'failed' : 'done',
          failed ? null : outcome.resultKey,
          failed ? outcome.error.code : null,
          failed ? outcome.error.message : null,
          now,
          claim.seq,
          claim.token,
        ],
      );
      if (r.rowCount) await this.finishIfDone(c, claim.jobId, now);
      return (r.rowCount ?? 0) > 0;
    });
  }

  async releaseClaims(owner: string): Promise<number> {
    const r = await this.pool.query(
      "UPDATE job_items SET status = 'pending', attempts = GREATEST(attempts - 1, 0), owner = NULL, token = NULL, lease_until = NULL WHERE owner = $1 AND status = 'running'",
      [owner],
    );
    return r.rowCount ?? 0;
  }

  async expireAllLeases(): Promise<number> {
    const r = await this.pool.query("UPDATE job_items SET lease_until = 0 WHERE status = 'running'");
    return r.rowCount ?? 0;
  }

  async pendingCount(): Promise<number> {
    const r = await this.pool.query("SELECT COUNT(*) AS n FROM job_items WHERE status = 'pending'");
    return Number((r.rows[0] as Row).n);
  }
}
