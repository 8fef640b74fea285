import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { writeDxfDrawing, type DxfEntity } from '@keelson/dxf';
import { UsageError, parseArgs } from '../src/args';
import { run } from '../src/cli';

const fixtures = join(import.meta.dirname, '..', '..', '..', 'fixtures', 'import');
const fixture = (name: string) => join(fixtures, `${name}.dxf`);

interface Entry {
  name: string;
  units?: string;
  properties?: Record<string, number>;
  accuracy?: Record<string, number>;
  warnings?: string[];
  error?: { code: string; message: string };
}

/** The whole CLI in this process: exit code, stdout, stderr lines. */
async function keelson(...argv: string[]) {
  let out = '';
  const err: string[] = [];
  const code = await run(argv, { out: (t) => (out += t), err: (l) => err.push(l), debug: false });
  return { code, out, err };
}

/** JSON of the read profiles (torsion, finite elements, is not what these tests are about). */
async function json(...argv: string[]) {
  const r = await keelson(...argv, '--json', '--no-torsion');
  return { ...r, entries: r.out ? (JSON.parse(r.out) as { profiles: Entry[] }).profiles : [] };
}

describe('options of keelson props', () => {
  it('--split blocks | layers | islands: one profile each, named after the block, the layer, or the file and an index', async () => {
    const names = async (mode: string) => (await json('props', fixture('split-sheet'), '--split', mode)).entries.map((e) => e.name);
    expect(await names('none')).toEqual(['split-sheet']);
    expect(await names('blocks')).toEqual(['RECT', 'ROUND', 'RECT-2', 'split-sheet']);
    expect(await names('layers')).toEqual(['RECTS', 'ROUNDS', 'LOOSE']);
    expect(await names('islands')).toEqual(['split-sheet-1', 'split-sheet-2', 'split-sheet-3', 'split-sheet-4']);
  });

  it('--layers and --exclude-layers take comma-separated patterns; --hidden-layers reads frozen and off layers too', async () => {
    // Plate 100 × 60 with a hole r = 15 on layer HOLES — common practice.
    const A = async (...opts: string[]) => (await json('props', fixture('hole-on-other-layer'), ...opts)).entries[0]!.properties?.A;
    expect(await A()).toBeCloseTo(6000 - 225 * Math.PI, 9);
    expect(await A('--exclude-layers', 'HOLES,DIM*')).toBeCloseTo(6000, 9);
    expect(await A('--layers=profile')).toBeCloseTo(6000, 9);
    const hidden = await keelson('props', fixture('hole-on-other-layer'), '--hidden-layers');
    expect(hidden.code).toBe(2);
    expect(hidden.err[0]).toMatch(/open outline: 4 open ends/);
  });

  it('--join-tolerance closes gaps the default leaves open; the accuracy widens to the gap', async () => {
    const open = await keelson('props', fixture('rectangle-lines-open-gaps'));
    expect(open.code).toBe(2);
    expect(open.err).toHaveLength(1);
    expect(open.err[0]).toMatch(/8 open ends at .*0\.8 mm apart, the join tolerance is 0\.00012 mm \(--join-tolerance\)/);
    const closed = await json('props', fixture('rectangle-lines-open-gaps'), '--join-tolerance', '1');
    expect(closed.code).toBe(0);
    const e = closed.entries[0]!;
    // The rectangle is 120 × 80 = 9600 mm² (common practice) up to the gaps closed (0.8 mm at four corners).
    expect(Math.abs(e.properties!.A! / 9600 - 1)).toBeLessThanOrEqual(e.accuracy!.A!);
    expect(e.accuracy!.A!).toBeGreaterThan(1e-4);
    expect(e.accuracy!.xpna).toBeUndefined();
    expect(e.warnings!.join()).toMatch(/closed gaps between segment ends up to 0\.8 mm/);
  });

  it('a split drawing with one broken profile: its entry carries the error, the others print, exit 2', async () => {
    const square = (x: number): DxfEntity => ({ type: 'LWPOLYLINE', vertices: [[x, 0], [x + 10, 0], [x + 10, 10], [x, 10]].map(([vx, vy]) => ({ x: vx!, y: vy!, bulge: 0 })) });
    const file = join(mkdtempSync(join(tmpdir(), 'keelson-split-')), 'sheet.dxf');
    writeFileSync(
      file,
      writeDxfDrawing({
        unit: 'mm',
        blocks: [
          { name: 'GOOD', entities: [square(0)] },
          { name: 'BROKEN', entities: [{ type: 'LINE', a: { x: 0, y: 0 }, b: { x: 10, y: 0 } }] },
        ],
        entities: [
          { type: 'INSERT', block: 'GOOD', at: { x: 0, y: 0 } },
          { type: 'INSERT', block: 'BROKEN', at: { x: 50, y: 0 } },
        ],
      }),
    );
    const r = await json('props', file, '--split', 'blocks');
    expect(r.code).toBe(2);
    expect(r.entries.map((e) => [e.name, e.error?.code])).toEqual([
      ['GOOD', undefined],
      ['BROKEN', 'NO_CLOSED_OUTLINE'],
    ]);
    expect(r.entries[1]!.error!.message).toMatch(/sheet\.dxf: BROKEN: no closed outline: 2 open ends at \(50, 0\) on LINE .* in block BROKEN/);
    expect(r.err).toEqual([`keelson: ${r.entries[1]!.error!.message}`]);
  });

  it('exact drawings keep the closed-form bound on every key', async () => {
    const e = (await json('props', fixture('plate-rotated-scaled-insert'))).entries[0]!;
    expect(Object.values(e.accuracy!).every((v) => v === 1e-10)).toBe(true);
    expect(e.accuracy!.xpna).toBe(1e-10);
  });
});

describe('parseArgs: the import options', () => {
  it('reads them in either form', () => {
    expect(parseArgs(['props', 'a.dxf', '--split=blocks', '--layers', 'A, B*', '--exclude-layers=DIM', '--hidden-layers', '--join-tolerance', '0.01'])).toMatchObject({
      split: 'blocks',
      layers: ['A', 'B*'],
      excludeLayers: ['DIM'],
      hiddenLayers: true,
      joinTolerance: 0.01,
    });
  });

  it.each([
    [['props', 'a', '--split', 'parts'], /--split must be none, blocks, layers, islands, not "parts"/],
    [['props', 'a', '--join-tolerance', '-1'], /--join-tolerance must be a positive length/],
    [['props', 'a', '--join-tolerance', 'x'], /--join-tolerance must be a positive length/],
    [['props', 'a', '--hidden-layers=yes'], /takes no value/],
    [['props', 'a', '--layers'], /--layers needs a value/],
    [['props', 'a', '--torsion-target', '0'], /--torsion-target must be a relative error/],
    [['props', 'a', '--torsion-target', '1e-3', '--no-torsion'], /exclude each other/],
  ])('%j is a usage error', (argv, msg) => {
    expect(() => parseArgs(argv)).toThrow(UsageError);
    expect(() => parseArgs(argv)).toThrow(msg);
  });
});
