import { describe, expect, it } from 'vitest';
import { SectionFault, computeSection, parseManifest, runPassed, runVerification, type ComputeSection } from '../src';
import { enc, stub } from './stub';

const catalogue = (files: Record<string, string>) => ({
  name: 'cat',
  source: '/srv/cat',
  drawings: Object.entries(files).map(([path, text]) => ({ path, bytes: enc(text) })),
});

const manifest = (rows: string) => parseManifest(`id,drawing,revision,material,units,A,Ix\n${rows}`, 'manifest.csv');

describe('runVerification', () => {
  it('checks every row, computes in the row units, and adds mass per metre from the material', async () => {
    const { compute, calls } = stub();
    const run = await runVerification({
      catalogue: catalogue({ 'a.dxf': 'a', 'b.dxf': 'b' }),
      manifest: manifest('A,a.dxf,1,steel,mm,100,833.3\nB,b.dxf,2,aluminium,cm,1.00,0.09\n'),
      codeVersion: 'v1',
      compute,
    });
    expect(calls.map((c) => [c.source, c.units])).toEqual([['a.dxf', 'mm'], ['b.dxf', 'cm']]);
    expect(run.profiles.map((p) => [p.id, p.status])).toEqual([['A', 'pass'], ['B', 'fail']]);
    // 100 mm² of steel: 100e-6 m² × 7850 kg/m³ = 0.785 kg/m (EN 1991-1-1 Table A.4 density).
    expect(run.profiles[0]!.values.m).toBeCloseTo(0.785, 12);
    expect(run.profiles[1]!.values.m).toBeCloseTo(0.27, 12);
    expect(run.profiles[1]!.checks.filter((c) => !c.pass).map((c) => c.key)).toEqual(['Ix']);
    expect(run.summary).toEqual({ profiles: 2, pass: 1, fail: 1, error: 0, missing: 0, unlisted: 0, checks: 4, checksFailed: 1 });
    expect(runPassed(run)).toBe(false);
    expect(run.materials).toEqual({ steel: expect.objectContaining({ density: 7850 }), aluminium: expect.objectContaining({ density: 2700 }) });
    expect(run.profiles[0]!.drawingHash).toMatch(/^[0-9a-f]{64}$/);
  });

  it('reports rows without a drawing, drawings without a row, and drawings at fault, without stopping', async () => {
    const { compute } = stub();
    const run = await runVerification({
      catalogue: {
        ...catalogue({ 'sub/A.dxf': 'a', 'bad.dxf': 'broken', 'extra.dxf': 'x' }),
        drawings: [
          ...catalogue({ 'sub/A.dxf': 'a', 'bad.dxf': 'broken', 'extra.dxf': 'x' }).drawings,
          { path: 'zipped.dxf', error: 'inflates to more than 67108864 bytes' },
        ],
      },
      manifest: manifest('A,sub/a.dxf,,steel,mm,100,\nB,bad.dxf,,steel,mm,100,\nC,gone.dxf,,steel,mm,100,\nD,zipped.dxf,,steel,mm,,\n'),
      codeVersion: 'v1',
      compute,
    });
    expect(run.profiles.map((p) => [p.id, p.status, p.fault?.code])).toEqual([
      ['A', 'missing', 'MISSING_DRAWING'],
      ['B', 'error', 'NOT_DXF'],
      ['C', 'missing', 'MISSING_DRAWING'],
      ['D', 'error', 'ARCHIVE_ENTRY'],
    ]);
    expect(run.profiles[0]!.fault!.message).toBe('sub/a.dxf: no such drawing in the catalogue; the catalogue has "sub/A.dxf" (letter case differs)');
    expect(run.profiles[1]!.fault!.message).toMatch(/^bad\.dxf: not a DXF file/);
    expect(run.unlisted.map((u) => u.drawing)).toEqual(['sub/A.dxf', 'extra.dxf']);
    expect(run.summary).toMatchObject({ profiles: 4, pass: 0, error: 2, missing: 2, unlisted: 2 });
  });

  it('records a fault reported by a computation elsewhere (a service thread) with its code', async () => {
    const compute: ComputeSection = async (_b, o) => {
      throw new SectionFault('DRAWING_TIMEOUT', `${o.source}: computing took longer than 60 s`);
    };
    const run = await runVerification({ catalogue: catalogue({ 'a.dxf': 'a' }), manifest: manifest('A,a.dxf,,steel,mm,1,\n'), codeVersion: 'v1', compute });
    expect(run.profiles[0]).toMatchObject({ status: 'error', fault: { code: 'DRAWING_TIMEOUT', message: 'a.dxf: computing took longer than 60 s' } });
  });

  it('records an internal fault against its profile alone', async () => {
    const compute: ComputeSection = async () => {
      throw new TypeError('x is undefined');
    };
    const run = await runVerification({ catalogue: catalogue({ 'a.dxf': 'a' }), manifest: manifest('A,a.dxf,,steel,mm,1,\n'), codeVersion: 'v1', compute });
    expect(run.profiles[0]!.fault).toEqual({ code: 'INTERNAL', message: 'a.dxf: internal error: x is undefined' });
  });

  it('resolves drawings relative to the manifest folder and refuses paths leaving the catalogue', async () => {
    const { compute } = stub();
    const cat = catalogue({ 'sheets/a.dxf': 'a' });
    const ok = await runVerification({ catalogue: cat, manifest: manifest('A,../sheets/a.dxf,,steel,mm,100,\n'), manifestDir: 'lists', codeVersion: 'v1', compute });
    expect(ok.profiles[0]!.status).toBe('pass');
    await expect(runVerification({ catalogue: cat, manifest: manifest('A,../../a.dxf,,steel,mm,100,\n'), manifestDir: 'lists', codeVersion: 'v1', compute })).rejects.toMatchObject({
      code: 'BAD_DRAWING_PATH',
    });
  });

  it('reuses the previous run for unchanged drawings (same bytes, units, code) and still checks every row', async () => {
    const { compute, calls } = stub();
    const files = { 'a.dxf': 'a', 'b.dxf': 'b' };
    const rows = 'A,a.dxf,,steel,mm,100,\nB,b.dxf,,steel,mm,100,\n';
    const first = await runVerification({ catalogue: catalogue(files), manifest: manifest(rows), codeVersion: 'v1', compute });
    expect(calls).toHaveLength(2);
    // b.dxf changes; the manifest now publishes a wrong area for the unchanged A.
    const second = await runVerification({
      catalogue: catalogue({ ...files, 'b.dxf': 'b, revised' }),
      manifest: manifest('A,a.dxf,,steel,mm,90,\nB,b.dxf,,aluminium,mm,100,\n'),
      codeVersion: 'v1',
      previous: first,
      compute,
    });
    expect(calls.map((c) => c.source)).toEqual(['a.dxf', 'b.dxf', 'b.dxf']);
    expect(second.profiles.map((p) => [p.id, p.reused, p.status])).toEqual([['A', true, 'fail'], ['B', false, 'pass']]);
    // A new code version computes everything again.
    await runVerification({ catalogue: catalogue(files), manifest: manifest(rows), codeVersion: 'v2', previous: second, compute });
    expect(calls).toHaveLength(5);
  });

  it('computes a drawing shared by two rows in the same units once', async () => {
    const { compute, calls } = stub();
    const run = await runVerification({ catalogue: catalogue({ 'a.dxf': 'a' }), manifest: manifest('A-AL,a.dxf,,aluminium,mm,100,\nA-ST,a.dxf,,steel,mm,100,\n'), codeVersion: 'v1', compute });
    expect(calls).toHaveLength(1);
    expect(run.profiles.map((p) => p.values.m)).toEqual([expect.closeTo(0.27, 12), expect.closeTo(0.785, 12)]);
  });

  it('reports progress row by row', async () => {
    const { compute } = stub();
    const seen: string[] = [];
    await runVerification({ catalogue: catalogue({ 'a.dxf': 'a' }), manifest: manifest('A,a.dxf,,steel,mm,,\nB,b.dxf,,steel,mm,,\n'), codeVersion: 'v1', compute, onProgress: (p) => seen.push(`${p.done}/${p.total} ${p.id}`) });
    expect(seen).toEqual(['1/2 A', '2/2 B']);
  });

  it('computes a real drawing with its outline in the row units', async () => {
    // Plate 100 × 50 mm drawn as one closed LWPOLYLINE, $INSUNITS 4 (mm).
    const dxf = ['0', 'SECTION', '2', 'HEADER', '9', '$INSUNITS', '70', '4', '0', 'ENDSEC', '0', 'SECTION', '2', 'ENTITIES', '0', 'LWPOLYLINE', '8', '0', '90', '4', '70', '1', '10', '0', '20', '0', '10', '100', '20', '0', '10', '100', '20', '50', '10', '0', '20', '50', '0', 'ENDSEC', '0', 'EOF', ''].join('\n');
    const s = await computeSection(enc(dxf), { name: 'plate', source: 'plate.dxf', units: 'cm' });
    // A = bh = 50 cm²; Ix = bh³/12 = 10·5³/12 cm⁴ — common practice.
    expect(s.profile.properties.A).toBeCloseTo(50, 9);
    expect(s.profile.properties.Ix).toBeCloseTo(1250 / 12, 9);
    expect(s.outline.box).toEqual({ xmin: 0, ymin: 0, xmax: 10, ymax: 5 });
    expect(s.outline.d).toBe('M0 0L10 0L10 5L0 5Z');
  });
});
