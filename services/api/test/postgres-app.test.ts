import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { FastifyInstance } from 'fastify';
import { build } from '../src/app';
import { PostgresStore } from '../src/store';
import { PLATE, OPEN, post, rect, upload, waitForJob, zip } from './helpers';
import { TEST_DATABASE_URL, postgresReachable, testSchema } from './pg';

// The whole service on PostgreSQL: the dispatcher claims with SKIP LOCKED and leases there.
const reachable = await postgresReachable();

describe.skipIf(!reachable && !process.env.CI)('the service on PostgreSQL', () => {
  let app: FastifyInstance;
  let store: PostgresStore;
  const { schema, drop } = testSchema();

  beforeAll(async () => {
    store = new PostgresStore({ connectionString: TEST_DATABASE_URL, schema });
    await store.migrate();
    app = await build({ store, config: { workers: 1, pollMs: 50 } });
    await app.ready();
  });
  afterAll(async () => {
    await app?.close();
    await store?.close();
    await drop();
  });

  it('runs a job to the end and answers a repeated compute from the store', async () => {
    expect((await app.inject({ method: 'GET', url: '/readyz' })).json()).toMatchObject({ store: 'postgres' });
    const z = await zip([['plate.dxf', PLATE], ['open.dxf', OPEN], ['bar.dxf', rect(8, 3)]]);
    const { id } = (await post(app, '/v1/jobs', upload('pg.zip', z, { torsion: 'false' }))).json() as { id: string };
    const job = await waitForJob(app, id);
    expect(job.counts).toMatchObject({ total: 3, done: 2, failed: 1 });
    const csv = await app.inject({ method: 'GET', url: `/v1/jobs/${id}/results`, headers: { accept: 'text/csv' } });
    expect(csv.body.trimEnd().split('\r\n')).toHaveLength(3);
    const body = upload('bar.dxf', rect(8, 3), { torsion: 'false' });
    const a = await post(app, '/v1/compute', body);
    const b = await post(app, '/v1/compute', body);
    expect(b.json()).toEqual(a.json());
    expect((await app.inject({ method: 'GET', url: '/v1/jobs' })).json()).toMatchObject({ jobs: [{ id }] });
  });
});
