import { describe, expect, it } from 'vitest';
import { REPORT_CAUTION, VERIFY_KEYS, diffRuns, parseCsv, parseManifest, renderHtmlReport, runCompletedPayload, runVerification, verificationCsv, verificationJson, type RunRecord } from '../src';
import { enc, stub } from './stub';

async function sampleRun(files: Record<string, string>, rows: string, previous?: RunRecord): Promise<RunRecord> {
  const { compute } = stub();
  return runVerification({
    catalogue: { name: 'cat', source: '/srv/cat', drawings: Object.entries(files).map(([path, t]) => ({ path, bytes: enc(t) })) },
    manifest: parseManifest(`id,drawing,revision,material,units,description,A,Ix,Ix_tol\n${rows}`, 'manifest.csv'),
    codeVersion: 'v1',
    compute,
    previous,
    now: () => new Date('2026-03-02T02:00:00Z'),
    runId: previous ? 'run-2' : 'run-1',
  });
}

const ROWS = 'OK-1,ok.dxf,A,steel,mm,Plate <b>,100,833.3,0.5%\nBAD-1,bad.dxf,B,aluminium,cm,,1.00,0.1,\nGONE,gone.dxf,,steel,mm,,100,,\n';
const FILES = { 'ok.dxf': 'a', 'bad.dxf': 'b', 'extra.dxf': 'c' };

describe('HTML report', () => {
  it('states summary counts, lists failures first, carries the caution, and escapes user text', async () => {
    const html = renderHtmlReport(await sampleRun(FILES, ROWS));
    expect(html.startsWith('<!doctype html>')).toBe(true);
    expect(html).toContain(REPORT_CAUTION);
    expect(html).toMatch(/<th>Profiles<\/th>.*<td class="n ">3<\/td><td class="n pass">1<\/td><td class="n fail">1<\/td>/s);
    const order = [...html.matchAll(/<article id="[^"]+" class="status-(\w+)">/g)].map((m) => m[1]);
    expect(order).toEqual(['missing', 'fail', 'pass']);
    expect(html).toContain('Plate &lt;b&gt;');
    expect(html).not.toContain('Plate <b>');
    expect(html).toContain('<code>extra.dxf</code>');
    expect(html).not.toMatch(/<script|https?:\/\/(?!www\.w3\.org)/);
    // The property table states units; the failed row is marked.
    expect(html).toMatch(/<tr class="failed"><td>Second moment about x<\/td><td class="k">Ix<\/td><td>cm⁴<\/td>/);
    expect(html).toContain('<svg xmlns="http://www.w3.org/2000/svg" class="section"');
  });

  it('shows the changes since a previous run when given a diff', async () => {
    const a = await sampleRun(FILES, ROWS);
    const b = await sampleRun({ ...FILES, 'ok.dxf': 'a2' }, ROWS, a);
    const html = renderHtmlReport(b, { diff: diffRuns(a, b) });
    expect(html).toMatch(/<h3>Since run run-1<\/h3>\s*<p>Profiles added: 0; removed: 0; drawings changed: 1/);
  });
});

describe('CSV export', () => {
  it('has stable column names with units in the header, one row per profile, values in one unit', async () => {
    const csv = verificationCsv(await sampleRun(FILES, ROWS), 'mm');
    const [header, ...rows] = parseCsv(csv, 'x.csv').map((r) => r.cells);
    expect(header!.slice(0, 9)).toEqual(['run_id', 'profile_id', 'drawing', 'revision', 'material', 'status', 'failed_properties', 'fault', 'drawing_sha256']);
    expect(header!.slice(9, 15)).toEqual(['m [kg/m]', 'm published [kg/m]', 'm pass', 'A [mm²]', 'A published [mm²]', 'A pass']);
    expect(header).toContain('Cw [mm⁶]');
    expect(header).toHaveLength(9 + 3 * VERIFY_KEYS.length);
    expect(rows.map((r) => [r[1], r[5], r[6]])).toEqual([['OK-1', 'pass', ''], ['BAD-1', 'fail', 'Ix'], ['GONE', 'missing', '']]);
    // BAD-1 was computed and published in cm: exported in mm (1.00 cm² = 100 mm²).
    const col = (name: string) => header!.indexOf(name);
    expect(Number(rows[1]![col('A [mm²]')])).toBeCloseTo(100, 9);
    expect(Number(rows[1]![col('A published [mm²]')])).toBeCloseTo(100, 9);
    expect(rows[1]![col('A pass')]).toBe('true');
    expect(rows[2]![col('fault')]).toBe('MISSING_DRAWING: gone.dxf: no such drawing in the catalogue');
  });
});

describe('JSON export', () => {
  it('gives each value with its unit and, where published, the check', async () => {
    const doc = JSON.parse(verificationJson(await sampleRun(FILES, ROWS)));
    expect(doc.schema).toBe('keelson.verification-export/1');
    expect(doc.caution).toBe(REPORT_CAUTION);
    expect(doc.run).toEqual({ id: 'run-1', catalogue: { name: 'cat', source: '/srv/cat' }, startedAt: '2026-03-02T02:00:00.000Z', finishedAt: '2026-03-02T02:00:00.000Z', codeVersion: 'v1', manifest: { source: 'manifest.csv', hash: expect.any(String) } });
    const [ok, bad] = doc.profiles;
    expect(ok.properties.A).toEqual({ value: 100, unit: 'mm²', published: 100, difference: 0, tolerance: '1 %', pass: true });
    expect(ok.properties.Ix.tolerance).toBe('0.5 %');
    expect(ok.properties.P).toEqual({ value: 1, unit: 'mm' });
    expect(bad.properties.Ix).toMatchObject({ unit: 'cm⁴', published: 0.1, pass: false });
    expect(doc.unlisted).toEqual([{ drawing: 'extra.dxf', hash: expect.stringMatching(/^[0-9a-f]{64}$/) }]);
  });
});

describe('webhook payload', () => {
  it('names the run, pass/fail, the profiles needing attention and the changes', async () => {
    const a = await sampleRun(FILES, ROWS);
    const b = await sampleRun({ ...FILES, 'ok.dxf': 'a2' }, ROWS, a);
    const p = runCompletedPayload(b, { diff: diffRuns(a, b), reportUrl: 'http://127.0.0.1:8080/v1/runs/run-2/report' });
    expect(p).toMatchObject({
      event: 'verification.completed',
      run: { id: 'run-2', catalogue: 'cat' },
      passed: false,
      attention: [
        { id: 'BAD-1', status: 'fail', failed: ['Ix'], fault: null },
        { id: 'GONE', status: 'missing', failed: [], fault: 'MISSING_DRAWING' },
      ],
      changes: { since: 'run-1', drawingsChanged: ['OK-1'], moved: [], empty: false },
      reportUrl: 'http://127.0.0.1:8080/v1/runs/run-2/report',
    });
  });
});
