import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ComputePool, PoolFullError } from '../src/pool/pool';
import type { TaskInput } from '../src/pool/task';
import { post, testApp, upload, waitForJob, rect, zip } from './helpers';

const FAULTY = new URL('./fixtures/faulty-worker.mjs', import.meta.url).href;
const task = (name: string): TaskInput => ({ bytes: new Uint8Array(), name, source: `${name}.dxf`, settings: { torsion: false }, maxBytes: 1 });

describe('ComputePool: one bad drawing never blocks or crashes the others', () => {
  let pool: ComputePool;
  beforeAll(() => {
    pool = new ComputePool({ threads: 2, timeoutMs: 3000, memoryMb: 64, maxWaiting: 10, filename: FAULTY });
  });
  afterAll(() => pool.close());

  it('stops a drawing past its time limit while the other thread goes on', async () => {
    const t0 = performance.now();
    const [loop, ...quick] = await Promise.all([pool.run(task('loop')), ...Array.from({ length: 5 }, (_, i) => pool.run(task(`q${i}`)))]);
    expect(loop).toMatchObject({ ok: false, code: 'DRAWING_TIMEOUT', message: 'loop.dxf: computing took longer than 3 s' });
    expect(quick.every((q) => q.ok)).toBe(true);
    expect(performance.now() - t0).toBeLessThan(10_000);
  });

  it('stops a drawing past its memory limit', async () => {
    // A pool of its own with a generous time limit: on a loaded machine filling 64 MiB can take seconds.
    const roomy = new ComputePool({ threads: 1, timeoutMs: 60_000, memoryMb: 64, maxWaiting: 10, filename: FAULTY });
    try {
      const oom = await roomy.run(task('oom'));
      expect(oom, JSON.stringify(oom)).toMatchObject({ ok: false, code: 'DRAWING_MEMORY' });
      expect(await roomy.run(task('after-oom'))).toMatchObject({ ok: true });
    } finally {
      await roomy.close();
    }
  });

  it('passes on a thread that throws or exits, and serves the next drawing', async () => {
    await expect(pool.run(task('throw'))).rejects.toThrow(/task failed/);
    await expect(pool.run(task('exit'))).rejects.toThrow();
    expect(await pool.run(task('after-exit'))).toMatchObject({ ok: true });
  });

  it('counts the time limit from the start of the drawing, not from its wait in the queue', async () => {
    const out = await Promise.all([pool.run(task('sleep2000')), pool.run(task('sleep2000')), pool.run(task('sleep2000'))]);
    expect(out.every((o) => o.ok)).toBe(true);
  });

  it('refuses interactive work past the waiting limit, and aborts on request', async () => {
    const small = new ComputePool({ threads: 2, timeoutMs: 1500, memoryMb: 64, maxWaiting: 3, filename: FAULTY });
    const pool = small;
    const busy = [pool.run(task('sleep300')), pool.run(task('sleep300'))];
    const waiting = [pool.run(task('w1')), pool.run(task('w2')), pool.run(task('w3'))];
    await expect(pool.run(task('w4'))).rejects.toBeInstanceOf(PoolFullError);
    const ac = new AbortController();
    const aborted = pool.run(task('sleep5000'), { priority: 'background', signal: ac.signal });
    ac.abort(new Error('cancelled'));
    await expect(aborted).rejects.toThrow(/cancelled/);
    await Promise.all([...busy, ...waiting]);
    await small.close();
  });
});

describe('a real drawing past the time limit', () => {
  it('answers 422 DRAWING_TIMEOUT and the service goes on', async () => {
    const t = await testApp({ drawingTimeoutMs: 1 });
    try {
      const r = await post(t.app, '/v1/compute', upload('slow.dxf', rect(97, 13), { accuracy: '1e-5' }));
      expect(r.statusCode).toBe(422);
      expect(r.json()).toMatchObject({ code: 'DRAWING_TIMEOUT' });
      expect((await t.app.inject({ method: 'GET', url: '/healthz' })).statusCode).toBe(200);
    } finally {
      await t.close();
    }
  });
});

describe('graceful shutdown', () => {
  it('hands unfinished drawings back; the next start completes the job, each drawing once', async () => {
    const first = await testApp({ shutdownGraceMs: 0 });
    const dir = first.dir;
    const z = await zip(Array.from({ length: 8 }, (_, i): [string, string] => [`g${i}.dxf`, rect(20 + i, 7)]));
    const { id } = (await post(first.app, '/v1/jobs', upload('grace.zip', z, { accuracy: '1e-4' }))).json() as { id: string };
    for (;;) {
      const job = (await first.app.inject({ method: 'GET', url: `/v1/jobs/${id}` })).json() as { counts: { done: number } };
      if (job.counts.done >= 1) break;
      await new Promise((r) => setTimeout(r, 20));
    }
    // Closing = SIGTERM's path: no new claims, running drawings released.
    await first.app.close();
    const second = await testApp({}, dir);
    try {
      const mid = await second.app.keelson.store.getJob('local', id);
      expect(mid!.counts.done).toBeLessThan(8);
      const job = await waitForJob(second.app, id);
      expect(job.counts).toMatchObject({ total: 8, done: 8, failed: 0 });
      const items = await second.app.keelson.store.listItems('local', id);
      expect(items.map((i) => i.status)).toEqual(Array(8).fill('done'));
      expect(items.every((i) => i.attempts === 1)).toBe(true);
    } finally {
      await second.close();
    }
  });
});
