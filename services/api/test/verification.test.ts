import { cpSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tee } from '@keelson/shapes';
import { SIGNATURE_HEADER, TIMESTAMP_HEADER, verifyWebhookSignature } from '@keelson/verify';
import { PROFILES, renderProfile } from '../../../fixtures/catalogue';
import { parseApiKeys } from '../src/config';
import { post, testApp, upload, zip, type TestApp } from './helpers';

const demo = join(import.meta.dirname, '../../../fixtures/demo');
const ACME = 'acme-key-0123456789abcdef';
const BETA = 'beta-key-0123456789abcdef';
const auth = (key: string) => ({ authorization: `Bearer ${key}` });

// A three-profile slice of the demo catalogue (MX 106 keeps its deliberately wrong mass), so a run takes a second.
const PICK = ['mx106-round-tube-30x2', 'mx133-tee-50x50x5', 'mx135-angle-40x40x4'];
const manifestSlice = () => {
  const [head, ...rows] = readFileSync(join(demo, 'manifest.csv'), 'utf8').trim().split('\n');
  return `${[head, ...rows.filter((r) => PICK.some((p) => r.includes(`${p}.dxf`)))].join('\n')}\n`;
};

let t: TestApp;
let root = '';
let folder = '';
let receiver: Server;
let hookUrl = '';
const hooks: { valid: boolean; body: string }[] = [];

beforeAll(async () => {
  root = mkdtempSync(join(tmpdir(), 'keelson-catalogues-'));
  folder = join(root, 'plant');
  mkdirSync(folder);
  for (const p of PICK) cpSync(join(demo, `${p}.dxf`), join(folder, `${p}.dxf`));
  writeFileSync(join(folder, 'manifest.csv'), manifestSlice());
  process.env.KEELSON_CATALOGUE_FOLDERS = root;
  t = await testApp({ apiKeys: parseApiKeys(`acme:${ACME},beta:${BETA}`) });
  // The PLM inbox: a real HTTP server on 127.0.0.1 checking each signature; the first delivery gets a 500.
  receiver = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      const body = Buffer.concat(chunks).toString('utf8');
      const valid = verifyWebhookSignature({ secret: 'plm-secret-0123456789', body, timestamp: req.headers[TIMESTAMP_HEADER] as string, signature: req.headers[SIGNATURE_HEADER] as string });
      hooks.push({ valid, body });
      res.writeHead(hooks.length === 1 ? 500 : 204).end();
    });
  });
  await new Promise<void>((resolve) => receiver.listen(0, '127.0.0.1', resolve));
  hookUrl = `http://127.0.0.1:${(receiver.address() as AddressInfo).port}/inbox`;
}, 60_000);

afterAll(async () => {
  delete process.env.KEELSON_CATALOGUE_FOLDERS;
  await t.close();
  await new Promise<void>((resolve) => receiver.close(() => resolve()));
  rmSync(root, { recursive: true, force: true });
});

