import { readFile, readdir } from 'node:fs/promises';
import { basename, join, resolve } from 'node:path';
import type { FastifyInstance } from 'fastify';
import { build } from './app';
import { LOCAL_TENANT } from './auth';
import { ConfigError, configFromEnv } from './config';
import { createJob } from './jobs';
import type { Drawing } from './uploads';

export interface ServeOptions {
  readonly port?: number;
  readonly host?: string;
  /** A folder of DXF drawings submitted as the first job (the demo catalogue for `pnpm start`). */
  readonly demo?: string;
  readonly env?: NodeJS.ProcessEnv;
  /** Where the human-readable lines go (where it listens, the demo job); the log is JSON on stdout. */
  readonly print?: (line: string) => void;
}

const LOOPBACK = new Set(['127.0.0.1', 'localhost', '::1']);

/** `PORT`-style value: an integer 0..65535 (0 asks the system for a free port). */
export function parsePort(v: string | number | undefined, fallback: number): number {
  if (v === undefined || v === '') return fallback;
  const n = Number(v);
  if (!Number.isInteger(n) || n < 0 || n > 65535) throw new ConfigError(`port must be an integer from 0 to 65535, not "${v}"`);
  return n;
}

/** Starts the service: config from the environment, store, threads, listening socket, signals. */
export async function serve(opts: ServeOptions = {}): Promise<{ app: FastifyInstance; url: string }> {
  const env = opts.env ?? process.env;
  const print = opts.print ?? ((line: string) => process.stderr.write(`${line}\n`));
  const cfg = configFromEnv(env);
  const port = parsePort(opts.port ?? env.PORT, 8080);
  let host = opts.host ?? env.HOST ?? '127.0.0.1';
  const app = await build({
    config: cfg,
    logger: { level: env.KEELSON_LOG_LEVEL || 'info', redact: ['req.headers.authorization'] },
  });
  if (!cfg.apiKeys.length && !LOOPBACK.has(host)) {
    app.log.warn({ requested: host }, 'no API keys configured: refusing to listen beyond this machine');
    host = '127.0.0.1';
  }
  await app.listen({ port, host });
  const addr = app.server.address();
  const actualPort = typeof addr === 'object' && addr ? addr.port : port;
  const url = `http://${host.includes(':') ? `[${host}]` : host}:${actualPort}`;
  const { store, keys } = app.keelson;
  if (!keys.enabled)
    app.log.warn('no API keys configured (KEELSON_API_KEYS): listening on 127.0.0.1 only, without authentication');
  app.log.info({ url, store: store.kind, dataDir: store.kind === 'sqlite' ? cfg.dataDir : undefined, workers: cfg.workers }, 'listening');
  print(`Keelson API listening on ${url}  (docs ${url}/docs, store ${store.kind === 'sqlite' ? `SQLite in ${cfg.dataDir}` : 'PostgreSQL'}, ${cfg.workers} worker threads)`);
  if (!keys.enabled) print('No API keys configured (KEELSON_API_KEYS): listening on 127.0.0.1 only, without authentication.');

  let closing = false;
  const shutdown = (signal: string) => {
    if (closing) return;
    closing = true;
    app.log.info({ signal }, 'shutting down: no new work; running drawings finish or go back to the queue');
    // A second signal, or a hang past the grace period, ends the process anyway.
    const force = setTimeout(() => process.exit(1), cfg.shutdownGraceMs + 10_000);
    force.unref();
    app.close().then(
      () => {
        app.log.info('stopped');
        process.exit(0);
      },
      (e: unknown) => {
        app.log.error({ err: e }, 'shutdown failed');
        process.exit(1);
      },
    );
  };
  process.once('SIGTERM', () => shutdown('SIGTERM'));
  process.once('SIGINT', () => shutdown('SIGINT'));

  if (opts.demo) void runDemo(app, opts.demo, url, keys.enabled ? keys.tenants[0]! : LOCAL_TENANT, print);
  return { app, url };
}

/** Submits every DXF of `folder` as one job, then prints its summary when it finishes. */
async function runDemo(app: FastifyInstance, folder: string, url: string, tenant: string, print: (line: string) => void): Promise<void> {
  try {
    const dir = resolve(folder);
    const names = (await readdir(dir)).filter((n) => /\.dxf$/i.test(n)).sort();
    const drawings: Drawing[] = await Promise.all(
      names.map(async (n) => ({ name: n.replace(/\.dxf$/i, ''), source: join(folder, n), bytes: await readFile(join(dir, n)) })),
    );
    const id = await createJob(app.keelson, tenant, { name: basename(dir), bytes: null, kind: 'folder' }, drawings, { torsion: 1e-3 });
    print(`Demo catalogue ${folder}: job ${id}, ${drawings.length} drawings  (${url}/v1/jobs/${id})`);
    const t0 = Date.now();
    for (;;) {
      const job = await app.keelson.store.getJob(tenant, id);
      if (!job || job.status === 'done' || job.status === 'cancelled') {
        if (!job) return;
        const c = job.counts;
        print(`Demo job ${id}: ${job.status}, ${c.done} of ${c.total} computed, ${c.failed} failed, in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
        const items = await app.keelson.store.listItems(tenant, id);
        for (const it of items) {
          if (it.error) print(`  ${it.name.padEnd(34)} ${it.error.code}: ${it.error.message}`);
          if (!it.result || !('profiles' in it.result)) continue;
          for (const e of it.result.profiles as { name: string; units?: string; properties?: Record<string, number>; error?: { message: string } }[]) {
            const g = (v: number | undefined) => (v === undefined ? '—' : Number(v.toPrecision(4)).toString());
            if (e.error || !e.properties) print(`  ${e.name.padEnd(34)} ${e.error?.message ?? ''}`);
            else print(`  ${e.name.padEnd(34)} A ${g(e.properties.A)} ${e.units}²   Ix ${g(e.properties.Ix)} ${e.units}⁴   Zx ${g(e.properties.Zx)} ${e.units}³   J ${g(e.properties.J)} ${e.units}⁴`);
          }
        }
        print(`Results: ${url}/v1/jobs/${id}/results  (CSV: curl -H 'Accept: text/csv' ${url}/v1/jobs/${id}/results)`);
        return;
      }
      await new Promise((r) => setTimeout(r, 250));
    }
  } catch (e) {
    app.log.error({ err: e }, 'demo job failed');
  }
}

// `tsx services/api/src/server.ts`: serve from the environment.
if (process.argv[1] && resolve(process.argv[1]) === resolve(import.meta.filename)) {
  serve().catch((e: unknown) => {
    process.stderr.write(`keelson: ${e instanceof ConfigError ? e.message : (e as Error).stack}\n`);
    process.exit(e instanceof ConfigError ? 2 : 1);
  });
}
