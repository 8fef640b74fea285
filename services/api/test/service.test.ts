import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DXF_ERROR_CODES } from '@keelson/dxf';
import { DRAWING_CODES, ERRORS } from '../src/errors';
import { testApp, type TestApp } from './helpers';

let t: TestApp;
beforeAll(async () => {
  t = await testApp();
});
afterAll(() => t.close());

describe('health, readiness, metrics', () => {
  it('GET /healthz and /readyz', async () => {
    expect((await t.app.inject({ method: 'GET', url: '/healthz' })).json()).toEqual({ status: 'ok' });
    expect((await t.app.inject({ method: 'GET', url: '/readyz' })).json()).toEqual({ status: 'ready', store: 'sqlite', workers: 1 });
  });

  it('GET /metrics in Prometheus format: jobs, drawings, durations, errors', async () => {
    await t.app.inject({ method: 'GET', url: '/nowhere' });
    const r = await t.app.inject({ method: 'GET', url: '/metrics' });
    expect(r.headers['content-type']).toMatch(/^text\/plain/);
    for (const name of [
      'keelson_jobs_created_total',
      'keelson_drawings_total',
      'keelson_drawing_duration_seconds',
      'keelson_http_request_duration_seconds_bucket',
      'keelson_queue_pending_drawings',
      'keelson_pool_busy_threads',
      'keelson_process_resident_memory_bytes',
    ])
      expect(r.body, name).toContain(name);
    expect(r.body).toMatch(/keelson_errors_total\{code="NOT_FOUND"\} 1/);
  });

  it('echoes a client\'s request id, or makes one', async () => {
    const given = await t.app.inject({ method: 'GET', url: '/healthz', headers: { 'x-request-id': 'abc-123' } });
    expect(given.headers['x-request-id']).toBe('abc-123');
    const made = await t.app.inject({ method: 'GET', url: '/healthz', headers: { 'x-request-id': 'bad id with spaces' } });
    expect(made.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/);
  });

  it('answers an unknown route with a 404 problem document', async () => {
    const r = await t.app.inject({ method: 'GET', url: '/v2/nothing' });
    expect(r.statusCode).toBe(404);
    expect(r.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(r.json()).toMatchObject({ code: 'NOT_FOUND', status: 404, type: '/docs/errors#NOT_FOUND' });
  });
});

describe('OpenAPI document and docs page', () => {
  it('describes every route, the upload bodies by hand, and the bearer scheme', async () => {
    const doc = (await t.app.inject({ method: 'GET', url: '/openapi.json' })).json() as {
      openapi: string;
      paths: Record<string, Record<string, { requestBody?: { content: Record<string, { schema: { properties: Record<string, unknown>; required: string[] } }> } }>>;
      components: { securitySchemes: Record<string, unknown> };
    };
    expect(doc.openapi).toMatch(/^3\./);
    for (const [p, m] of [
      ['/healthz', 'get'],
      ['/readyz', 'get'],
      ['/metrics', 'get'],
      ['/v1/compute', 'post'],
      ['/v1/jobs', 'post'],
      ['/v1/jobs', 'get'],
      ['/v1/jobs/{id}', 'get'],
      ['/v1/jobs/{id}/results', 'get'],
      ['/v1/jobs/{id}', 'delete'],
    ])
      expect(doc.paths[p!]?.[m!], `${m} ${p}`).toBeDefined();
    for (const p of ['/v1/compute', '/v1/jobs']) {
      const body = doc.paths[p]!.post!.requestBody!.content['multipart/form-data']!.schema;
      expect(body.required).toEqual(['file']);
      expect(Object.keys(body.properties)).toEqual(expect.arrayContaining(['file', 'units', 'drawingUnits', 'split', 'layers', 'torsion']));
    }
    expect(doc.components.securitySchemes.bearer).toMatchObject({ type: 'http', scheme: 'bearer' });
  });

  it('serves a docs page naming every route and every error code', async () => {
    const r = await t.app.inject({ method: 'GET', url: '/docs' });
    expect(r.headers['content-type']).toMatch(/^text\/html/);
    for (const code of Object.keys(ERRORS)) expect(r.body, code).toContain(`id="${code}"`);
    for (const code of Object.keys(DRAWING_CODES)) expect(r.body, code).toContain(`id="drawing-${code}"`);
    expect((await t.app.inject({ method: 'GET', url: '/docs/errors' })).statusCode).toBe(200);
  });
});

const sources = (dir: string): string[] =>
  readdirSync(dir).flatMap((n) => {
    const p = join(dir, n);
    return statSync(p).isDirectory() ? sources(p) : /\.ts$/.test(n) ? [p] : [];
  });

describe('error catalogue (errors.ts)', () => {
  it('documents every code with a status, a title and a meaning', () => {
    for (const [code, e] of Object.entries(ERRORS)) {
      expect(code).toMatch(/^[A-Z][A-Z_]+$/);
      expect(e.status, code).toBeGreaterThanOrEqual(400);
      expect(e.status, code).toBeLessThan(600);
      expect(e.title.length, code).toBeGreaterThan(3);
      expect(e.doc.length, code).toBeGreaterThan(10);
    }
  });

  it('has every code the service raises', () => {
    const raised = new Set<string>();
    for (const f of sources(join(import.meta.dirname, '..', 'src')))
      for (const m of readFileSync(f, 'utf8').matchAll(/new ApiError\(\s*'([A-Z_]+)'/g)) raised.add(m[1]!);
    expect(raised.size).toBeGreaterThan(10);
    for (const code of raised) expect(Object.keys(ERRORS), code).toContain(code);
  });

  it('documents every fault code a drawing can have, the reader\'s included', () => {
    const own = new Set<string>();
    for (const f of sources(join(import.meta.dirname, '..', 'src')))
      for (const m of readFileSync(f, 'utf8').matchAll(/code: '([A-Z_]+)'/g)) own.add(m[1]!);
    for (const code of [...DXF_ERROR_CODES, 'EMPTY_REGION', 'DEGENERATE_LOOP', 'OPEN_LOOP', 'NON_FINITE', 'INVALID_SEGMENT', ...own])
      expect(Object.keys(DRAWING_CODES), code).toContain(code);
  });
});