/** Waits (polling the API, 50 ms apart, 60 s at most) until the catalogue has `n` finished runs. */
async function runs(id: string, n: number, key = ACME) {
  for (let i = 0; i < 1200; i++) {
    const r = (await t.app.inject({ method: 'GET', url: `/v1/catalogues/${id}/runs`, headers: auth(key) })).json() as { running: boolean; runs: { id: string }[] };
    if (r.runs.length >= n && !r.running) return r.runs;
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
  throw new Error(`no ${n} runs of ${id}`);
}

describe('catalogues over HTTP', () => {
  let id = '';

  it('registers a server folder the administrator allowed, and refuses others', async () => {
    let r = await t.app.inject({ method: 'POST', url: '/v1/catalogues', headers: auth(ACME), payload: { name: 'Plant', folder: tmpdir() } });
    expect(r.statusCode).toBe(403);
    expect(r.json().code).toBe('FOLDER_NOT_ALLOWED');
    r = await t.app.inject({ method: 'POST', url: '/v1/catalogues', headers: auth(ACME), payload: { name: 'Plant', folder, schedule: { cron: 'every night' } } });
    expect([r.statusCode, r.json().code]).toEqual([400, 'BAD_REQUEST']);
    r = await t.app.inject({
      method: 'POST',
      url: '/v1/catalogues',
      headers: auth(ACME),
      payload: { name: 'Plant', folder, schedule: { cron: '0 2 * * *', timezone: 'UTC' }, webhook: { url: hookUrl, secret: 'plm-secret-0123456789' } },
    });
    expect(r.statusCode).toBe(201);
    const c = r.json();
    id = c.id;
    expect(c).toMatchObject({ name: 'Plant', kind: 'folder', schedule: { cron: '0 2 * * *' }, running: false, webhook: { url: hookUrl } });
    expect(c.webhook.secret).toBeUndefined();
    expect(new Date(c.nextRun).getUTCHours()).toBe(2);
    // Another tenant sees nothing of it.
    expect((await t.app.inject({ method: 'GET', url: `/v1/catalogues/${id}`, headers: auth(BETA) })).statusCode).toBe(404);
    expect((await t.app.inject({ method: 'GET', url: '/v1/catalogues', headers: auth(BETA) })).json()).toEqual({ catalogues: [] });
  });

  it('runs a verification (one at a time), reports it as HTML, CSV and JSON, and hands it to the webhook', async () => {
    const start = await t.app.inject({ method: 'POST', url: `/v1/catalogues/${id}/runs`, headers: auth(ACME) });
    expect(start.statusCode).toBe(202);
    const again = await t.app.inject({ method: 'POST', url: `/v1/catalogues/${id}/runs`, headers: auth(ACME) });
    expect([again.statusCode, again.json().code]).toEqual([409, 'RUN_IN_PROGRESS']);
    const [run] = await runs(id, 1);
    expect(run!.id).toBe(start.json().id);

    const json = (await t.app.inject({ method: 'GET', url: `/v1/runs/${run!.id}`, headers: auth(ACME) })).json();
    expect(json.summary).toMatchObject({ profiles: 3, pass: 2, fail: 1 });
    expect(json.profiles.find((p: { id: string }) => p.id === 'MX 106').properties.m).toMatchObject({ published: 0.583, pass: false, unit: 'kg/m' });
    const html = await t.app.inject({ method: 'GET', url: `/v1/runs/${run!.id}/report`, headers: auth(ACME) });
    expect(html.headers['content-type']).toMatch(/^text\/html/);
    expect(html.body).toContain('Catalogue verification: Plant');
    const csv = await t.app.inject({ method: 'GET', url: `/v1/runs/${run!.id}/report?format=csv&units=cm`, headers: auth(ACME) });
    expect(csv.body.split('\n')[0]).toContain('A [cm²]');
    expect((await t.app.inject({ method: 'GET', url: `/v1/runs/${run!.id}`, headers: auth(BETA) })).statusCode).toBe(404);

    // The webhook: the first attempt got a 500, the retry (2 s later) went through; the log shows both.
    let log: { attempt: number; status: number; outcome: string }[] = [];
    for (let i = 0; i < 200 && log.length < 2; i++) {
      log = (await t.app.inject({ method: 'GET', url: `/v1/runs/${run!.id}/deliveries`, headers: auth(ACME) })).json().deliveries;
      if (log.length < 2) await new Promise((resolve) => setTimeout(resolve, 50));
    }
    expect(log.map((a) => [a.attempt, a.status, a.outcome])).toEqual([
      [1, 500, 'retry'],
      [2, 204, 'delivered'],
    ]);
    expect(hooks.map((h) => h.valid)).toEqual([true, true]);
    expect(JSON.parse(hooks[1]!.body)).toMatchObject({ event: 'verification.completed', run: { id: run!.id, catalogue: 'Plant' }, passed: false, attention: [{ id: 'MX 106', failed: ['m'] }] });
  }, 60_000);

  it('after one drawing changes, the diff names exactly that profile and the values that moved', async () => {
    const mx133 = PROFILES.find((p) => p.name === 'mx133-tee-50x50x5')!;
    writeFileSync(join(folder, 'mx133-tee-50x50x5.dxf'), renderProfile({ ...mx133, build: () => tee({ h: 50, b: 50, tw: 5, tf: 6, r: 5, rt: 1 }) }));
    await t.app.inject({ method: 'PATCH', url: `/v1/catalogues/${id}`, headers: auth(ACME), payload: { webhook: null } });
    expect((await t.app.inject({ method: 'POST', url: `/v1/catalogues/${id}/runs`, headers: auth(ACME) })).statusCode).toBe(202);
    const list = await runs(id, 2);
    const d = (await t.app.inject({ method: 'GET', url: `/v1/runs/${list[1]!.id}/diff`, headers: auth(ACME) })).json();
    expect(d.drawingsChanged.map((c: { id: string }) => c.id)).toEqual(['MX 133']);
    expect(new Set(d.moved.map((m: { id: string }) => m.id))).toEqual(new Set(['MX 133']));
    expect(d.moved.map((m: { key: string }) => m.key)).toEqual(expect.arrayContaining(['A', 'Ix', 'Iy', 'J']));
    const first = await t.app.inject({ method: 'GET', url: `/v1/runs/${list[0]!.id}/diff`, headers: auth(ACME) });
    expect([first.statusCode, first.json().code]).toEqual([404, 'RUN_NOT_FOUND']);
  }, 60_000);

  it('registers an uploaded ZIP catalogue and refuses one without a manifest', async () => {
    const dxf = readFileSync(join(demo, 'mx135-angle-40x40x4.dxf'));
    const m = 'id,drawing,revision,material,units,A\nMX 135,mx135-angle-40x40x4.dxf,A,aluminium,cm,3.057\n';
    const bad = await post(t.app, '/v1/catalogues/uploads', upload('c.zip', await zip([['a/mx135-angle-40x40x4.dxf', dxf]]), { name: 'Angles' }), auth(ACME));
    expect([bad.statusCode, bad.json().code]).toEqual([422, 'INVALID_CATALOGUE']);
    const ok = await post(t.app, '/v1/catalogues/uploads', upload('c.zip', await zip([['a/manifest.csv', m], ['a/mx135-angle-40x40x4.dxf', dxf]]), { name: 'Angles', cron: '30 1 * * 1' }), auth(BETA));
    expect(ok.statusCode).toBe(201);
    const c = ok.json();
    expect(c).toMatchObject({ kind: 'upload', folder: null, schedule: { cron: '30 1 * * 1' } });
    await t.app.inject({ method: 'POST', url: `/v1/catalogues/${c.id}/runs`, headers: auth(BETA) });
    const [run] = await runs(c.id, 1, BETA);
    const json = (await t.app.inject({ method: 'GET', url: `/v1/runs/${run!.id}`, headers: auth(BETA) })).json();
    expect(json.summary).toMatchObject({ profiles: 1, pass: 1 });
  }, 60_000);

  it('documents the routes in OpenAPI', async () => {
    const doc = (await t.app.inject({ method: 'GET', url: '/openapi.json' })).json() as { paths: Record<string, Record<string, unknown>> };
    for (const [p, m] of [
      ['/v1/catalogues', 'post'],
      ['/v1/catalogues/uploads', 'post'],
      ['/v1/catalogues', 'get'],
      ['/v1/catalogues/{id}', 'patch'],
      ['/v1/catalogues/{id}/runs', 'post'],
      ['/v1/catalogues/{id}/runs', 'get'],
      ['/v1/runs/{id}/report', 'get'],
      ['/v1/runs/{id}/diff', 'get'],
      ['/v1/runs/{id}/deliveries', 'get'],
    ])
      expect(doc.paths[p!]?.[m!], `${m} ${p}`).toBeDefined();
  });
});
