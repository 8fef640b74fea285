import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readDrawing } from '@keelson/dxf';
import { OPEN, PLATE, PLATE_AREA, dxf, post, rect, rectLines, renameEntry, testApp, upload, zip, form, type TestApp } from './helpers';

const close = (a: number, b: number, rel = 1e-9) => expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.abs(b));

let t: TestApp;
beforeAll(async () => {
  t = await testApp({
    maxUploadBytes: 256 * 1024,
    maxComputeDrawings: 5,
    zip: { maxEntries: 50, maxEntryBytes: 1024 * 1024, maxTotalBytes: 3 * 1024 * 1024 },
  });
});
afterAll(() => t.close());

const problem = (r: { statusCode: number; headers: Record<string, unknown>; json: () => unknown }, status: number, code: string) => {
  expect(r.headers['content-type']).toMatch(/^application\/problem\+json/);
  const p = r.json() as { status: number; code: string; type: string; title: string; detail: string; requestId: string };
  expect({ httpStatus: r.statusCode, status: p.status, code: p.code }).toEqual({ httpStatus: status, status, code });
  expect(p.type).toBe(`/docs/errors#${code}`);
  expect(p.title).toBeTruthy();
  expect(p.requestId).toBe(r.headers['x-request-id']);
  return p;
};

describe('POST /v1/compute: happy paths', () => {
  it('answers a DXF with the CLI\'s JSON shape', async () => {
    const r = await post(t.app, '/v1/compute', upload('plate.dxf', PLATE, { torsion: 'false' }));
    expect(r.statusCode).toBe(200);
    const body = r.json() as { profiles: { name: string; source: string; units: string; properties: Record<string, number>; accuracy: object; warnings: string[] }[] };
    expect(Object.keys(body)).toEqual(['profiles']);
    const [p] = body.profiles;
    expect(Object.keys(p!)).toEqual(['name', 'source', 'units', 'properties', 'accuracy', 'warnings']);
    expect(p).toMatchObject({ name: 'plate', source: 'plate.dxf', units: 'mm', warnings: [] });
    close(p!.properties.A!, PLATE_AREA); // A = bh − πr² — common practice
    expect(p!.properties.J).toBeUndefined();
  });

  it('converts to the requested unit and computes torsion by default', async () => {
    const r = await post(t.app, '/v1/compute', upload('bar.dxf', rect(100, 50), { units: 'cm' }));
    expect(r.statusCode).toBe(200);
    const p = (r.json() as { profiles: { units: string; properties: Record<string, number> }[] }).profiles[0]!;
    expect(p.units).toBe('cm');
    close(p.properties.A!, 50);
    // Rectangle w/t = 2: J = β·w·t³, β = 0.228682 — Timoshenko & Goodier, torsion of rectangular bars (in cm⁴).
    expect(Math.abs(p.properties.J! / (0.228682 * 10 * 5 ** 3) - 1)).toBeLessThan(2e-3);
  });

  it('answers a repeated upload from the store', async () => {
    const body = upload('again.dxf', rect(31, 17), { torsion: 'false' });
    const first = await post(t.app, '/v1/compute', body);
    const metrics = async () => (await t.app.inject({ method: 'GET', url: '/metrics' })).body;
    const cached = (m: string) => Number(/keelson_drawings_total\{path="compute",outcome="cached"\} (\d+)/.exec(m)?.[1] ?? 0);
    const before = cached(await metrics());
    const second = await post(t.app, '/v1/compute', body);
    expect(second.json()).toEqual(first.json());
    expect(cached(await metrics())).toBe(before + 1);
  });

  it('reads a ZIP: each drawing an entry; a refused entry is an error entry in place', async () => {
    const z = renameEntry(await zip([['a.dxf', rect(10, 20)], ['xx/evil.dxf', rect(1, 1)], ['b.dxf', OPEN], ['readme.txt', 'hi']]), 'xx/evil', '../evil');
    const r = await post(t.app, '/v1/compute', upload('cat.zip', z, { torsion: 'false' }));
    expect(r.statusCode).toBe(200);
    const entries = (r.json() as { profiles: { name: string; source: string; error?: { code: string; message: string }; properties?: { A: number } }[] }).profiles;
    expect(entries.map((e) => [e.name, e.source, e.error?.code ?? 'ok'])).toEqual([
      ['a', 'cat.zip:a.dxf', 'ok'],
      ['evil', 'cat.zip:../evil.dxf', 'BAD_ENTRY'],
      ['b', 'cat.zip:b.dxf', 'NO_CLOSED_OUTLINE'],
    ]);
    expect(entries[0]!.properties!.A).toBe(200);
    expect(entries[1]!.error!.message).toMatch(/"\.\.\/" in the name refused/);
  });

  it('splits a drawing into islands when asked', async () => {
    const two = dxf([...rectLines(0, 0, 10, 10), ...rectLines(20, 0, 10, 10)]);
    const r = await post(t.app, '/v1/compute', upload('pair.dxf', two, { split: 'islands', torsion: 'false' }));
    expect(r.statusCode).toBe(200);
    expect((r.json() as { profiles: { name: string }[] }).profiles.map((p) => p.name)).toEqual(['pair-1', 'pair-2']);
  });
});

