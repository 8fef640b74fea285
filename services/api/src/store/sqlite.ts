import { randomUUID } from 'node:crypto';
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
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

/**
 * The embedded store: one SQLite file (`keelson.db`) in the data folder, in WAL mode. Commits are
 * durable against a crash of the process always, and against a power cut where it matters: a new
 * job (uploads, items) commits with synchronous=FULL before it is acknowledged; results and
 * progress commit with NORMAL (no fsync each; after a power cut the last few may be recomputed).
 * better-sqlite3 is synchronous; its calls are short (blobs are the largest, at most the upload
 * limit). Statements are prepared once. One process owns the file: on start it takes over every
 * running item (`expireAllLeases`).
 */
export class SqliteStore implements Store {
  readonly kind = 'sqlite';
  private readonly db: Database.Database;
  private readonly statements = new Map<string, Database.Statement>();

  /** The prepared statement of `sql`, prepared on first use. */
  private sql(sql: string): Database.Statement {
    let st = this.statements.get(sql);
    if (!st) this.statements.set(sql, (st = this.db.prepare(sql)));
    return st;
  }

  constructor(file: string) {
    this.db = new Database(file);
    this.db.pragma('journal_mode = WAL');
    this.db.pragma('synchronous = NORMAL');
    this.db.pragma('foreign_keys = ON');
    this.db.pragma('busy_timeout = 5000');
  }

  /** `keelson.db` in `dir`, created with the folder if missing. */
  static inDir(dir: string): SqliteStore {
    mkdirSync(dir, { recursive: true });
    return new SqliteStore(join(dir, 'keelson.db'));
  }

  async migrate(): Promise<void> {
    this.db.exec('CREATE TABLE IF NOT EXISTS schema_migrations (version INTEGER PRIMARY KEY, applied_at BIGINT NOT NULL)');
    const done = new Set(this.db.prepare('SELECT version FROM schema_migrations').pluck().all() as number[]);
    for (const m of MIGRATIONS) {
      if (done.has(m.version)) continue;
      this.db.transaction(() => {
        this.db.exec(m.sqlite);
        this.db.prepare('INSERT INTO schema_migrations (version, applied_at) VALUES (?, ?)').run(m.version, Date.now());
      }).immediate();
    }
  }

  async ping(): Promise<void> {
    this.sql('SELECT 1').get();
  }

  async close(): Promise<void> {
    if (this.db.open) this.db.close();
  }

