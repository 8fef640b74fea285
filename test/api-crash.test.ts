import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createInterface } from 'node:readline';
import { afterAll, describe, expect, it } from 'vitest';
import { dxf, rectLines } from '../packages/dxf/test/dxf';
import { SqliteStore } from '../services/api/src/store';
import { zip } from '../services/api/test/helpers';

const root = join(import.meta.dirname, '..');
const dataDir = mkdtempSync(join(tmpdir(), 'keelson-crash-'));
const children: ChildProcess[] = [];

/** `keelson serve` as users run it (CLI entry under tsx's loader), on a free port; resolves with its URL. */
function startService(): Promise<{ child: ChildProcess; url: string }> {
  const child = spawn(process.execPath, ['--import', 'tsx/esm', join(root, 'services/cli/src/main.ts'), 'serve', '--port', '0'], {
    cwd: root,
    env: { ...process.env, KEELSON_DATA_DIR: dataDir, KEELSON_WORKERS: '1', KEELSON_LOG_LEVEL: 'warn', KEELSON_API_KEYS: '', PORT: '' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  children.push(child);
  let stderr = '';
  child.stderr!.on('data', (c: Buffer) => (stderr += c));
  return new Promise((resolve, reject) => {
    const lines = createInterface({ input: child.stdout! });
    lines.on('line', (line) => {
      const m = /listening on (http:\/\/\S+)/.exec(line);
      if (m) resolve({ child, url: m[1]! });
    });
    child.on('exit', (code) => reject(new Error(`service exited (${code}) before listening: ${stderr}`)));
  });
}

const json = async (r: Response) => (await r.json()) as Record<string, unknown>;

async function status(url: string, id: string) {
  return (await json(await fetch(`${url}/v1/jobs/${id}`))) as { status: string; counts: { done: number; failed: number; total: number; running: number; pending: number } };
}

afterAll(() => {
  for (const c of children) if (c.exitCode === null) c.kill('SIGKILL');
  rmSync(dataDir, { recursive: true, force: true });
});

describe('crash safety (kill -9 during a 200-drawing job)', () => {
  it('resumes the job on the next start and records every drawing exactly once', async () => {
    // 200 distinct rectangles, torsion to a coarse 1 %: a few ms each on one thread, so the job runs
    // for a second or two (long enough to be killed mid-way, short enough not to load the shared CPU).
    const entries = Array.from({ length: 200 }, (_, i): [string, string] => [`p${String(i).padStart(3, '0')}.dxf`, dxf(rectLines(0, 0, 40 + i, 10 + (i % 7)))]);
    const catalogue = await zip(entries);

    const first = await startService();
    const form = new FormData();
    form.set('accuracy', '1e-2');
    form.set('file', new Blob([catalogue]), 'crash.zip');
    const accepted = await fetch(`${first.url}/v1/jobs`, { method: 'POST', body: form });
    expect(accepted.status).toBe(202);
    const { id } = (await json(accepted)) as { id: string };

    // Let some drawings finish, then kill the process without warning.
    for (;;) {
      const s = await status(first.url, id);
      if (s.counts.done >= 15) break;
      await new Promise((r) => setTimeout(r, 10));
    }
    first.child.kill('SIGKILL');
    await new Promise((r) => first.child.once('exit', r));
    const atCrash = SqliteStore.inDir(dataDir);
    const before = (await atCrash.getJob('local', id))!.counts;
    await atCrash.close();
    expect(before.done).toBeGreaterThanOrEqual(15);
    expect(before.done).toBeLessThan(200);

    const second = await startService();
    let s = await status(second.url, id);
    for (const t0 = Date.now(); s.status !== 'done' && Date.now() - t0 < 240_000; s = await status(second.url, id)) await new Promise((r) => setTimeout(r, 200));
    expect(s.status).toBe('done');
    expect(s.counts).toMatchObject({ total: 200, done: 200, failed: 0, running: 0, pending: 0 });

    const results = (await json(await fetch(`${second.url}/v1/jobs/${id}/results`))) as { profiles: { name: string; properties: { A: number } }[] };
    expect(results.profiles.map((p) => p.name)).toEqual(entries.map(([n]) => n.replace('.dxf', '')));
    results.profiles.forEach((p, i) => expect(p.properties.A, p.name).toBe((40 + i) * (10 + (i % 7))));

    const store = SqliteStore.inDir(dataDir);
    try {
      const items = await store.listItems('local', id);
      expect(items.map((i) => i.idx)).toEqual(Array.from({ length: 200 }, (_, i) => i));
      expect(items.every((i) => i.status === 'done')).toBe(true);
      // One result per drawing: 200 distinct keys, each with its stored result.
      expect(new Set(items.map((i) => i.resultKey)).size).toBe(200);
      expect(items.every((i) => i.result !== null && 'profiles' in i.result && i.result.profiles.length === 1)).toBe(true);
      // Only the drawing in flight at the kill was claimed twice.
      const twice = items.filter((i) => i.attempts > 1).length;
      expect(twice).toBeLessThanOrEqual(1);
      console.log(`crash test: killed with ${before.done} of 200 done; restarted, 200 done, ${twice} drawing(s) claimed a second time, 200 results`);
    } finally {
      await store.close();
    }
    second.child.kill('SIGTERM');
    const code = await new Promise((r) => second.child.once('exit', r));
    expect(code).toBe(0);
  }, 300_000);
});
