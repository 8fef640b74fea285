/**
 * The durable state of the service behind one interface: uploads (content-addressed blobs), jobs and
 * their drawings (items), and computed results keyed by input hash + settings + code version.
 * Implemented by SQLite (embedded default) and PostgreSQL; one test suite runs against both.
 *
 * Item life cycle: pending → running (claimed with a lease by one worker process) → done | failed;
 * pending or running → cancelled when the job is cancelled. A running item whose lease has passed
 * (its process died) is claimable again; each claim counts an attempt, and an item claimed
 * `maxAttempts` times without finishing fails instead of taking the service down once more.
 * Completion is conditional on the claim token, so a drawing finished twice is recorded once.
 */
export type ItemStatus = 'pending' | 'running' | 'done' | 'failed' | 'cancelled';
export type JobStatus = 'queued' | 'running' | 'done' | 'cancelled';

/** A per-drawing fault: stable code and a one-line message. */
export interface ItemError {
  readonly code: string;
  readonly message: string;
}

export interface Upload {
  readonly name: string;
  readonly sha256: string;
  readonly bytes: number;
  readonly kind: 'dxf' | 'zip' | 'folder';
}

export interface NewJob {
  readonly id: string;
  readonly tenant: string;
  readonly createdAt: number;
  /** Computation settings (units, drawingUnits, torsion…), as the client gave them, validated. */
  readonly settings: Readonly<Record<string, unknown>>;
  readonly upload: Upload;
}

/** One drawing of a new job: its content's hash, or the error that already stops it (bad ZIP entry). */
export type NewItem =
  | { readonly name: string; readonly source: string; readonly blobSha256: string }
  | { readonly name: string; readonly source: string; readonly error: ItemError };

export interface Counts {
  total: number;
  pending: number;
  running: number;
  done: number;
  failed: number;
  cancelled: number;
}

export interface JobRecord {
  readonly id: string;
  readonly tenant: string;
  readonly createdAt: number;
  readonly finishedAt: number | null;
  readonly cancelledAt: number | null;
  readonly settings: Record<string, unknown>;
  readonly upload: Upload;
  readonly counts: Counts;
  readonly status: JobStatus;
}

export interface ItemRecord {
  readonly idx: number;
  readonly name: string;
  readonly source: string;
  readonly status: ItemStatus;
  readonly attempts: number;
  readonly error: ItemError | null;
  /** The key and stored result of a done item. */
  readonly resultKey: string | null;
  readonly result: StoredResult | null;
}

/** A claimed drawing, with what a worker needs to compute it. */
export interface Claim {
  readonly seq: number;
  readonly jobId: string;
  readonly idx: number;
  readonly tenant: string;
  readonly name: string;
  readonly source: string;
  readonly blobSha256: string;
  readonly settings: Record<string, unknown>;
  readonly attempts: number;
  readonly token: string;
}

/** A computed outcome: the drawing's profiles (JSON contract entries, failed ones of a split drawing included) or its fault. */
export type StoredResult = { readonly profiles: readonly unknown[] } | { readonly error: ItemError };

export type Outcome = { readonly resultKey: string } | { readonly error: ItemError };

export interface Page {
  readonly limit: number;
  /** Jobs created strictly before this one (createdAt, id), newest first. */
  readonly before?: { readonly createdAt: number; readonly id: string };
}

export interface ClaimOptions {
  readonly owner: string;
  readonly limit: number;
  readonly now: number;
  readonly leaseMs: number;
  /** Claims an item may have had; the next one fails it with code GAVE_UP. */
  readonly maxAttempts: number;
}

export interface Store {
  readonly kind: 'sqlite' | 'postgres';
  /** Brings the schema up to date (idempotent, safe with several processes starting at once). */
  migrate(): Promise<void>;
  /** Throws when the database cannot be reached. */
  ping(): Promise<void>;
  close(): Promise<void>;

  putBlob(sha256: string, bytes: Uint8Array): Promise<void>;
  getBlob(sha256: string): Promise<Buffer | null>;

  getResult(key: string): Promise<StoredResult | null>;
  /** First write wins: a result computed twice is stored once. */
  putResult(key: string, result: StoredResult, now: number): Promise<void>;

  /** The job and all its items, in one transaction. */
  createJob(job: NewJob, items: readonly NewItem[]): Promise<void>;
  getJob(tenant: string, id: string): Promise<JobRecord | null>;
  listJobs(tenant: string, page: Page): Promise<JobRecord[]>;
  listItems(tenant: string, id: string, opts?: { readonly status?: ItemStatus }): Promise<ItemRecord[]>;
  /** Cancels pending and running items (running ones finish unrecorded); null if no such job. */
  cancelJob(tenant: string, id: string, now: number): Promise<JobRecord | null>;

  claimItems(opts: ClaimOptions): Promise<Claim[]>;
  /** Extends the leases of the items `owner` is computing. */
  renewLeases(owner: string, seqs: readonly number[], until: number): Promise<void>;
  /** Records the outcome if `claim` still holds the item; false otherwise. */
  completeItem(claim: Claim, outcome: Outcome, now: number): Promise<boolean>;
  /** Hands back items `owner` holds (graceful shutdown): pending again, the attempt not counted. */
  releaseClaims(owner: string): Promise<number>;
  /** Makes every running item claimable at once: the embedded store's only process restarted. */
  expireAllLeases(): Promise<number>;
  /** Items waiting to be computed, over all tenants. */
  pendingCount(): Promise<number>;
}

/** queued: no drawing computed or in progress yet (some may have been refused on upload); done: none left. */
export function statusOf(c: Counts, cancelledAt: number | null): JobStatus {
  if (cancelledAt !== null) return 'cancelled';
  if (c.pending + c.running === 0) return 'done';
  if (c.done + c.running === 0) return 'queued';
  return 'running';
}

export const emptyCounts = (): Counts => ({ total: 0, pending: 0, running: 0, done: 0, failed: 0, cancelled: 0 });
