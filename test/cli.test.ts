import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PROPERTY_DIMENSION } from '@keelson/geometry';
import { CIRCLE, LINE, dxf, rectLines, type Tag } from '../packages/dxf/test/dxf';

const root = join(import.meta.dirname, '..');
const main = join(root, 'services/cli/src/main.ts');

/**
 * Runs the CLI's entry under tsx's ESM loader, as `pnpm keelson` does minus the package manager.
 * Measured on the 2-core dev box, idle: `node --import tsx/esm main.ts` 0.5 s, `--import tsx` 0.65 s,
 * `npx tsx main.ts` 1.8 s (npx, then a second node). Almost all of it is tsx starting up.
 */
function keelson(...args: string[]) {
  const t0 = performance.now();
  const r = spawnSync(process.execPath, ['--import', 'tsx/esm', main, ...args], { cwd: root, encoding: 'utf8', env: { ...process.env, KEELSON_DEBUG: '' } });
  return { code: r.status, out: r.stdout, err: r.stderr, ms: performance.now() - t0 };
}

/** Wall time of a run, retried once if over the limit: other test files share the CPU with this one. */
function timed(args: string[], limitMs: number) {
  const r = keelson(...args);
  return r.ms < limitMs ? r : keelson(...args);
}

let dir = '';
const file = (name: string, content: string | Buffer) => {
  const p = join(dir, name);
  writeFileSync(p, content);
  return p;
};

// Plate 100 × 50 mm with a centred hole of diameter 20.
const good = dxf([...rectLines(0, 0, 100, 50), CIRCLE([50, 25], 10)]);

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'keelson-cli-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('keelson props on a good drawing', () => {
  it('prints a table with units and the caution line, exit 0', () => {
    const r = keelson('props', file('plate.dxf', good));
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^plate {2}\(.*plate\.dxf, mm\)$/m);
    // Area bh − πr² = 5000 − 100π = 4686 mm² — common practice.
    expect(r.out).toMatch(/^ {2}Area +A +4686 +mm²$/m);
    for (const key of ['A', 'P', 'cx', 'cy', 'Ix', 'Iy', 'Ixy', 'I1', 'I2', 'theta', 'rx', 'ry', 'Sx', 'Sy', 'Zx', 'Zy'])
      expect(r.out, key).toMatch(new RegExp(`^ {2}.* ${key} +\\S+ +(mm|mm²|mm³|mm⁴|deg)$`, 'm'));
    expect(r.out.trimEnd().split('\n').at(-1)).toBe(
      'Computed geometric properties only; structural adequacy must be checked by a licensed engineer under local codes.',
    );
  });

  it('--json has exactly the contract shape', () => {
    const r = keelson('props', file('plate.dxf', good), '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out) as { profiles: Record<string, unknown>[] };
    expect(Object.keys(j)).toEqual(['profiles']);
    expect(j.profiles).toHaveLength(1);
    const p = j.profiles[0]!;
    expect(Object.keys(p)).toEqual(['name', 'source', 'units', 'properties', 'accuracy', 'warnings']);
    expect(p).toMatchObject({ name: 'plate', source: join(dir, 'plate.dxf'), units: 'mm', warnings: [] });
    const props = p.properties as Record<string, number>;
    expect(Object.keys(props)).toEqual([...Object.keys(PROPERTY_DIMENSION), 'J', 'Cw', 'xs', 'ys']);
    // Rectangle minus circle: A = bh − πr², Ix = bh³/12 − πr⁴/4 — Gere & Goodno, Appendix D (cases 1 and 9).
    expect(props.A).toBeCloseTo(5000 - 100 * Math.PI, 9);
    expect(props.Ix! / ((100 * 50 ** 3) / 12 - (Math.PI * 10 ** 4) / 4)).toBeCloseTo(1, 12);
    expect(props.cx).toBeCloseTo(50, 12);
    const { J, Cw, ...exact } = p.accuracy as Record<string, number>;
    expect(Object.values(exact).every((v) => v === 1e-10)).toBe(true);
    expect(Object.keys(exact)).toContain('Zx');
    // Finite-element torsion at the default target: the stated error is below 1e-3 (issue 4's default).
    expect(J).toBeLessThanOrEqual(1e-3);
    expect(Cw).toBeLessThanOrEqual(1e-2);
    // Doubly symmetric plate: the shear centre is the centroid — Gere & Goodno, shear centres; exact by symmetry.
    expect(props.xs).toBe(50);
    expect(props.ys).toBe(25);
  });

  it('--csv: one header row with units, one row per profile; --units converts', () => {
    const r = keelson('props', file('plate.dxf', good), '--csv', '--units', 'cm');
    expect(r.code).toBe(0);
    const [header, row, ...rest] = r.out.trimEnd().split('\n');
    expect(rest).toEqual([]);
    expect(header!.startsWith('name,source,units,A [cm²],P [cm],cx [cm],cy [cm]')).toBe(true);
    expect(header).toContain('Ix [cm⁴]');
    expect(header).toContain('theta [deg]');
    const cells = row!.split(',');
    expect(cells.slice(0, 1).concat(cells[2]!)).toEqual(['plate', 'cm']);
    // 1 cm² = 100 mm² (SI): (5000 − 100π) mm² = 50 − π cm².
    expect(Number(cells[3])).toBeCloseTo(50 - Math.PI, 10);
  });

  it('a folder: every *.dxf in name order, a bad one reported and the rest printed, exit 2', () => {
    const folder = join(dir, 'catalogue');
    mkdirSync(folder, { recursive: true });
    writeFileSync(join(folder, 'b-plate.dxf'), good);
    writeFileSync(join(folder, 'a-square.DXF'), dxf(rectLines(0, 0, 10, 10)));
    writeFileSync(join(folder, 'c-broken.dxf'), dxf([LINE([0, 0], [1, 0])]));
    writeFileSync(join(folder, 'notes.txt'), 'not a drawing');
    const r = keelson('props', folder, '--json');
    expect(r.code).toBe(2);
    expect(r.err.trimEnd().split('\n')).toEqual([expect.stringMatching(/^keelson: .*c-broken\.dxf: no closed outline: 2 open ends/)]);
    const entries = (JSON.parse(r.out) as { profiles: { name: string; error?: { code: string; message: string } }[] }).profiles;
    expect(entries.map((p) => p.name)).toEqual(['a-square', 'b-plate', 'c-broken']);
    // The broken drawing's entry carries its error in place of properties.
    expect(entries[2]!.error).toEqual({ code: 'NO_CLOSED_OUTLINE', message: expect.stringMatching(/c-broken\.dxf: no closed outline: 2 open ends/) });
  });

  it('--drawing-units reads a drawing without $INSUNITS; feet are reported in inches', () => {
    const unitless = file('unitless.dxf', dxf(rectLines(0, 0, 2, 1), { insunits: null }));
    const r = keelson('props', unitless, '--drawing-units', 'ft', '--json');
    expect(r.code).toBe(0);
    const p = (JSON.parse(r.out) as { profiles: { units: string; properties: { A: number } }[] }).profiles[0]!;
    // 2 ft² = 2·144 in² (1 ft = 12 in).
    expect(p.units).toBe('in');
    expect(p.properties.A).toBeCloseTo(288, 9);
  });
});

