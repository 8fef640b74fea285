import { cpSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import yazl from 'yazl';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tee } from '@keelson/shapes';
import { PROFILES, renderProfile } from '../../../fixtures/catalogue';
import { run } from '../src/cli';
import { progressBar } from '../src/progress';

const demo = join(import.meta.dirname, '../../../fixtures/demo');
let dir = '';
let catalogue = '';

/** The CLI in this process: exit code and what it printed. The data directory is the test's own. */
async function keelson(...argv: string[]) {
  let out = '';
  let err = '';
  const code = await run(argv, { out: (t) => void (out += t), err: (l) => void (err += `${l}\n`), debug: false });
  return { code, out, err };
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'keelson-verify-'));
  process.env.KEELSON_DATA_DIR = join(dir, 'data');
  catalogue = join(dir, 'demo');
  cpSync(demo, catalogue, { recursive: true });
});
afterAll(() => {
  delete process.env.KEELSON_DATA_DIR;
  rmSync(dir, { recursive: true, force: true });
});

describe('keelson verify on the demo catalogue', () => {
  it('exits 3 naming exactly the two deliberate failures, stores the run, writes the reports', async () => {
    const reports = ['r.html', 'r.csv', 'r.json'].map((n) => join(dir, n));
    const r = await keelson('verify', catalogue, ...reports.flatMap((f) => ['--report', f]));
    expect(r.err).toBe('');
    expect(r.code).toBe(3);
    expect(r.out).toMatch(/: 20 profiles, 18 pass, 2 fail, 0 unreadable, 0 missing; 229 values checked, 2 outside tolerance\./);
    expect(r.out.split('\n').filter((l) => l.startsWith('  FAIL'))).toEqual([
      '  FAIL    MX 106  m: computed 0.4750 kg/m, published 0.583 (−19 %, tolerance 1 %)',
      '  FAIL    MX 132  Ix: computed 412.6 cm⁴, published 421.6 (−2.1 %, tolerance 1 %)',
    ]);
    expect(r.out.trimEnd().split('\n').at(-1)).toBe('Computed geometric properties; structural adequacy is for a licensed engineer under local codes.');
    expect(readFileSync(reports[0]!, 'utf8')).toContain('<h1>Catalogue verification: demo</h1>');
    expect(readFileSync(reports[1]!, 'utf8').split('\n')[0]).toMatch(/^run_id,profile_id,drawing,revision,material,status,failed_properties,fault,drawing_sha256,m \[kg\/m\],/);
    expect(JSON.parse(readFileSync(reports[2]!, 'utf8')).summary.fail).toBe(2);
    const stored = readdirSync(join(dir, 'data', 'verify'));
    expect(stored).toEqual([expect.stringMatching(/^demo-[0-9a-f]{8}$/)]);
  });

  it('after one drawing changes, verifies again (only it recomputed) and the diff names exactly that profile', async () => {
    const mx133 = PROFILES.find((p) => p.name === 'mx133-tee-50x50x5')!;
    writeFileSync(join(catalogue, 'mx133-tee-50x50x5.dxf'), renderProfile({ ...mx133, build: () => tee({ h: 50, b: 50, tw: 5, tf: 6, r: 5, rt: 1 }) }));
    const again = await keelson('verify', catalogue);
    expect(again.code).toBe(3);
    expect(again.out).toMatch(/Since run \S+: drawings changed 1, values moved beyond tolerance \d+, new failures \d+, fixed 0, profiles added 0, removed 0/);
    expect(again.out).toMatch(/19 of 20 drawings unchanged since the last run, their values reused\./);

    const d = await keelson('diff', catalogue);
    expect(d.code).toBe(0);
    expect(d.out).toMatch(/^ {2}drawings changed \(1\): MX 133 \(mx133-tee-50x50x5\.dxf\)$/m);
    const moved = d.out.split('\n').filter((l) => /^ {4}\S/.test(l));
    expect(moved.length).toBeGreaterThan(5);
    expect(moved.every((l) => l.startsWith('    MX 133  '))).toBe(true);
    expect(moved.find((l) => /^ {4}MX 133 {2}A /.test(l))).toMatch(/^ {4}MX 133 {2}A +4\.849 → 5\.299 cm² {2}\(\+9\.3 %\)$/);

    const json = JSON.parse((await keelson('diff', catalogue, '--json')).out);
    expect(json.drawingsChanged.map((c: { id: string }) => c.id)).toEqual(['MX 133']);
    const list = await keelson('diff', '--list', catalogue);
    const ids = list.out.trim().split('\n').map((l) => l.split(' ')[0]!);
    expect(ids).toHaveLength(2);
    expect((await keelson('diff', ids[0]!, ids[1]!)).out).toBe(d.out);
    expect((await keelson('diff', ids[1]!)).out).toBe(d.out);
  });
});

