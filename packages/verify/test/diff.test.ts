import { describe, expect, it } from 'vitest';
import { diffIsEmpty, diffRuns, parseManifest, runVerification, type RunRecord } from '../src';
import { enc, stub } from './stub';

async function run(files: Record<string, string>, rows: string, opts: { name?: string; code?: string } = {}): Promise<RunRecord> {
  return runVerification({
    catalogue: { name: opts.name ?? 'cat', source: '/srv/cat', drawings: Object.entries(files).map(([path, t]) => ({ path, bytes: enc(t) })) },
    manifest: parseManifest(`id,drawing,revision,material,units,A,Ix\n${rows}`, 'manifest.csv'),
    codeVersion: opts.code ?? 'v1',
    compute: stub().compute,
  });
}

describe('diffRuns', () => {
  it('finds nothing between two runs of the same inputs', async () => {
    const rows = 'A,a.dxf,,steel,mm,100,\n';
    const d = diffRuns(await run({ 'a.dxf': 'a' }, rows), await run({ 'a.dxf': 'a' }, rows));
    expect(diffIsEmpty(d)).toBe(true);
    expect(d.codeChanged).toBe(false);
    expect(d.manifestChanged).toBe(false);
  });

  it('lists profiles added and removed, new failures and fixed ones', async () => {
    const before = await run({ 'a.dxf': 'a', 'b.dxf': 'b' }, 'A,a.dxf,,steel,mm,100,\nB,b.dxf,,steel,mm,90,\nR,b.dxf,,steel,mm,,\n');
    const after = await run({ 'a.dxf': 'a', 'b.dxf': 'b' }, 'A,a.dxf,,steel,mm,90,\nB,b.dxf,,steel,mm,100,\nN,n.dxf,,steel,mm,,\n');
    const d = diffRuns(before, after);
    expect(d.added).toEqual([{ id: 'N', drawing: 'n.dxf' }]);
    expect(d.removed).toEqual([{ id: 'R', drawing: 'b.dxf' }]);
    expect(d.newFailures).toEqual([{ id: 'A', key: 'A', status: 'fail' }, { id: 'N', key: null, status: 'missing' }]);
    expect(d.fixed).toEqual([{ id: 'B', key: 'A', status: 'fail' }]);
    expect(d.manifestChanged).toBe(true);
    expect(d.drawingsChanged).toEqual([]);
    expect(d.moved).toEqual([]);
  });

  it('compares values across a change of units', async () => {
    const mm = await run({ 'a.dxf': 'a' }, 'A,a.dxf,,steel,mm,,\n');
    const cm = await run({ 'a.dxf': 'a' }, 'A,a.dxf,,steel,cm,,\n');
    // The stub sets the non-scaling properties to 1 in either unit: those move; A, Ix, J and m do not.
    const moved = diffRuns(mm, cm).moved.map((m) => m.key);
    for (const k of ['m', 'A', 'Ix', 'J']) expect(moved).not.toContain(k);
    expect(moved).toContain('Iy');
  });

  it('names a drawing that changed even when no value moved beyond tolerance', async () => {
    const d = diffRuns(await run({ 'a.dxf': 'a' }, 'A,a.dxf,,steel,mm,,\n'), await run({ 'a.dxf': 'a, re-saved' }, 'A,a.dxf,,steel,mm,,\n', { code: 'v2' }));
    expect(d.drawingsChanged).toEqual([{ id: 'A', drawing: 'a.dxf', from: expect.any(String), to: expect.any(String) }]);
    expect(d.moved).toEqual([]);
    expect(d.codeChanged).toBe(true);
  });

  it('refuses runs of different catalogues', async () => {
    const rows = 'A,a.dxf,,steel,mm,,\n';
    const a = await run({ 'a.dxf': 'a' }, rows);
    const b = await run({ 'a.dxf': 'a' }, rows, { name: 'other' });
    expect(() => diffRuns(a, b)).toThrow(/different catalogues/);
  });
});
