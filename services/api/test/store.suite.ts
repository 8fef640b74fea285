import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { NewItem, Store } from '../src/store';

/**
 * One suite for every Store implementation (SQLite, PostgreSQL): the service relies on exactly
 * these behaviours, whichever database holds its state.
 */
export function storeSuite(name: string, open: () => Promise<{ store: Store; cleanup: () => Promise<void> }>): void {
  describe(`Store contract: ${name}`, () => {
    let store: Store;
    let cleanup: () => Promise<void>;
    let n = 0;
    const id = () => `job-${name}-${++n}-${Math.random().toString(36).slice(2, 8)}`;
    const upload = { name: 'cat.zip', sha256: 'u'.repeat(64), bytes: 10, kind: 'zip' as const };
    const items = (k: number): NewItem[] => Array.from({ length: k }, (_, i) => ({ name: `d${i}`, source: `cat.zip/d${i}.dxf`, blobSha256: `b${i}` }));
    const claimOpts = { owner: 'w1', limit: 100, now: 1_000, leaseMs: 30_000, maxAttempts: 3 };
    /** Claims everything pending, so each test starts from an empty queue. */
    const drain = async () => {
      for (;;) {
        const c = await store.claimItems({ ...claimOpts, owner: 'drain', now: 10 ** 12 });
        if (!c.length) return;
        for (const x of c) await store.completeItem(x, { error: { code: 'X', message: 'drained' } }, 10 ** 12);
      }
    };

    beforeAll(async () => {
      ({ store, cleanup } = await open());
      await store.migrate();
      await store.migrate(); // idempotent
    });
    afterAll(async () => {
      await store?.close();
      await cleanup?.();
    });

    it('answers ping', async () => {
      await expect(store.ping()).resolves.toBeUndefined();
    });

    it('keeps blobs by hash, a second put of the same hash is a no-op', async () => {
      const bytes = new Uint8Array([0, 1, 2, 255]);
      await store.putBlob('a'.repeat(64), bytes);
      await store.putBlob('a'.repeat(64), bytes);
      expect([...(await store.getBlob('a'.repeat(64)))!]).toEqual([0, 1, 2, 255]);
      expect(await store.getBlob('f'.repeat(64))).toBeNull();
    });

    it('keeps the first result written under a key', async () => {
      await store.putResult(`k-${name}`, { profiles: [{ name: 'first', properties: { A: 1.5 } }] }, 1);
      await store.putResult(`k-${name}`, { profiles: [{ name: 'second' }] }, 2);
      expect(await store.getResult(`k-${name}`)).toEqual({ profiles: [{ name: 'first', properties: { A: 1.5 } }] });
      await store.putResult(`e-${name}`, { error: { code: 'OPEN_OUTLINE', message: 'x.dxf: open outline' } }, 1);
      expect(await store.getResult(`e-${name}`)).toEqual({ error: { code: 'OPEN_OUTLINE', message: 'x.dxf: open outline' } });
      expect(await store.getResult('missing')).toBeNull();
    });

    it('creates a job with its items; only its tenant sees it', async () => {
      const j = id();
      await store.createJob(
        { id: j, tenant: 'acme', createdAt: 100, settings: { units: 'cm' }, upload },
        [...items(2), { name: 'bad', source: 'cat.zip/../bad.dxf', error: { code: 'BAD_ENTRY', message: 'refused' } }],
      );
      const job = (await store.getJob('acme', j))!;
      expect(job).toMatchObject({ id: j, tenant: 'acme', createdAt: 100, finishedAt: null, cancelledAt: null, settings: { units: 'cm' }, upload, status: 'queued' });
      expect(job.counts).toEqual({ total: 3, pending: 2, running: 0, done: 0, failed: 1, cancelled: 0 });
      expect(await store.getJob('other', j)).toBeNull();
      expect(await store.listItems('other', j)).toEqual([]);
      const listed = await store.listItems('acme', j);
      expect(listed.map((i) => [i.idx, i.name, i.status])).toEqual([
        [0, 'd0', 'pending'],
        [1, 'd1', 'pending'],
        [2, 'bad', 'failed'],
      ]);
      expect(listed[2]!.error).toEqual({ code: 'BAD_ENTRY', message: 'refused' });
      expect((await store.listItems('acme', j, { status: 'failed' })).map((i) => i.name)).toEqual(['bad']);
      await drain();
    });

    it('finishes at once a job whose every drawing was refused', async () => {
      const j = id();
      await store.createJob({ id: j, tenant: 'acme', createdAt: 5, settings: {}, upload }, [{ name: 'x', source: 'x', error: { code: 'E', message: 'm' } }]);
      expect(await store.getJob('acme', j)).toMatchObject({ status: 'done', finishedAt: 5 });
    });

    it('claims in order, once each; completion is recorded once and finishes the job', async () => {
      await drain();
      const j = id();
      await store.createJob({ id: j, tenant: 't', createdAt: 1, settings: { torsion: false }, upload }, items(3));
      const [a, b] = await Promise.all([store.claimItems({ ...claimOpts, limit: 2 }), store.claimItems({ ...claimOpts, owner: 'w2', limit: 2 })]);
      const all = [...a!, ...b!];
      expect(all.map((c) => c.idx).sort()).toEqual([0, 1, 2]);
      expect(new Set(all.map((c) => c.token)).size).toBe(3);
      expect(all[0]).toMatchObject({ jobId: j, tenant: 't', settings: { torsion: false }, attempts: 1 });
      expect((await store.getJob('t', j))!.status).toBe('running');
      expect(await store.claimItems(claimOpts)).toEqual([]);

      await store.putResult(`r-${j}`, { profiles: [{ name: 'p' }] }, 2);
      const sorted = all.sort((x, y) => x.idx - y.idx);
      expect(await store.completeItem(sorted[0]!, { resultKey: `r-${j}` }, 2)).toBe(true);
      expect(await store.completeItem(sorted[0]!, { resultKey: `r-${j}` }, 2)).toBe(false);
      expect(await store.completeItem(sorted[1]!, { error: { code: 'OPEN_OUTLINE', message: 'd1: open' } }, 3)).toBe(true);
      expect((await store.getJob('t', j))!.finishedAt).toBeNull();
      expect(await store.completeItem(sorted[2]!, { resultKey: `r-${j}` }, 4)).toBe(true);
      const job = (await store.getJob('t', j))!;
      expect(job).toMatchObject({ status: 'done', finishedAt: 4 });
      expect(job.counts).toMatchObject({ total: 3, done: 2, failed: 1 });
      const done = await store.listItems('t', j);
      expect(done[0]!.result).toEqual({ profiles: [{ name: 'p' }] });
      expect(done[1]!.error).toEqual({ code: 'OPEN_OUTLINE', message: 'd1: open' });
    });

    it('hands an item whose lease passed to another worker; the old claim can no longer complete it', async () => {
      await drain();
      const j = id();
      await store.createJob({ id: j, tenant: 't', createdAt: 1, settings: {}, upload }, items(1));
      const [first] = await store.claimItems({ ...claimOpts, now: 1_000, leaseMs: 100 });
      expect(await store.claimItems({ ...claimOpts, now: 1_050 })).toEqual([]);
      await store.renewLeases('w1', [first!.seq], 1_200);
      await store.renewLeases('w2', [first!.seq], 5_000); // not its item: no effect
      expect(await store.claimItems({ ...claimOpts, now: 1_150 })).toEqual([]);
      const [second] = await store.claimItems({ ...claimOpts, owner: 'w2', now: 1_201 });
      expect(second).toMatchObject({ idx: 0, attempts: 2 });
      expect(await store.completeItem(first!, { resultKey: 'x' }, 1_300)).toBe(false);
      expect(await store.completeItem(second!, { resultKey: 'x' }, 1_300)).toBe(true);
      expect((await store.getJob('t', j))!.counts).toMatchObject({ total: 1, done: 1, running: 0 });
    });

    it('fails an item claimed maxAttempts times (it keeps killing its process) instead of trying again', async () => {
      await drain();
      const j = id();
      await store.createJob({ id: j, tenant: 't', createdAt: 1, settings: {}, upload }, items(1));
      for (let k = 1; k <= 3; k++) {
        expect(await store.claimItems({ ...claimOpts, now: k * 1000, leaseMs: 10 })).toHaveLength(1);
        expect(await store.expireAllLeases()).toBe(1);
      }
      expect(await store.claimItems({ ...claimOpts, now: 10_000 })).toEqual([]);
      const [item] = await store.listItems('t', j);
      expect(item).toMatchObject({ status: 'failed', attempts: 3, error: { code: 'GAVE_UP' } });
      expect((await store.getJob('t', j))!.status).toBe('done');
    });

    it('releases the claims of a worker that shuts down, without counting the attempt', async () => {
      await drain();
      const j = id();
      await store.createJob({ id: j, tenant: 't', createdAt: 1, settings: {}, upload }, items(2));
      await store.claimItems(claimOpts);
      expect(await store.pendingCount()).toBe(0);
      expect(await store.releaseClaims('w1')).toBe(2);
      expect(await store.pendingCount()).toBe(2);
      const again = await store.claimItems(claimOpts);
      expect(again.map((c) => c.attempts)).toEqual([1, 1]);
      await drain();
      for (const c of again) await store.completeItem(c, { resultKey: 'x' }, 5);
    });

    it('cancels pending and running drawings; a running one then completes unrecorded', async () => {
      await drain();
      const j = id();
      await store.createJob({ id: j, tenant: 't', createdAt: 1, settings: {}, upload }, items(3));
      const [running] = await store.claimItems({ ...claimOpts, limit: 1 });
      expect(await store.cancelJob('someone-else', j, 9)).toBeNull();
      const job = (await store.cancelJob('t', j, 9))!;
      expect(job).toMatchObject({ status: 'cancelled', cancelledAt: 9, finishedAt: 9 });
      expect(job.counts).toMatchObject({ total: 3, cancelled: 3, pending: 0 });
      expect(await store.completeItem(running!, { resultKey: 'x' }, 10)).toBe(false);
      expect(await store.claimItems(claimOpts)).toEqual([]);
      expect((await store.cancelJob('t', j, 20))!.cancelledAt).toBe(9);
    });

    it('lists a tenant’s jobs newest first, page by page', async () => {
      const tenant = `pager-${name}`;
      const ids: string[] = [];
      for (let k = 0; k < 5; k++) {
        ids.push(`p${k}`);
        await store.createJob({ id: `${tenant}-p${k}`, tenant, createdAt: k < 4 ? 100 + k : 103, settings: {}, upload }, []);
      }
      await store.createJob({ id: `${tenant}-other`, tenant: 'other', createdAt: 500, settings: {}, upload }, []);
      const seen: string[] = [];
      let before: { createdAt: number; id: string } | undefined;
      for (;;) {
        const page = await store.listJobs(tenant, { limit: 2, before });
        if (!page.length) break;
        seen.push(...page.map((j) => j.id));
        const last = page.at(-1)!;
        before = { createdAt: last.createdAt, id: last.id };
      }
      // p3 and p4 share a creation time: ties are broken by id, descending.
      expect(seen).toEqual([`${tenant}-p4`, `${tenant}-p3`, `${tenant}-p2`, `${tenant}-p1`, `${tenant}-p0`]);
    });
  });
}