describe('keelson verify on a ZIP catalogue', () => {
  it('reads the drawings and the manifest inside the archive, relative to the manifest', async () => {
    const rows = readFileSync(join(demo, 'manifest.csv'), 'utf8').split('\n');
    const picked = rows.filter((l, i) => i === 0 || /^MX 10[45],/.test(l));
    const zip = new yazl.ZipFile();
    zip.addBuffer(Buffer.from(`${picked.join('\n')}\n`), 'plant/manifest.csv');
    for (const n of ['mx104-round-tube-50x3.dxf', 'mx105-rect-tube-80x40x2.dxf', 'mx101-rect-tube-60x40x3.dxf']) zip.addBuffer(readFileSync(join(demo, n)), `plant/${n}`);
    zip.addBuffer(Buffer.from('Catalogue of the plant'), 'plant/README.txt');
    zip.end();
    const chunks: Buffer[] = [];
    for await (const c of zip.outputStream) chunks.push(c as Buffer);
    const file = join(dir, 'plant.zip');
    writeFileSync(file, Buffer.concat(chunks));
    const r = await keelson('verify', file);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^Verified plant \(.*plant\.zip\) against .*plant\.zip:plant\/manifest\.csv: 2 profiles, 2 pass, 0 fail/);
    expect(r.out).toContain('  note    plant/mx101-rect-tube-60x40x3.dxf has no manifest row');
  });
});

describe('keelson verify on bad input: exit 2 and one line', () => {
  it('a folder without a manifest, a manifest at fault, an unknown option, a missing catalogue', async () => {
    const empty = join(dir, 'no-manifest');
    cpSync(join(demo, 'mx101-rect-tube-60x40x3.dxf'), join(empty, 'a.dxf'), { recursive: true });
    let r = await keelson('verify', empty);
    expect([r.code, r.err]).toEqual([2, `keelson: ${empty}: no manifest.csv or manifest.json in this folder; give one with --manifest\n`]);
    const bad = join(dir, 'bad.csv');
    writeFileSync(bad, 'id,drawing,revision,material,units,A\nX,a.dxf,,steel,mm,"1,5"\n');
    r = await keelson('verify', empty, '--manifest', bad);
    expect([r.code, r.err]).toEqual([2, `keelson: ${bad}: line 2, column A: "1,5" is not a number (use a decimal point, no thousands separator)\n`]);
    r = await keelson('verify', empty, '--fast');
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^keelson: unknown option --fast; usage: keelson verify/);
    r = await keelson('verify', join(dir, 'nowhere'));
    expect([r.code, r.err]).toEqual([2, `keelson: ${join(dir, 'nowhere')}: no such file or folder\n`]);
    r = await keelson('diff', 'no-such-run');
    expect(r.code).toBe(2);
  });

  it('passes (exit 0) when every published value holds, reporting drawings without a row', async () => {
    const m = join(dir, 'good.csv');
    writeFileSync(m, 'id,drawing,revision,material,units,A,Ix\nT,a.dxf,,aluminium,cm,5.511,13.84\n');
    const r = await keelson('verify', join(dir, 'no-manifest'), '--manifest', m);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/1 profiles, 1 pass, 0 fail/);
  });
});

describe('progress bar', () => {
  it('draws on a terminal and erases itself; writes nothing to a pipe', () => {
    const written: string[] = [];
    const tty = progressBar({ isTTY: true, columns: 60, write: (s: string) => written.push(s) });
    tty.update(5, 20, 'MX 105');
    tty.done();
    expect(written).toEqual(['\r\x1b[2K[██████░░░░░░░░░░░░░░░░░░] 5/20 MX 105', '\r\x1b[2K']);
    const piped: string[] = [];
    const pipe = progressBar({ isTTY: false, write: (s: string) => piped.push(s) });
    pipe.update(1, 2, 'x');
    pipe.done();
    expect(piped).toEqual([]);
  });
});
