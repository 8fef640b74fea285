import { statusOf, type Counts, type ItemRecord, type ItemStatus, type JobRecord, type StoredResult, type Upload } from './types';

/** Row mapping shared by the SQL stores. */
export type Row = Record<string, unknown>;

export const resultOf = (r: Row): StoredResult =>
  r.profile != null
    ? { profiles: JSON.parse(String(r.profile)) as unknown[] }
    : { error: { code: String(r.error_code), message: String(r.error_message) } };

export const resultColumns = (result: StoredResult) =>
  'profiles' in result
    ? { profile: JSON.stringify(result.profiles), error_code: null, error_message: null }
    : { profile: null, error_code: result.error.code, error_message: result.error.message };

export function jobOf(r: Row, counts: Counts): JobRecord {
  const cancelledAt = r.cancelled_at == null ? null : Number(r.cancelled_at);
  return {
    id: String(r.id),
    tenant: String(r.tenant),
    createdAt: Number(r.created_at),
    finishedAt: r.finished_at == null ? null : Number(r.finished_at),
    cancelledAt,
    settings: JSON.parse(String(r.settings)) as Record<string, unknown>,
    upload: { name: String(r.upload_name), sha256: String(r.upload_sha256), bytes: Number(r.upload_bytes), kind: r.upload_kind as Upload['kind'] },
    counts,
    status: statusOf(counts, cancelledAt),
  };
}

export function itemOf(r: Row): ItemRecord {
  return {
    idx: Number(r.idx),
    name: String(r.name),
    source: String(r.source),
    status: r.status as ItemStatus,
    attempts: Number(r.attempts),
    error: r.error_code == null ? null : { code: String(r.error_code), message: String(r.error_message) },
    resultKey: r.result_key == null ? null : String(r.result_key),
    result: r.r_key == null ? null : resultOf({ profile: r.r_profile, error_code: r.r_error_code, error_message: r.r_error_message }),
  };
}

export function addCount(c: Counts, status: string, n: number): void {
  c.total += n;
  if (status in c) c[status as Exclude<keyof Counts, 'total'>] += n;
}

