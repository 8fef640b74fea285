import { spawn, spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createInterface } from 'node:readline';
import { afterAll, describe, expect, it } from 'vitest';
import { yieldCpu } from '../services/api/test/helpers';

yieldCpu();
const root = join(import.meta.dirname, '..');
const main = join(root, 'services/cli/src/main.ts');
const dataDir = mkdtempSync(join(tmpdir(), 'keelson-serve-'));
afterAll(() => rmSync(dataDir, { recursive: true, force: true }));

const env = (extra: Record<string, string> = {}) => ({ ...process.env, KEELSON_DATA_DIR: dataDir, KEELSON_API_KEYS: '', PORT: '', HOST: '', ...extra });

describe('keelson serve', () => {
  it('without API keys listens on 127.0.0.1 only, whatever host is asked, and says so', async () => {
    const child = spawn(process.execPath, ['--import', 'tsx/esm', main, 'serve', '--host', '0.0.0.0'], { cwd: root, env: env({ PORT: '0' }), stdio: ['ignore', 'pipe', 'pipe'] });
    const lines: string[] = [];
    const url = await new Promise<string>((resolve, reject) => {
      createInterface({ input: child.stdout! }).on('line', (line) => {
        lines.push(line);
        const m = /^Keelson API listening on (http:\/\/\S+)/.exec(line);
        if (m) resolve(m[1]!);
      });
      child.on('exit', (code) => reject(new Error(`exited ${code}`)));
    });
    try {
      expect(url).toMatch(/^http:\/\/127\.0\.0\.1:\d+$/);
      await new Promise((r) => setTimeout(r, 200));
      expect(lines.join('\n')).toMatch(/No API keys configured \(KEELSON_API_KEYS\): listening on 127\.0\.0\.1 only/);
      expect(lines.some((l) => l.startsWith('{') && /refusing to listen beyond this machine/.test(l))).toBe(true);
      expect((await fetch(`${url}/healthz`)).status).toBe(200);
    } finally {
      child.kill('SIGTERM');
      expect(await new Promise((r) => child.once('exit', r))).toBe(0);
    }
  });

  it('refuses a bad option or setting with one line and exit 2', () => {
    const bad = spawnSync(process.execPath, ['--import', 'tsx/esm', main, 'serve', '--port', 'eighty'], { cwd: root, env: env(), encoding: 'utf8' });
    expect(bad.status).toBe(2);
    expect(bad.stderr.trim().split('\n')).toEqual(['keelson: --port must be an integer from 0 to 65535, not "eighty"']);
    const keys = spawnSync(process.execPath, ['--import', 'tsx/esm', main, 'serve'], { cwd: root, env: env({ KEELSON_API_KEYS: 'acme:short' }), encoding: 'utf8' });
    expect(keys.status).toBe(2);
    expect(keys.stderr.trim()).toBe('keelson: KEELSON_API_KEYS must be tenant:key pairs separated by commas, each key at least 16 characters');
  });
});
