import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseApiKeys } from '../src/config';
import { post, rect, testApp, upload, waitForJob, type TestApp } from './helpers';

const ACME = 'acme-key-0123456789abcdef';
const BETA = 'beta-key-0123456789abcdef';
const bearer = (key: string) => ({ authorization: `Bearer ${key}` });

describe('API keys and tenants', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await testApp({ apiKeys: parseApiKeys(`acme:${ACME},beta:${BETA}`) });
  });
  afterAll(() => t.close());

  it('refuses a request without a key: 401 UNAUTHENTICATED, WWW-Authenticate: Bearer', async () => {
    const r = await t.app.inject({ method: 'GET', url: '/v1/jobs' });
    expect(r.statusCode).toBe(401);
    expect(r.headers['www-authenticate']).toBe('Bearer');
    expect(r.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(r.json()).toMatchObject({ code: 'UNAUTHENTICATED', status: 401 });
    const upload401 = await post(t.app, '/v1/compute', upload('r.dxf', rect(1, 2)));
    expect(upload401.json()).toMatchObject({ code: 'UNAUTHENTICATED' });
    expect((await t.app.inject({ method: 'GET', url: '/v1/jobs', headers: { authorization: 'Basic abc' } })).json()).toMatchObject({ code: 'UNAUTHENTICATED' });
  });

  it('refuses a wrong key: 401 INVALID_API_KEY', async () => {
    for (const key of ['acme-key-0123456789abcdeX', 'x', ACME.slice(0, -1)]) {
      const r = await t.app.inject({ method: 'GET', url: '/v1/jobs', headers: bearer(key) });
      expect(r.statusCode).toBe(401);
      expect(r.json()).toMatchObject({ code: 'INVALID_API_KEY' });
    }
  });

  it('needs no key for health, readiness, metrics and the documents', async () => {
    for (const url of ['/healthz', '/readyz', '/metrics', '/openapi.json', '/docs']) expect((await t.app.inject({ method: 'GET', url })).statusCode, url).toBe(200);
  });

  it('keeps each tenant to its own jobs', async () => {
    const r = await post(t.app, '/v1/jobs', upload('acme.dxf', rect(12, 5), { torsion: 'false' }), bearer(ACME));
    expect(r.statusCode).toBe(202);
    const { id } = r.json() as { id: string };
    await waitForJob(t.app, id, bearer(ACME));
    expect((await t.app.inject({ method: 'GET', url: `/v1/jobs/${id}`, headers: bearer(ACME) })).statusCode).toBe(200);
    for (const [method, url] of [
      ['GET', `/v1/jobs/${id}`],
      ['GET', `/v1/jobs/${id}/results`],
      ['DELETE', `/v1/jobs/${id}`],
    ] as const) {
      const other = await t.app.inject({ method, url, headers: bearer(BETA) });
      expect(other.statusCode, `${method} ${url}`).toBe(404);
      expect(other.json()).toMatchObject({ code: 'JOB_NOT_FOUND' });
    }
    const betaList = (await t.app.inject({ method: 'GET', url: '/v1/jobs', headers: bearer(BETA) })).json() as { jobs: unknown[] };
    expect(betaList.jobs).toEqual([]);
    const acmeList = (await t.app.inject({ method: 'GET', url: '/v1/jobs', headers: bearer(ACME) })).json() as { jobs: { id: string }[] };
    expect(acmeList.jobs.map((j) => j.id)).toEqual([id]);
    // The job is still acme's and still done: beta's DELETE changed nothing.
    expect((await t.app.inject({ method: 'GET', url: `/v1/jobs/${id}`, headers: bearer(ACME) })).json()).toMatchObject({ status: 'done' });
  });

  it('does not answer one tenant from another tenant\'s stored results', async () => {
    const body = upload('same.dxf', rect(13, 6), { torsion: 'false' });
    const a = await t.app.keelson.computer.keyOf('acme', { name: 'same', source: 'same.dxf', sha256: 'x' }, { torsion: false });
    const b = await t.app.keelson.computer.keyOf('beta', { name: 'same', source: 'same.dxf', sha256: 'x' }, { torsion: false });
    expect(a).not.toBe(b);
    expect((await post(t.app, '/v1/compute', body, bearer(ACME))).statusCode).toBe(200);
    expect((await post(t.app, '/v1/compute', body, bearer(BETA))).statusCode).toBe(200);
  });
});

describe('configuration of keys', () => {
  it('reads tenant:key pairs and refuses short keys or missing tenants', () => {
    expect(parseApiKeys(' a:0123456789abcdef , b.c:fedcba9876543210 ')).toEqual([
      { tenant: 'a', key: '0123456789abcdef' },
      { tenant: 'b.c', key: 'fedcba9876543210' },
    ]);
    expect(parseApiKeys('')).toEqual([]);
    expect(() => parseApiKeys('a:short')).toThrow(/16 characters/);
    expect(() => parseApiKeys('0123456789abcdef')).toThrow(/tenant:key/);
  });

  it('keeps only hashes of the keys', async () => {
    const t = await testApp({ apiKeys: parseApiKeys(`acme:${ACME}`) });
    try {
      expect(JSON.stringify(t.app.keelson.keys)).not.toContain(ACME);
    } finally {
      await t.close();
    }
  });
});

describe('rate limit', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await testApp({ rateLimitPerMinute: 3, apiKeys: parseApiKeys(`acme:${ACME},beta:${BETA}`) });
  });
  afterAll(() => t.close());

  it('answers 429 RATE_LIMITED with Retry-After past the limit, per key', async () => {
    for (let i = 0; i < 3; i++) expect((await t.app.inject({ method: 'GET', url: '/v1/jobs', headers: bearer(ACME) })).statusCode).toBe(200);
    const r = await t.app.inject({ method: 'GET', url: '/v1/jobs', headers: bearer(ACME) });
    expect(r.statusCode).toBe(429);
    expect(r.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(r.json()).toMatchObject({ code: 'RATE_LIMITED', status: 429 });
    expect(Number(r.headers['retry-after'])).toBeGreaterThan(0);
    // Another tenant has its own allowance; health checks are never limited.
    expect((await t.app.inject({ method: 'GET', url: '/v1/jobs', headers: bearer(BETA) })).statusCode).toBe(200);
    for (let i = 0; i < 5; i++) expect((await t.app.inject({ method: 'GET', url: '/healthz' })).statusCode).toBe(200);
  });

  it('counts failed authentication against the caller\'s address', async () => {
    const codes: number[] = [];
    for (let i = 0; i < 5; i++) codes.push((await t.app.inject({ method: 'GET', url: '/v1/jobs', headers: bearer('guess-guess-guess-guess') })).statusCode);
    expect(codes).toEqual([401, 401, 401, 429, 429]);
  });
});
