import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OPEN, PLATE, PLATE_AREA, post, rect, renameEntry, testApp, upload, waitForJob, zip, type TestApp } from './helpers';

let t: TestApp;
beforeAll(async () => {
  t = await testApp();
});
afterAll(() => t.close());

const get = (url: string, headers: Record<string, string> = {}) => t.app.inject({ method: 'GET', url, headers });

describe('jobs', () => {
  let id = '';

  it('POST /v1/jobs answers 202 {id} with its location once the upload is stored', async () => {
    const z = renameEntry(await zip([['plate.dxf', PLATE], ['xx/evil.dxf', rect(1, 1)], ['open.dxf', OPEN], ['bar.dxf', rect(40, 10)]]), 'xx/evil', '../evil');
    const r = await post(t.app, '/v1/jobs', upload('catalogue.zip', z, { torsion: 'false' }));
    expect(r.statusCode).toBe(202);
    const body = r.json() as { id: string; status: string; links: { self: string; results: string } };
    id = body.id;
    expect(body.status).toBe('queued');
    expect(r.headers.location).toBe(`/v1/jobs/${id}`);
    expect(body.links).toEqual({ self: `/v1/jobs/${id}`, results: `/v1/jobs/${id}/results` });
    // Durable before acknowledged: the upload is in the store under its SHA-256.
    const job = await t.app.keelson.store.getJob('local', id);
    expect(await t.app.keelson.store.getBlob(job!.upload.sha256)).toEqual(z);
  });

  it('GET /v1/jobs/{id} gives status, counts and each failed drawing', async () => {
    const job = (await waitForJob(t.app, id)) as unknown as {
      status: string;
      counts: Record<string, number>;
      errors: { index: number; name: string; code: string; message: string }[];
      settings: object;
      upload: { name: string; kind: string };
    };
    expect(job.status).toBe('done');
    expect(job.counts).toEqual({ total: 4, done: 2, failed: 2, pending: 0, running: 0, cancelled: 0 });
    expect(job.errors.map((e) => [e.index, e.name, e.code])).toEqual([
      [1, 'evil', 'BAD_ENTRY'],
      [2, 'open', 'NO_CLOSED_OUTLINE'],
    ]);
    expect(job.errors[1]!.message).toMatch(/^catalogue\.zip:open\.dxf: /);
    expect(job.upload).toMatchObject({ name: 'catalogue.zip', kind: 'zip' });
    expect(job.settings).toEqual({ torsion: false });
  });

  it('GET /v1/jobs/{id}/results gives the CLI\'s JSON, failed drawings in place', async () => {
    const r = await get(`/v1/jobs/${id}/results`);
    expect(r.statusCode).toBe(200);
    const body = r.json() as { status: string; profiles: { name: string; source: string; properties?: { A: number }; error?: { code: string } }[] };
    expect(body.status).toBe('done');
    expect(body.profiles.map((p) => [p.name, p.source, p.error?.code ?? 'ok'])).toEqual([
      ['plate', 'catalogue.zip:plate.dxf', 'ok'],
      ['evil', 'catalogue.zip:../evil.dxf', 'BAD_ENTRY'],
      ['open', 'catalogue.zip:open.dxf', 'NO_CLOSED_OUTLINE'],
      ['bar', 'catalogue.zip:bar.dxf', 'ok'],
    ]);
    expect(Math.abs(body.profiles[0]!.properties!.A - PLATE_AREA)).toBeLessThan(1e-9 * PLATE_AREA);
  });

  it('gives CSV on Accept: text/csv, units in every header, converted with ?units=', async () => {
    const r = await get(`/v1/jobs/${id}/results`, { accept: 'text/csv' });
    expect(r.statusCode).toBe(200);
    expect(r.headers['content-type']).toMatch(/^text\/csv/);
    const [header, ...rows] = r.body.trimEnd().split('\r\n');
    expect(header).toMatch(/^name,source,units,A \[mm²\],P \[mm\],cx \[mm\],.*Ix \[mm⁴\],.*theta \[deg\],.*Zx \[mm³\]/);
    expect(rows).toHaveLength(2);
    expect(rows[1]).toMatch(/^bar,catalogue\.zip:bar\.dxf,mm,400,/);
    const cm = await get(`/v1/jobs/${id}/results?units=cm`, { accept: 'text/csv, application/json;q=0.5' });
    expect(cm.body.split('\r\n')[0]).toMatch(/A \[cm²\]/);
    const bar = cm.body.split('\r\n')[2]!.split(',');
    expect(bar.slice(0, 3)).toEqual(['bar', 'catalogue.zip:bar.dxf', 'cm']);
    expect(Math.abs(Number(bar[3]) - 4)).toBeLessThan(1e-12); // 400 mm² = 4 cm²
    const json = await get(`/v1/jobs/${id}/results`, { accept: 'application/json, text/csv;q=0.1' });
    expect(json.headers['content-type']).toMatch(/^application\/json/);
    const refused = await get(`/v1/jobs/${id}/results`, { accept: 'image/png' });
    expect(refused.statusCode).toBe(406);
    expect(refused.json()).toMatchObject({ code: 'NOT_ACCEPTABLE' });
  });

  it('answers 404 JOB_NOT_FOUND for an unknown job on every job route', async () => {
    for (const [method, url] of [
      ['GET', '/v1/jobs/nope'],
      ['GET', '/v1/jobs/nope/results'],
      ['DELETE', '/v1/jobs/nope'],
    ] as const) {
      const r = await t.app.inject({ method, url });
      expect(r.statusCode, url).toBe(404);
      expect(r.json(), url).toMatchObject({ code: 'JOB_NOT_FOUND', status: 404 });
    }
  });

  it('lists jobs newest first, page by page', async () => {
    const ids = [id];
    for (const n of [1, 2]) {
      const r = await post(t.app, '/v1/jobs', upload(`r${n}.dxf`, rect(n, 7), { torsion: 'false' }));
      ids.push((r.json() as { id: string }).id);
      await new Promise((res) => setTimeout(res, 5));
    }
    const first = (await get('/v1/jobs?limit=2')).json() as { jobs: { id: string }[]; next: string | null };
    expect(first.jobs.map((j) => j.id)).toEqual([ids[2], ids[1]]);
    expect(first.next).toBeTruthy();
    const second = (await get(`/v1/jobs?limit=2&cursor=${first.next}`)).json() as { jobs: { id: string }[]; next: string | null };
    expect(second.jobs.map((j) => j.id)).toEqual([ids[0]]);
    expect(second.next).toBeNull();
    expect((await get('/v1/jobs?cursor=garbage')).json()).toMatchObject({ code: 'BAD_REQUEST' });
    expect((await get('/v1/jobs?limit=0')).json()).toMatchObject({ code: 'BAD_REQUEST' });
  });

  it('DELETE /v1/jobs/{id} cancels: drawings not yet computed are dropped', async () => {
    // Twenty drawings with torsion on one thread: the job is still running when cancelled.
    const z = await zip(Array.from({ length: 20 }, (_, i): [string, string] => [`c${i}.dxf`, rect(10 + i, 3)]));
    const { id: cid } = (await post(t.app, '/v1/jobs', upload('slow.zip', z))).json() as { id: string };
    const r = await t.app.inject({ method: 'DELETE', url: `/v1/jobs/${cid}` });
    expect(r.statusCode).toBe(200);
    const job = r.json() as { status: string; counts: { cancelled: number; total: number; done: number } };
    expect(job.status).toBe('cancelled');
    expect(job.counts.total).toBe(20);
    expect(job.counts.cancelled).toBeGreaterThan(0);
    await new Promise((res) => setTimeout(res, 300));
    const later = (await get(`/v1/jobs/${cid}`)).json() as { status: string; counts: { cancelled: number; done: number; pending: number; running: number } };
    expect(later).toMatchObject({ status: 'cancelled', counts: { pending: 0, running: 0, cancelled: job.counts.cancelled, done: job.counts.done } });
  });

  it('refuses a bad upload as /v1/compute does', async () => {
    const r = await post(t.app, '/v1/jobs', upload('x.png', Buffer.from([0x89, 0x50, 0x4e, 0x47])));
    expect(r.statusCode).toBe(415);
    expect(r.json()).toMatchObject({ code: 'UNSUPPORTED_MEDIA_TYPE' });
  });
});
