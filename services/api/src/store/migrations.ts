/**
 * Schema migrations, in order; each runs once, recorded in `schema_migrations`. Never edit a
 * released migration: add the next one. Timestamps are epoch milliseconds.
 */
export interface Migration {
  readonly version: number;
  readonly sqlite: string;
  readonly postgres: string;
}

const tables = (blob: string, serial: string) => `
CREATE TABLE blobs (
  sha256 TEXT PRIMARY KEY,
  bytes ${blob} NOT NULL,
  size BIGINT NOT NULL,
  created_at BIGINT NOT NULL
);
CREATE TABLE results (
  key TEXT PRIMARY KEY,
  profile TEXT,
  error_code TEXT,
  error_message TEXT,
  created_at BIGINT NOT NULL
);
CREATE TABLE jobs (
  id TEXT PRIMARY KEY,
  tenant TEXT NOT NULL,
  created_at BIGINT NOT NULL,
  settings TEXT NOT NULL,
  upload_name TEXT NOT NULL,
  upload_sha256 TEXT NOT NULL,
  upload_bytes BIGINT NOT NULL,
  upload_kind TEXT NOT NULL,
  cancelled_at BIGINT,
  finished_at BIGINT
);
CREATE INDEX jobs_by_tenant ON jobs (tenant, created_at, id);
CREATE TABLE job_items (
  seq ${serial},
  job_id TEXT NOT NULL REFERENCES jobs (id) ON DELETE CASCADE,
  idx INTEGER NOT NULL,
  name TEXT NOT NULL,
  source TEXT NOT NULL,
  blob_sha256 TEXT,
  status TEXT NOT NULL,
  attempts INTEGER NOT NULL DEFAULT 0,
  owner TEXT,
  token TEXT,
  lease_until BIGINT,
  result_key TEXT,
  error_code TEXT,
  error_message TEXT,
  updated_at BIGINT NOT NULL,
  UNIQUE (job_id, idx)
);
CREATE INDEX job_items_by_status ON job_items (status, seq);
CREATE INDEX job_items_by_job ON job_items (job_id, status);
`;

export const MIGRATIONS: readonly Migration[] = [
  { version: 1, sqlite: tables('BLOB', 'INTEGER PRIMARY KEY AUTOINCREMENT'), postgres: tables('BYTEA', 'BIGSERIAL PRIMARY KEY') },
];