  async putBlob(sha256: string, bytes: Uint8Array): Promise<void> {
    this
      .sql('INSERT INTO blobs (sha256, bytes, size, created_at) VALUES (?, ?, ?, ?) ON CONFLICT (sha256) DO NOTHING')
      .run(sha256, Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength), bytes.byteLength, Date.now());
  }

  async getBlob(sha256: string): Promise<Buffer | null> {
    return (this.sql('SELECT bytes FROM blobs WHERE sha256 = ?').pluck().get(sha256) as Buffer | undefined) ?? null;
  }

  async getResult(key: string): Promise<StoredResult | null> {
    const r = this.sql('SELECT profile, error_code, error_message FROM results WHERE key = ?').get(key) as Row | undefined;
    return r ? resultOf(r) : null;
  }

  async putResult(key: string, result: StoredResult, now: number): Promise<void> {
    const c = resultColumns(result);
    this
      .sql('INSERT INTO results (key, profile, error_code, error_message, created_at) VALUES (?, ?, ?, ?, ?) ON CONFLICT (key) DO NOTHING')
      .run(key, c.profile, c.error_code, c.error_message, now);
  }

  async createJob(job: NewJob, items: readonly NewItem[]): Promise<void> {
    const insertJob = this.sql(
      `INSERT INTO jobs (id, tenant, created_at, settings, upload_name, upload_sha256, upload_bytes, upload_kind)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?)`,
    );
    const insertItem = this.sql(
      `INSERT INTO job_items (job_id, idx, name, source, blob_sha256, status, error_code, error_message, updated_at)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)`,
    );
    // FULL for this commit: the WAL is fsynced, with the blobs written before it, before the 202.
    this.db.pragma('synchronous = FULL');
    try {
      this.db.transaction(() => {
        const u = job.upload;
        insertJob.run(job.id, job.tenant, job.createdAt, JSON.stringify(job.settings), u.name, u.sha256, u.bytes, u.kind);
        items.forEach((it, idx) => {
          if ('error' in it) insertItem.run(job.id, idx, it.name, it.source, null, 'failed', it.error.code, it.error.message, job.createdAt);
          else insertItem.run(job.id, idx, it.name, it.source, it.blobSha256, 'pending', null, null, job.createdAt);
        });
        if (items.every((it) => 'error' in it)) this.sql('UPDATE jobs SET finished_at = ? WHERE id = ?').run(job.createdAt, job.id);
      }).immediate();
    } finally {
      this.db.pragma('synchronous = NORMAL');
    }
  }

  private counts(ids: readonly string[]): Map<string, Counts> {
    const out = new Map(ids.map((id) => [id, emptyCounts()]));
    if (!ids.length) return out;
    const rows = this.sql(`SELECT job_id, status, COUNT(*) AS n FROM job_items WHERE job_id IN (${ids.map(() => '?').join(',')}) GROUP BY job_id, status`)
      .all(...ids) as Row[];
    for (const r of rows) addCount(out.get(String(r.job_id))!, String(r.status), Number(r.n));
    return out;
  }

  async getJob(tenant: string, id: string): Promise<JobRecord | null> {
    const r = this.sql('SELECT * FROM jobs WHERE id = ? AND tenant = ?').get(id, tenant) as Row | undefined;
    return r ? jobOf(r, this.counts([id]).get(id)!) : null;
  }

  async listJobs(tenant: string, page: Page): Promise<JobRecord[]> {
    const rows = (
      page.before
        ? this
            .sql('SELECT * FROM jobs WHERE tenant = ? AND (created_at < ? OR (created_at = ? AND id < ?)) ORDER BY created_at DESC, id DESC LIMIT ?')
            .all(tenant, page.before.createdAt, page.before.createdAt, page.before.id, page.limit)
        : this.sql('SELECT * FROM jobs WHERE tenant = ? ORDER BY created_at DESC, id DESC LIMIT ?').all(tenant, page.limit)
    ) as Row[];
    const counts = this.counts(rows.map((r) => String(r.id)));
    return rows.map((r) => jobOf(r, counts.get(String(r.id))!));
  }

  async listItems(tenant: string, id: string, opts: { status?: ItemStatus } = {}): Promise<ItemRecord[]> {
    const rows = this
      .sql(
        `SELECT i.*, r.key AS r_key, r.profile AS r_profile, r.error_code AS r_error_code, r.error_message AS r_error_message
         FROM job_items i JOIN jobs j ON j.id = i.job_id LEFT JOIN results r ON r.key = i.result_key
         WHERE i.job_id = ? AND j.tenant = ? ${opts.status ? 'AND i.status = ?' : ''} ORDER BY i.idx`,
      )
      .all(...[id, tenant, ...(opts.status ? [opts.status] : [])]) as Row[];
    return rows.map(itemOf);
  }

  async cancelJob(tenant: string, id: string, now: number): Promise<JobRecord | null> {
    const found = this.db.transaction(() => {
      const r = this.sql('UPDATE jobs SET cancelled_at = COALESCE(cancelled_at, ?) WHERE id = ? AND tenant = ?').run(now, id, tenant);
      if (!r.changes) return false;
      this
        .sql("UPDATE job_items SET status = 'cancelled', owner = NULL, token = NULL, updated_at = ? WHERE job_id = ? AND status IN ('pending', 'running')")
        .run(now, id);
      this.sql('UPDATE jobs SET finished_at = COALESCE(finished_at, ?) WHERE id = ?').run(now, id);
      return true;
    }).immediate();
    return found ? this.getJob(tenant, id) : null;
  }

  async claimItems(o: ClaimOptions): Promise<Claim[]> {
    return this.db.transaction(() => {
      const rows = this
        .sql(
          `SELECT i.seq, i.job_id, i.idx, i.name, i.source, i.blob_sha256, i.attempts, j.tenant, j.settings
           FROM job_items i JOIN jobs j ON j.id = i.job_id
           WHERE i.status = 'pending' OR (i.status = 'running' AND i.lease_until < ?)
           ORDER BY i.seq LIMIT ?`,
        )
        .all(o.now, o.limit) as Row[];
      const claims: Claim[] = [];
      const take = this.sql(
        "UPDATE job_items SET status = 'running', attempts = attempts + 1, owner = ?, token = ?, lease_until = ?, updated_at = ? WHERE seq = ?",
      );
      const giveUp = this.sql(
        "UPDATE job_items SET status = 'failed', owner = NULL, token = NULL, error_code = 'GAVE_UP', error_message = ?, updated_at = ? WHERE seq = ?",
      );
      for (const r of rows) {
        const attempts = Number(r.attempts);
        if (attempts >= o.maxAttempts) {
          giveUp.run(`${String(r.source)}: computation stopped the service ${attempts} times; not tried again`, o.now, r.seq);
          this.finishIfDone(String(r.job_id), o.now);
          continue;
        }
        const token = randomUUID();
        take.run(o.owner, token, o.now + o.leaseMs, o.now, r.seq);
        claims.push({
          seq: Number(r.seq),
          jobId: String(r.job_id),
          idx: Number(r.idx),
          tenant: String(r.tenant),
          name: String(r.name),
          source: String(r.source),
          blobSha256: String(r.blob_sha256),
          settings: JSON.parse(String(r.settings)) as Record<string, unknown>,
          attempts: attempts + 1,
          token,
        });
      }
      return claims;
    }).immediate();
  }

  private finishIfDone(jobId: string, now: number): void {
    this
      .sql(
        `UPDATE jobs SET finished_at = ? WHERE id = ? AND finished_at IS NULL
         AND NOT EXISTS (SELECT 1 FROM job_items WHERE job_id = ? AND status IN ('pending', 'running'))`,
      )
      .run(now, jobId, jobId);
  }

  async renewLeases(owner: string, seqs: readonly number[], until: number): Promise<void> {
    const renew = this.sql("UPDATE job_items SET lease_until = ? WHERE seq = ? AND owner = ? AND status = 'running'");
    this.db.transaction(() => {
      for (const seq of seqs) renew.run(until, seq, owner);
    })();
  }

  async completeItem(claim: Claim, outcome: Outcome, now: number): Promise<boolean> {
    return this.db.transaction(() => {
      const r = this
        .sql(
          `UPDATE job_items SET status = ?, result_key = ?, error_code = ?, error_message = ?, owner = NULL, token = NULL, updated_at = ?
           WHERE seq = ? AND status = 'running' AND token = ?`,
        )
        .run(
          'error' in outcome ? 'failed' : 'done',
          'error' in outcome ? null : outcome.resultKey,
          'error' in outcome ? outcome.error.code : null,
          'error' in outcome ? outcome.error.message : null,
          now,
          claim.seq,
          claim.token,
        );
      if (r.changes) this.finishIfDone(claim.jobId, now);
      return r.changes > 0;
    }).immediate();
  }

  async releaseClaims(owner: string): Promise<number> {
    return this
      .sql(
        "UPDATE job_items SET status = 'pending', attempts = MAX(attempts - 1, 0), owner = NULL, token = NULL, lease_until = NULL WHERE owner = ? AND status = 'running'",
      )
      .run(owner).changes;
  }

  async expireAllLeases(): Promise<number> {
    return this.sql("UPDATE job_items SET lease_until = 0 WHERE status = 'running'").run().changes;
  }

  async pendingCount(): Promise<number> {
    return Number(this.sql("SELECT COUNT(*) FROM job_items WHERE status = 'pending'").pluck().get());
  }
}
