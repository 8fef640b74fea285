import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { newRunId, type DeliveryAttempt, type RunRecord } from '@keelson/verify';
import { FileRunHistory, SourceError } from '../src';

const dir = mkdtempSync(join(tmpdir(), 'keelson-history-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const run = (at: string, fail = 0): RunRecord => ({
  schema: 'keelson.verification-run/1',
  id: newRunId(new Date(at)),
  catalogue: { name: 'demo', source: '/srv/demo' },
  startedAt: at,
  finishedAt: at,
  codeVersion: 'v1',
  manifest: { source: 'manifest.csv', hash: 'h' },
  materials: {},
  summary: { profiles: 1, pass: 1 - fail, fail, error: 0, missing: 0, unlisted: 0, checks: 1, checksFailed: fail },
  profiles: [],
  unlisted: [],
});

describe('FileRunHistory', () => {
  it('stores runs as files per catalogue and lists them in time order', async () => {
    const h = new FileRunHistory(dir);
    const a = run('2026-03-01T02:00:00.000Z');
    const b = run('2026-03-02T02:00:00.000Z', 1);
    const other = run('2026-03-01T12:00:00.000Z');
    await h.save('demo-1', b);
    await h.save('demo-1', a);
    await h.save('other-2', other);
    expect(readdirSync(join(dir, 'verify', 'demo-1')).sort()).toEqual([`${a.id}.json`, `${b.id}.json`]);
    expect((await h.list('demo-1')).map((e) => e.id)).toEqual([a.id, b.id]);
    expect((await h.list()).map((e) => [e.id, e.catalogue])).toEqual([[a.id, 'demo-1'], [other.id, 'other-2'], [b.id, 'demo-1']]);
    expect(await h.load(b.id)).toEqual(b);
    expect((await h.latest('demo-1'))!.id).toBe(b.id);
    expect(await h.latest('none-3')).toBeNull();
    expect((await h.previous(b.id))!.id).toBe(a.id);
    expect(await h.previous(a.id)).toBeNull();
  });

  it('orders runs started within the same second by their milliseconds', async () => {
    const h = new FileRunHistory(dir);
    // Repeated: the ids carry random bits, and the order must never depend on them.
    for (let k = 0; k < 20; k++) {
      const first = run(`2026-04-01T02:00:00.${String(k).padStart(3, '0')}Z`);
      const second = run(`2026-04-01T02:00:00.${String(k + 1).padStart(3, '0')}Z`, 1);
      expect(first.id < second.id).toBe(true);
      await h.save(`same-${k}`, second);
      await h.save(`same-${k}`, first);
      expect((await h.previous(second.id))!.id).toBe(first.id);
    }
  });

  it('keeps a delivery log beside its run', async () => {
    const h = new FileRunHistory(dir);
    const r = run('2026-03-03T02:00:00.000Z');
    await h.save('demo-1', r);
    const attempt = (n: number, outcome: DeliveryAttempt['outcome']): DeliveryAttempt => ({
      deliveryId: 'd',
      event: 'verification.completed',
      url: 'http://127.0.0.1:9/',
      attempt: n,
      at: r.startedAt,
      status: outcome === 'retry' ? 500 : 204,
      error: null,
      outcome,
      nextAttemptAt: null,
    });
    expect(await h.deliveries(r.id)).toEqual([]);
    await h.appendDeliveries(r.id, [attempt(1, 'retry')]);
    await h.appendDeliveries(r.id, [attempt(2, 'delivered')]);
    expect((await h.deliveries(r.id)).map((a) => a.outcome)).toEqual(['retry', 'delivered']);
  });

  it('says which run id it cannot find', async () => {
    const h = new FileRunHistory(dir);
    await expect(h.load('20990101T000000Z-000000')).rejects.toBeInstanceOf(SourceError);
    await expect(h.load('../../etc/passwd')).rejects.toMatchObject({ code: 'RUN_NOT_FOUND' });
  });
});
