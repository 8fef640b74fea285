import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import yazl from 'yazl';
import { writeDxfDrawing, type DxfEntity } from '@keelson/dxf';

const root = join(import.meta.dirname, '..', '..', '..');
const main = join(root, 'services/cli/src/main.ts');
const dir = mkdtempSync(join(tmpdir(), 'keelson-zip-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function makeZip(files: readonly (readonly [string, string])[]): Promise<Buffer> {
  const zip = new yazl.ZipFile();
  for (const [name, data] of files) zip.addBuffer(Buffer.from(data, 'latin1'), name);
  zip.end();
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    zip.outputStream.on('data', (c: Buffer) => chunks.push(c));
    zip.outputStream.on('end', () => resolve(Buffer.concat(chunks)));
    zip.outputStream.on('error', reject);
  });
}

/** Plate w × h with a round hole of radius r at its centre, in millimetres. */
function plate(w: number, h: number, r: number): string {
  const entities: DxfEntity[] = [
    { type: 'LWPOLYLINE', vertices: [{ x: 0, y: 0, bulge: 0 }, { x: w, y: 0, bulge: 0 }, { x: w, y: h, bulge: 0 }, { x: 0, y: h, bulge: 0 }] },
    { type: 'CIRCLE', c: { x: w / 2, y: h / 2 }, r },
  ];
  return writeDxfDrawing({ unit: 'mm', entities });
}

interface Entry {
  name: string;
  source: string;
  properties?: { A: number };
  error?: { code: string; message: string };
}

describe('keelson props catalogue.zip', () => {
  it('200 drawings, three broken: 197 profiles and three error entries naming the drawing and the cause, exit 2', async () => {
    const files: [string, string][] = [];
    for (let i = 0; i < 200; i++) files.push([`plates/p${String(i).padStart(3, '0')}.dxf`, plate(40 + i, 20 + (i % 7), 5)]);
    const good = files[10]![1];
    // Three drawings broken three ways: cut short, an outline left open, binary DXF.
    files[17]![1] = good.slice(0, Math.floor(good.length / 2));
    files[88]![1] = good.replace('\n90\n4\n70\n1\n', '\n90\n4\n70\n0\n');
    files[150]![1] = 'AutoCAD Binary DXF\r\n\x1a\0';
    files.push(['README.txt', 'drawings of the plate catalogue']);
    const zip = join(dir, 'catalogue.zip');
    writeFileSync(zip, await makeZip(files));

    const t0 = performance.now();
    // Torsion (finite elements) is not what this test is about: --no-torsion keeps it to reading.
    const r = spawnSync(process.execPath, ['--import', 'tsx/esm', main, 'props', zip, '--json', '--no-torsion'], { cwd: root, encoding: 'utf8' });
    const ms = performance.now() - t0;
    expect(r.status).toBe(2);
    const entries = (JSON.parse(r.stdout) as { profiles: Entry[] }).profiles;
    expect(entries).toHaveLength(200);
    const failed = entries.filter((e) => e.error);
    expect(entries.filter((e) => e.properties)).toHaveLength(197);
    expect(failed.map((e) => [e.name, e.error!.code])).toEqual([
      ['p017', 'TRUNCATED'],
      ['p088', 'OPEN_OUTLINE'],
      ['p150', 'BINARY_DXF'],
    ]);
    for (const e of failed) {
      expect(e.source).toBe(`${zip}:plates/${e.name}.dxf`);
      expect(e.error!.message.startsWith(`${e.source}: `)).toBe(true);
    }
    expect(failed[0]!.error!.message).toMatch(/without the EOF marker: truncated\?/);
    expect(failed[1]!.error!.message).toMatch(/open ends at/);
    expect(failed[2]!.error!.message).toMatch(/binary DXF is not read/);
    // Every broken drawing has its one line on stderr, and nothing else is there.
    expect(r.stderr.trimEnd().split('\n')).toEqual(failed.map((e) => `keelson: ${e.error!.message}`));
    // Plate wh − πr² — common practice.
    const p5 = entries.find((e) => e.name === 'p005')!;
    expect(p5.properties!.A).toBeCloseTo(45 * 25 - 25 * Math.PI, 9);
    console.info(`zip: 200 drawings (3 broken) through the CLI in ${(ms / 1000).toFixed(2)} s, process start included`);
  }, 120_000);

  it('an archive that is not a ZIP is one line, exit 2', () => {
    const bad = join(dir, 'bad.zip');
    writeFileSync(bad, 'not a zip at all');
    const r = spawnSync(process.execPath, ['--import', 'tsx/esm', main, 'props', bad, '--json'], { cwd: root, encoding: 'utf8' });
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/^keelson: .*bad\.zip: not a readable ZIP archive/);
  });
});
