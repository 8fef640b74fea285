/**
 * Load on a local service: concurrent POST /v1/compute uploads of a typical profile (the demo's
 * I-beam), against `keelson serve` started as a child process on 127.0.0.1 with a fresh data
 * folder. Prints throughput, p50/p99 latency and the server's resident memory (from /metrics)
 * before and after each phase. Figures only: nothing is asserted. Requests go to 127.0.0.1 only,
 * bounded in count.
 *
 *   pnpm bench:api                      # 50 concurrent, 5,000 requests per phase
 *   BENCH_REQUESTS=1000 BENCH_CONCURRENCY=20 BENCH_ROUNDS=5 BENCH_TORSION_REQUESTS=0 pnpm bench:api
 *
 * Phases: "computed" gives each upload its own file name, so the result key differs and every
 * request is computed in a worker thread (closed-form properties, torsion=false); "cached" repeats
 * one upload, answered from the store; "torsion" computes J, Cw and the shear centre too (finite
 * elements: far heavier, so fewer requests).
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { Agent, request } from 'node:http';
import { availableParallelism, cpus, tmpdir } from 'node:os';
import { join } from 'node:path';
import { createInterface } from 'node:readline';

const root = join(import.meta.dirname, '..');
const REQUESTS = Number(process.env.BENCH_REQUESTS ?? 5000);
const CONCURRENCY = Number(process.env.BENCH_CONCURRENCY ?? 50);
const TORSION_REQUESTS = Number(process.env.BENCH_TORSION_REQUESTS ?? 200);
/** Rounds of `computed` requests: resident memory must level off across them. */
const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 3);
const drawing = readFileSync(join(root, 'fixtures/demo/mx132-i-beam-120x70.dxf'));

const dataDir = mkdtempSync(join(tmpdir(), 'keelson-bench-'));
const server = spawn(process.execPath, ['--import', 'tsx/esm', join(root, 'services/cli/src/main.ts'), 'serve', '--port', '0', '--host', '127.0.0.1'], {
  cwd: root,
  env: { ...process.env, KEELSON_DATA_DIR: dataDir, KEELSON_LOG_LEVEL: 'warn', KEELSON_RATE_LIMIT: '100000000', KEELSON_API_KEYS: '', PORT: '' },
  stdio: ['ignore', 'pipe', 'inherit'],
});
const url = await new Promise<string>((resolve, reject) => {
  createInterface({ input: server.stdout! }).on('line', (line) => {
    const m = /listening on (http:\/\/127\.0\.0\.1:\d+)/.exec(line);
    if (m) resolve(m[1]!);
  });
  server.on('exit', (code) => reject(new Error(`server exited with ${code}`)));
});

/** The server's resident memory (all threads) and main-thread V8 heap in use, MiB, from /metrics. */
async function memory(): Promise<{ rss: number; heap: number }> {
  const text = await (await fetch(`${url}/metrics`)).text();
  const metric = (name: string) => Number(new RegExp(`^${name} (\\S+)$`, 'm').exec(text)?.[1]) / 2 ** 20;
  return { rss: metric('keelson_process_resident_memory_bytes'), heap: metric('keelson_nodejs_heap_size_used_bytes') };
}

// The client shares the machine's two cores with the server: keep it cheap, with keep-alive
// connections and multipart bodies assembled from fixed pieces (fetch with FormData costs the
// client more CPU than the server spends answering).
const agent = new Agent({ keepAlive: true, maxSockets: CONCURRENCY });
const BOUNDARY = 'keelson-bench-boundary';

function body(name: string, fields: Record<string, string>): Buffer {
  const parts = Object.entries(fields).map(([k, v]) => `--${BOUNDARY}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`);
  const head = `${parts.join('')}--${BOUNDARY}\r\nContent-Disposition: form-data; name="file"; filename="${name}"\r\nContent-Type: application/dxf\r\n\r\n`;
  return Buffer.concat([Buffer.from(head), drawing, Buffer.from(`\r\n--${BOUNDARY}--\r\n`)]);
}

function upload(name: string, fields: Record<string, string>): Promise<number> {
  const payload = body(name, fields);
  const t0 = performance.now();
  return new Promise((resolve, reject) => {
    const req = request(
      `${url}/v1/compute`,
      { method: 'POST', agent, headers: { 'content-type': `multipart/form-data; boundary=${BOUNDARY}`, 'content-length': payload.length } },
      (res) => {
        res.resume();
        res.on('end', () => (res.statusCode === 200 ? resolve(performance.now() - t0) : reject(new Error(`${name}: HTTP ${res.statusCode}`))));
      },
    );
    req.on('error', reject);
    req.end(payload);
  });
}

const pct = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!;

async function phase(label: string, n: number, nameOf: (i: number) => string, fields: Record<string, string>) {
  const before = await memory();
  const latencies: number[] = [];
  let next = 0;
  const t0 = performance.now();
  await Promise.all(
    Array.from({ length: Math.min(CONCURRENCY, n) }, async () => {
      while (next < n) {
        const i = next++;
        latencies.push(await upload(nameOf(i), fields));
      }
    }),
  );
  const seconds = (performance.now() - t0) / 1000;
  const after = await memory();
  latencies.sort((a, b) => a - b);
  const row = [
    label,
    String(n),
    (n / seconds).toFixed(1),
    pct(latencies, 50).toFixed(1),
    pct(latencies, 99).toFixed(1),
    `${before.rss.toFixed(0)} → ${after.rss.toFixed(0)}`,
    `${before.heap.toFixed(0)} → ${after.heap.toFixed(0)}`,
  ];
  console.log(row.map((c, i) => (i === 0 ? c.padEnd(22) : c.padStart(9))).join('  '));
}

try {
  console.log(`keelson serve on ${url}: ${availableParallelism()} worker threads (${cpus()[0]?.model ?? 'cpu'}), Node ${process.version}`);
  console.log(`${CONCURRENCY} concurrent uploads of mx132-i-beam-120x70.dxf (${drawing.length} bytes); client and server share this machine\n`);
  console.log(['phase', 'requests', 'req/s', 'p50 ms', 'p99 ms', 'RSS MiB', 'heap MiB'].map((c, i) => (i === 0 ? c.padEnd(22) : c.padStart(9))).join('  '));
  await phase('warm-up', 200, (i) => `warm-${i}.dxf`, { torsion: 'false' });
  for (let run = 1; run <= ROUNDS; run++) await phase(`computed (round ${run})`, REQUESTS, (i) => `beam-${run}-${i}.dxf`, { torsion: 'false' });
  await phase('cached', REQUESTS, () => 'beam-cached.dxf', { torsion: 'false' });
  if (TORSION_REQUESTS > 0) await phase('torsion (J, Cw, xs, ys)', TORSION_REQUESTS, (i) => `beam-t-${i}.dxf`, {});
} finally {
  agent.destroy();
  server.kill('SIGTERM');
  await new Promise((r) => server.once('exit', r));
  rmSync(dataDir, { recursive: true, force: true });
}