describe('POST /v1/compute: bad uploads', () => {
  it('refuses an empty file and a missing file with 400 EMPTY_UPLOAD', async () => {
    problem(await post(t.app, '/v1/compute', upload('empty.dxf', '')), 400, 'EMPTY_UPLOAD');
    problem(await post(t.app, '/v1/compute', form([{ name: 'units', content: 'mm' }])), 400, 'EMPTY_UPLOAD');
  });

  it('refuses a file that is neither DXF nor ZIP with 415', async () => {
    const p = problem(await post(t.app, '/v1/compute', upload('photo.png', Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 1, 2, 3]))), 415, 'UNSUPPORTED_MEDIA_TYPE');
    expect(p.detail).toMatch(/^photo\.png: /);
    problem(await post(t.app, '/v1/compute', upload('notes.dxf', 'hello, this is not a drawing\n')), 415, 'UNSUPPORTED_MEDIA_TYPE');
  });

  it('refuses a body that is not multipart', async () => {
    const r = await t.app.inject({ method: 'POST', url: '/v1/compute', payload: { file: 'x' } });
    expect(r.statusCode).toBeGreaterThanOrEqual(400);
    expect(r.statusCode).toBeLessThan(500);
    expect(r.headers['content-type']).toMatch(/^application\/problem\+json/);
  });

  it('answers 413 for an upload over the limit', async () => {
    const big = PLATE + `999\n${'x'.repeat(300 * 1024)}\n`;
    const p = problem(await post(t.app, '/v1/compute', upload('big.dxf', big)), 413, 'UPLOAD_TOO_LARGE');
    expect(p.detail).toMatch(/0\.25 MiB/);
    // The service still answers afterwards: the stream was drained.
    expect((await post(t.app, '/v1/compute', upload('plate.dxf', PLATE, { torsion: 'false' }))).statusCode).toBe(200);
  });

  it('answers 400 MALFORMED_UPLOAD for a truncated multipart body', async () => {
    const whole = upload('plate.dxf', PLATE);
    const cut = { payload: whole.payload.subarray(0, whole.payload.length - 200), headers: whole.headers };
    problem(await post(t.app, '/v1/compute', cut), 400, 'MALFORMED_UPLOAD');
  });

  it('answers 422 with the CLI\'s one-line cause for a drawing that cannot be resolved', async () => {
    const p = problem(await post(t.app, '/v1/compute', upload('open.dxf', OPEN)), 422, 'UNPROCESSABLE_DRAWING');
    const cli = await readDrawing(OPEN, { file: 'open.dxf' }).catch((e: Error) => e.message);
    expect(p.detail).toBe(cli);
    expect(p.detail).not.toMatch(/\n/);
    expect((p as unknown as { drawingCode: string }).drawingCode).toBe('NO_CLOSED_OUTLINE');
    const units = problem(await post(t.app, '/v1/compute', upload('nounits.dxf', dxf(rectLines(0, 0, 2, 1), { insunits: null }))), 422, 'UNPROCESSABLE_DRAWING');
    expect(units.detail).toMatch(/^nounits\.dxf: .*unit/);
    const ok = await post(t.app, '/v1/compute', upload('nounits.dxf', dxf(rectLines(0, 0, 2, 1), { insunits: null }), { drawingUnits: 'in', torsion: 'false' }));
    expect(ok.statusCode).toBe(200);
  });

  it('refuses binary DXF as the reader does (422 BINARY_DXF)', async () => {
    const p = problem(await post(t.app, '/v1/compute', upload('bin.dxf', Buffer.from('AutoCAD Binary DXF\r\n\x1a\x00rest'))), 422, 'UNPROCESSABLE_DRAWING');
    expect((p as unknown as { drawingCode: string }).drawingCode).toBe('BINARY_DXF');
  });

  it('validates the form fields and refuses unknown ones', async () => {
    const bad = problem(await post(t.app, '/v1/compute', upload('plate.dxf', PLATE, { units: 'furlong' })), 400, 'BAD_REQUEST');
    expect(JSON.stringify(bad)).toMatch(/units/);
    problem(await post(t.app, '/v1/compute', upload('plate.dxf', PLATE, { colour: 'red' })), 400, 'BAD_REQUEST');
    problem(await post(t.app, '/v1/compute', form([{ name: 'other', filename: 'x.dxf', content: PLATE }])), 400, 'BAD_REQUEST');
  });

  it('refuses a ZIP with more drawings than /v1/compute answers (413, to /v1/jobs)', async () => {
    const z = await zip(Array.from({ length: 6 }, (_, i): [string, string] => [`d${i}.dxf`, rect(i + 1, 1)]));
    const p = problem(await post(t.app, '/v1/compute', upload('six.zip', z)), 413, 'TOO_MANY_DRAWINGS');
    expect(p.detail).toMatch(/\/v1\/jobs/);
  });

  it('stops a zip bomb: an entry inflating past its cap is refused, an archive past the total is 413', async () => {
    // 50 MiB of zeros deflate to about 50 KiB: small upload, huge output.
    const zeros = Buffer.alloc(50 * 1024 * 1024);
    const one = await zip([['bomb.dxf', zeros], ['ok.dxf', rect(3, 4)]]);
    expect(one.length).toBeLessThan(256 * 1024);
    const r = await post(t.app, '/v1/compute', upload('one.zip', one, { torsion: 'false' }));
    expect(r.statusCode).toBe(200);
    const entries = (r.json() as { profiles: { name: string; error?: { code: string } }[] }).profiles;
    expect(entries.map((e) => [e.name, e.error?.code ?? 'ok'])).toEqual([
      ['bomb', 'ENTRY_TOO_LARGE'],
      ['ok', 'ok'],
    ]);
    // Four entries of 0.9 MiB each pass the per-entry cap (1 MiB) but not the total (3 MiB).
    const many = await zip(Array.from({ length: 4 }, (_, i): [string, Buffer] => [`z${i}.dxf`, Buffer.alloc(900 * 1024, 32)]));
    problem(await post(t.app, '/v1/compute', upload('many.zip', many)), 413, 'ARCHIVE_TOO_LARGE');
  });

  it('refuses a corrupt ZIP and one without drawings with 422 BAD_ARCHIVE', async () => {
    const z = await zip([['a.dxf', rect(1, 2)]]);
    problem(await post(t.app, '/v1/compute', upload('cut.zip', z.subarray(0, 30))), 422, 'BAD_ARCHIVE');
    problem(await post(t.app, '/v1/compute', upload('docs.zip', await zip([['readme.txt', 'no drawings']]))), 422, 'BAD_ARCHIVE');
  });
});