describe('keelson props on bad input: exit 2, one line naming the file and the cause, fast', () => {
  const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
  const cutAt = good.indexOf('LINE', good.indexOf('ENTITIES')) + 40;
  const nan: Tag[] = LINE([0, 50], [0, 0]).map(([c, v]): Tag => (c === 20 ? [20, 'nan'] : [c, v]));
  const inf: Tag[] = LINE([0, 50], [0, 0]).map(([c, v]): Tag => (c === 11 ? [11, '-1e400'] : [c, v]));
  const cases: [name: string, content: string | Buffer, cause: RegExp][] = [
    ['empty.dxf', '', /file is empty/],
    ['image.dxf', png, /not a DXF file/],
    ['letter.dxf', 'Dear colleague,\nplease find the section attached.\n', /not a DXF file: it starts with "Dear colleague,"/],
    ['truncated.dxf', good.slice(0, cutAt), /file ends at line \d+ inside the ENTITIES section without the EOF marker/],
    ['lone-line.dxf', dxf([LINE([0, 0], [10, 0])]), /no closed outline: 2 open ends at \(0, 0\)/],
    ['nan.dxf', dxf([...rectLines(0, 0, 100, 50).slice(0, 3), nan]), /LINE \(handle \w+, layer 0, line \d+\): group 20 at line \d+ is "nan", not a finite number/],
    ['infinite.dxf', dxf([...rectLines(0, 0, 100, 50).slice(0, 3), inf]), /LINE \(.*\): group 11 at line \d+ is "-1e400", not a finite number/],
    ['miles.dxf', dxf(rectLines(0, 0, 1, 1), { insunits: 3 }), /unsupported unit \$INSUNITS 3 \(miles\)/],
    ['unit-99.dxf', dxf(rectLines(0, 0, 1, 1), { insunits: 99 }), /unsupported unit \$INSUNITS 99/],
    ['unitless.dxf', dxf(rectLines(0, 0, 1, 1), { insunits: null }), /no \$INSUNITS in the header; pass --drawing-units/],
    ['missing.dxf', '', /no such file or folder/],
  ];
  for (const [name, content, cause] of cases)
    it(name, () => {
      const p = join(dir, 'bad', name);
      mkdirSync(join(dir, 'bad'), { recursive: true });
      if (name !== 'missing.dxf') writeFileSync(p, content);
      const r = timed(['props', p], 2000);
      expect(r.code).toBe(2);
      expect(r.out).toBe('');
      const lines = r.err.split('\n').filter(Boolean);
      expect(lines).toHaveLength(1);
      expect(lines[0]!.startsWith(`keelson: ${p}: `)).toBe(true);
      expect(lines[0]).toMatch(cause);
      expect(r.err).not.toMatch(/^\s+at /m);
      expect(r.ms).toBeLessThan(2000);
    });

  it('usage errors: one line, exit 2', () => {
    for (const args of [[], ['props'], ['props', 'x.dxf', '--units', 'ft'], ['props', 'x.dxf', '--frobnicate'], ['explode']]) {
      const r = keelson(...args);
      expect(r.code, args.join(' ')).toBe(2);
      expect(r.err.split('\n').filter(Boolean), args.join(' ')).toHaveLength(1);
      expect(r.err).toMatch(/^keelson: /);
    }
  });
});

describe('the demo catalogue', () => {
  it('pnpm start prints every profile of fixtures/demo', () => {
    const r = keelson('props', 'fixtures/demo');
    expect(r.code).toBe(0);
    const files = readdirSync(join(root, 'fixtures/demo')).filter((f) => f.endsWith('.dxf')).sort();
    const names = [...r.out.matchAll(/^(\S+) {2}\(/gm)].map((m) => m[1]);
    expect(names).toEqual(files.map((f) => f.replace(/\.dxf$/, '')));
  });
});
