import { describe, expect, it } from 'vitest';
import { DXF_ERROR_CODES, DxfError, readDrawing, type DxfErrorCode } from '../src';
import { CIRCLE, LINE, LWPOLYLINE, dxf, rectLines, type Tag } from './dxf';

const seen = new Set<DxfErrorCode>();

/** Reads `text` as bad.dxf and returns the DxfError, checking it is one line naming the file. */
async function fault(text: string, opts: { timeoutMs?: number; maxMemoryMb?: number; maxBytes?: number } = {}): Promise<DxfError> {
  const e = await readDrawing(text, { file: 'bad.dxf', ...opts }).then(
    () => expect.fail('expected a DxfError'),
    (err: unknown) => err,
  );
  expect(e).toBeInstanceOf(DxfError);
  const d = e as DxfError;
  expect(d.message).not.toMatch(/[\r\n]/);
  expect(d.message.startsWith('bad.dxf: ')).toBe(true);
  seen.add(d.code);
  return d;
}

const good = dxf(rectLines(0, 0, 10, 5));

describe('bad input gives a DxfError with a stable code and one line naming the file', () => {
  it('EMPTY_FILE', async () => {
    expect((await fault('')).code).toBe('EMPTY_FILE');
    expect((await fault(' \n\r\n ')).code).toBe('EMPTY_FILE');
  });

  it('NOT_DXF: an image, plain text', async () => {
    const png = String.fromCharCode(0x89) + 'PNG\r\n\x1a\n\0\0\0\rIHDR';
    expect(await fault(png)).toMatchObject({ code: 'NOT_DXF', message: /not a DXF file/ });
    expect(await fault('Hello,\nthis is a letter.\n')).toMatchObject({ code: 'NOT_DXF', message: /starts with "Hello,"/ });
    expect(await fault('0\nHELLO\n0\nWORLD\n')).toMatchObject({ code: 'NOT_DXF', message: /no SECTION/ });
  });

  it('BINARY_DXF', async () => {
    expect(await fault('AutoCAD Binary DXF\r\n\x1a\0\0\0')).toMatchObject({ code: 'BINARY_DXF', message: /save the drawing as ASCII DXF/ });
  });

  it('TRUNCATED: cut inside ENTITIES, or between a code and its value', async () => {
    const cut = good.slice(0, good.indexOf('LINE', good.indexOf('ENTITIES')) + 30);
    expect(await fault(cut)).toMatchObject({ code: 'TRUNCATED', message: /inside the ENTITIES section without the EOF marker/ });
    expect((await fault(good.slice(0, good.lastIndexOf('EOF')))).code).toBe('TRUNCATED');
  });

  it('MALFORMED: a group code that is not a number, a POLYLINE without SEQEND, LWPOLYLINE vertex ids', async () => {
    expect(await fault(good.replace(' 21\n', 'x1\n'))).toMatchObject({ code: 'MALFORMED', message: /line \d+: expected a group code, found "x1"/ });
    const poly: Tag[] = [[0, 'POLYLINE'], [5, 'C0'], [8, '0'], [66, 1], [70, 1]];
    const t0 = Date.now();
    expect(await fault(dxf([poly, ...rectLines(0, 0, 1, 1)]))).toMatchObject({ code: 'MALFORMED', message: /POLYLINE \(handle C0, layer 0, line \d+\): POLYLINE not ended by SEQEND/ });
    expect(Date.now() - t0).toBeLessThan(1000); // refused before the parser could loop on it
    const ids: Tag[] = [[0, 'LWPOLYLINE'], [5, 'D1'], [8, '0'], [90, 3], [70, 1], [10, 0], [20, 0], [91, 1], [10, 1], [20, 0], [91, 2], [10, 0], [20, 1], [91, 3]];
    expect(await fault(dxf([ids]))).toMatchObject({ code: 'MALFORMED', message: /LWPOLYLINE \(handle D1.*vertex identifiers \(group 91\)/ });
    const noCount: Tag[] = [[0, 'LWPOLYLINE'], [8, '0'], [70, 1], [10, 0], [20, 0], [10, 1], [20, 0], [10, 0], [20, 1]];
    expect(await fault(dxf([noCount]))).toMatchObject({ code: 'MALFORMED', message: /no vertex count \(group 90\)/ });
  });

  it('NON_FINITE: NaN or infinite coordinates name the entity and the line', async () => {
    const nan = dxf([...rectLines(0, 0, 1, 1).slice(0, 3), LINE([0, 1], [0, 0]).map(([c, v]): Tag => (c === 11 ? [11, 'NaN'] : [c, v]))]);
    expect(await fault(nan)).toMatchObject({ code: 'NON_FINITE', message: /LINE \(handle [0-9A-F]+, layer 0, line \d+\): group 11 at line \d+ is "NaN"/ });
    const inf = dxf([CIRCLE([0, 0], 1).map(([c, v]): Tag => (c === 40 ? [40, '1e999'] : [c, v]))]);
    expect(await fault(inf)).toMatchObject({ code: 'NON_FINITE', message: /CIRCLE .*group 40 .* "1e999"/ });
  });

  it('INVALID_ENTITY: zero radius', async () => {
    expect(await fault(dxf([CIRCLE([0, 0], 0)]))).toMatchObject({ code: 'INVALID_ENTITY', message: /CIRCLE .*radius 0 is not positive/ });
  });

  it('MISSING_UNIT and UNKNOWN_UNIT', async () => {
    expect((await fault(dxf(rectLines(0, 0, 1, 1), { insunits: null }))).code).toBe('MISSING_UNIT');
    expect((await fault(dxf(rectLines(0, 0, 1, 1), { insunits: 13 }))).message).toMatch(/\$INSUNITS 13 \(microns\)/);
  });

  it('NO_CLOSED_OUTLINE, OPEN_OUTLINE, BRANCHING_OUTLINE, CROSSING_OUTLINE', async () => {
    expect(await fault(dxf([LINE([0, 0], [10, 0])]))).toMatchObject({ code: 'NO_CLOSED_OUTLINE', message: /2 open ends at \(0, 0\) on LINE .* \(10, 0\) on LINE/ });
    const text: Tag[] = [[0, 'TEXT'], [8, '0'], [10, 0], [20, 0], [1, 'x']];
    expect(await fault(dxf([text, [[0, 'SPLINE'], [8, '0']]]))).toMatchObject({ code: 'NO_CLOSED_OUTLINE', message: /not read: 1 TEXT, 1 SPLINE/ });
    expect((await fault(dxf([...rectLines(0, 0, 1, 1), LWPOLYLINE([[5, 5], [6, 5], [6, 6]], false)]))).code).toBe('OPEN_OUTLINE');
    expect((await fault(dxf([...rectLines(0, 0, 1, 1), LINE([0, 0], [1, 1])]))).code).toBe('BRANCHING_OUTLINE');
    expect((await fault(dxf([CIRCLE([0, 0], 1), CIRCLE([1, 0], 1)]))).code).toBe('CROSSING_OUTLINE');
  });

  it('INVALID_GEOMETRY: a loop enclosing no area', async () => {
    // Out and back along the same path through three points: closes, but encloses nothing.
    const t = dxf([LINE([0, 0], [1, 0]), LINE([1, 0], [2, 0]), LINE([2, 0], [0, 0])]);
    expect((await fault(t)).code).toBe('INVALID_GEOMETRY');
  });

  it('PARSE_TIMEOUT: the parser loops on a LAYER table holding a foreign record', async () => {
    const tables: Tag[] = [[0, 'SECTION'], [2, 'TABLES'], [0, 'TABLE'], [2, 'LAYER'], [70, 1], [0, 'LAYER'], [2, 'L1'], [0, 'BOGUS'], [0, 'ENDTAB'], [0, 'ENDSEC']];
    const t0 = Date.now();
    expect(await fault(dxf(rectLines(0, 0, 1, 1), { before: tables }), { timeoutMs: 300 })).toMatchObject({ code: 'PARSE_TIMEOUT', message: /within 0.3 s/ });
    expect(Date.now() - t0).toBeLessThan(2000);
    // The stuck thread is replaced: drawings queued behind it, and after it, still read.
    const stuck = readDrawing(dxf(rectLines(0, 0, 1, 1), { before: tables }), { file: 'stuck.dxf', timeoutMs: 300 });
    const after = [1, 2, 3].map((k) => readDrawing(dxf(rectLines(0, 0, k, 1)), { file: `ok${k}.dxf` }));
    await expect(stuck).rejects.toMatchObject({ code: 'PARSE_TIMEOUT' });
    expect((await Promise.all(after)).map((d) => d.stats.loops)).toEqual([1, 1, 1]);
  });

  it('PARSE_MEMORY and TOO_LARGE', async () => {
    const many = Array.from({ length: 20000 }, (_, i) => LINE([i, 0], [i + 1, 0]));
    expect((await fault(dxf([...rectLines(0, 0, 1, 1), ...many]), { maxMemoryMb: 4 })).code).toBe('PARSE_MEMORY');
    expect(await fault(good, { maxBytes: 100 })).toMatchObject({ code: 'TOO_LARGE', message: /file is \d+ bytes, over the 100 bytes limit/ });
  });

  it('every error code is exercised above', () => {
    expect([...seen].sort()).toEqual([...DXF_ERROR_CODES].sort());
  });
});

describe('the parser stays quiet', () => {
  it('what dxf-parser prints becomes a warning, not terminal output', async () => {
    const odd = [...rectLines(0, 0, 1, 1)];
    odd[0] = [...odd[0]!, [155, 'x']];
    const d = await readDrawing(dxf(odd), { file: 'odd.dxf' });
    expect(d.warnings.join('\n')).toMatch(/parser: WARNING: Group code does not have a defined type/);
  });
});
