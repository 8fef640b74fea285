import { mkdtempSync, rmSync } from 'node:fs';
import { setPriority, tmpdir } from 'node:os';
import { join } from 'node:path';
import type { FastifyInstance, InjectOptions } from 'fastify';
import yazl from 'yazl';
import { CIRCLE, LINE, LWPOLYLINE, dxf, rectLines } from '../../../packages/dxf/test/dxf';
import { build } from '../src/app';
import type { Config } from '../src/config';

export { CIRCLE, LINE, LWPOLYLINE, dxf, rectLines };

/**
 * The service's tests keep worker threads and servers busy; other files of the suite time their
 * own processes (the CLI's "fast" checks). On the 2-core machines that contention is enough to
 * fail them, so these tests run at a lower scheduling priority: each test file has its own process,
 * and the threads and processes it starts after this inherit the priority. Where lowering it is
 * not allowed, they run as they are.
 */
export function yieldCpu(): void {
  try {
    setPriority(10);
  } catch {
    // not permitted here: normal priority
  }
}
yieldCpu();

/** Plate 100 × 50 mm with a centred hole of diameter 20: A = 5000 − 100π mm² (common practice). */
export const PLATE = dxf([...rectLines(0, 0, 100, 50), CIRCLE([50, 25], 10)]);
export const PLATE_AREA = 5000 - 100 * Math.PI;
/** A rectangle w × h mm, distinct per size (so its result is not shared with another test's). */
export const rect = (w: number, h: number) => dxf(rectLines(0, 0, w, h));
/** Three sides of a square: open ends at (0, 10) and (0, 0). */
export const OPEN = dxf([LINE([0, 0], [10, 0]), LINE([10, 0], [10, 10]), LINE([10, 10], [0, 10])]);

export interface TestApp {
  app: FastifyInstance;
  dir: string;
  close(): Promise<void>;
}

/** An app on a fresh data folder (SQLite), one worker thread unless said otherwise; closed and removed by `close`. */
export async function testApp(config: Partial<Config> = {}, dir = mkdtempSync(join(tmpdir(), 'keelson-api-'))): Promise<TestApp> {
  const app = await build({ config: { dataDir: dir, workers: 1, pollMs: 50, ...config } });
  await app.ready();
  return {
    app,
    dir,
    close: async () => {
      await app.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

export interface Part {
  readonly name: string;
  readonly filename?: string;
  readonly content: string | Buffer;
  readonly type?: string;
}

/** A multipart/form-data body, built by hand so that tests can also cut it short. */
export function form(parts: readonly Part[], boundary = '----keelson-test-boundary'): { payload: Buffer; headers: Record<string, string> } {
  const chunks: Buffer[] = [];
  for (const p of parts) {
    const disposition = `form-data; name="${p.name}"${p.filename !== undefined ? `; filename="${p.filename}"` : ''}`;
    const type = p.filename !== undefined ? `\r\nContent-Type: ${p.type ?? 'application/octet-stream'}` : '';
    chunks.push(Buffer.from(`--${boundary}\r\nContent-Disposition: ${disposition}${type}\r\n\r\n`), Buffer.from(p.content), Buffer.from('\r\n'));
  }
  chunks.push(Buffer.from(`--${boundary}--\r\n`));
  return { payload: Buffer.concat(chunks), headers: { 'content-type': `multipart/form-data; boundary=${boundary}` } };
}

/** A file upload with optional text fields. */
export const upload = (filename: string, content: string | Buffer, fields: Record<string, string> = {}) =>
  form([...Object.entries(fields).map(([name, v]) => ({ name, content: v })), { name: 'file', filename, content }]);

export function post(app: FastifyInstance, url: string, body: { payload: Buffer; headers: Record<string, string> }, headers: Record<string, string> = {}) {
  return app.inject({ method: 'POST', url, payload: body.payload, headers: { ...body.headers, ...headers } } as InjectOptions);
}

/** A ZIP of the given entries (deflated). */
export function zip(entries: readonly [name: string, content: string | Buffer][]): Promise<Buffer> {
  const z = new yazl.ZipFile();
  for (const [name, content] of entries) z.addBuffer(Buffer.from(content), name);
  z.end();
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    z.outputStream.on('data', (c: Buffer) => chunks.push(c));
    z.outputStream.on('error', reject);
    z.outputStream.on('end', () => resolve(Buffer.concat(chunks)));
  });
}

/** yazl refuses "../" names, as it should; an attacker's archive has them: rename an entry in place (same length). */
export function renameEntry(buf: Buffer, from: string, to: string): Buffer {
  if (from.length !== to.length) throw new Error('same length only');
  const out = Buffer.from(buf);
  const a = Buffer.from(from);
  for (let i = out.indexOf(a); i >= 0; i = out.indexOf(a, i + 1)) Buffer.from(to).copy(out, i);
  return out;
}

/** Polls GET /v1/jobs/{id} until the job is done or cancelled. */
export async function waitForJob(app: FastifyInstance, id: string, headers: Record<string, string> = {}, timeoutMs = 60_000) {
  const t0 = Date.now();
  for (;;) {
    const r = await app.inject({ method: 'GET', url: `/v1/jobs/${id}`, headers });
    const job = r.json() as { status: string; counts: Record<string, number> };
    if (job.status === 'done' || job.status === 'cancelled') return job;
    if (Date.now() - t0 > timeoutMs) throw new Error(`job ${id} still ${job.status} after ${timeoutMs} ms`);
    await new Promise((res) => setTimeout(res, 50));
  }
}
