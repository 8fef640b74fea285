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

  it('MALFORMED: a group code that is not a number, a POLYLINE without SEQEND, a vertex count that disagrees', async () => {
    expect(await fault(good.replace(' 21\n', 'x1\n'))).toMatchObject({ code: 'MALFORMED', message: /line \d+: expected a group code, found "x1"/ });
    const poly: Tag[] = [[0, 'POLYLINE'], [5, 'C0'], [8, '0'], [66, 1], [70, 1]];
    expect(await fault(dxf([poly, ...rectLines(0, 0, 1, 1)]))).toMatchObject({ code: 'MALFORMED', message: /POLYLINE \(handle C0, layer 0, line \d+\): POLYLINE not ended by SEQEND/ });
    const miscounted: Tag[] = [[0, 'LWPOLYLINE'], [5, 'D1'], [8, '0'], [90, 4], [70, 1], [10, 0], [20, 0], [10, 1], [20, 0], [10, 0], [20, 1]];
    expect(await fault(dxf([miscounted]))).toMatchObject({ code: 'MALFORMED', message: /LWPOLYLINE \(handle D1.*vertex count \(group 90\) is 4 but 3 vertices follow/ });
    const block: Tag[] = [[0, 'SECTION'], [2, 'BLOCKS'], [0, 'BLOCK'], [2, 'B'], [10, 0], [20, 0], ...LINE([0, 0], [1, 0]), [0, 'ENDSEC']];
    expect(await fault(dxf(rectLines(0, 0, 1, 1), { before: block }))).toMatchObject({ code: 'MALFORMED', message: /BLOCK "B" \(line \d+\) not ended by ENDBLK/ });
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
    const solid: Tag[] = [[0, 'SOLID'], [8, '0'], [10, 0], [20, 0]];
    expect(await fault(dxf([text, solid]))).toMatchObject({ code: 'NO_CLOSED_OUTLINE', message: /not read: 1 TEXT, 1 SOLID/ });
    expect((await fault(dxf([...rectLines(0, 0, 1, 1), LWPOLYLINE([[5, 5], [6, 5], [6, 6]], false)]))).code).toBe('OPEN_OUTLINE');
    expect((await fault(dxf([...rectLines(0, 0, 1, 1), LINE([0, 0], [1, 1])]))).code).toBe('BRANCHING_OUTLINE');
    // A figure eight: one outline crossing itself has no single inside.
    const eight = LWPOLYLINE([[0, 0], [10, 10], [10, 0], [0, 10]]);
    expect(await fault(dxf([eight]))).toMatchObject({ code: 'CROSSING_OUTLINE', message: /crosses itself at \(5, 5\)/ });
  });

  it('INVALID_GEOMETRY: coordinates out of range, or a section too small for where it lies', async () => {
    expect(await fault(dxf(rectLines(1e13, 0, 1, 1)))).toMatchObject({ code: 'INVALID_GEOMETRY', message: /beyond ±1e\+12/ });
    expect(await fault(dxf(rectLines(1e6, 0, 1e-10, 1e-10)))).toMatchObject({ code: 'INVALID_GEOMETRY', message: /too small to compute/ });
  });

  it('INVALID_GEOMETRY: a fault of the geometry core comes out as a DxfError (a block scaled to nothing)', async () => {
    const block: Tag[] = [[0, 'SECTION'], [2, 'BLOCKS'], [0, 'BLOCK'], [2, 'DOT'], [10, 0], [20, 0], ...CIRCLE([0, 0], 1), [0, 'ENDBLK'], [0, 'ENDSEC']];
    const insert: Tag[] = [[0, 'INSERT'], [8, '0'], [2, 'DOT'], [10, 0], [20, 0], [41, 1e-200], [42, 1e-200]];
    expect(await fault(dxf([insert], { before: block }))).toMatchObject({ code: 'INVALID_GEOMETRY', message: /transform collapses an arc/ });
  });

  it('UNSUPPORTED_ENTITY: a SPLINE of fit points only', async () => {
    const fit: Tag[] = [[0, 'SPLINE'], [5, 'F1'], [8, '0'], [70, 8], [71, 3], [74, 3], [11, 0], [21, 0], [31, 0], [11, 5], [21, 5], [31, 0], [11, 10], [21, 0], [31, 0]];
    expect(await fault(dxf([fit, ...rectLines(0, 0, 1, 1)]))).toMatchObject({ code: 'UNSUPPORTED_ENTITY', message: /SPLINE \(handle F1.*defined by 3 fit points only/ });
  });

  it('INVALID_BLOCK and TOO_COMPLEX: undefined and self-inserting blocks, arrays past the limit', async () => {
    const insert = (name: string, extra: Tag[] = []): Tag[] => [[0, 'INSERT'], [5, 'I1'], [8, '0'], [2, name], [10, 0], [20, 0], ...extra];
    expect(await fault(dxf([insert('NOPE')]))).toMatchObject({ code: 'INVALID_BLOCK', message: /INSERT \(handle I1.*block "NOPE" is not defined/ });
    const blocks = (...defs: Tag[][]): Tag[] => [[0, 'SECTION'], [2, 'BLOCKS'], ...defs.flat(), [0, 'ENDSEC']];
    const def = (name: string, body: Tag[][]): Tag[] => [[0, 'BLOCK'], [2, name], [70, 0], [10, 0], [20, 0], ...body.flat(), [0, 'ENDBLK']];
    const loop = blocks(def('A', [insert('B')]), def('B', [insert('A')]));
    expect(await fault(dxf([insert('A')], { before: loop }))).toMatchObject({ code: 'INVALID_BLOCK', message: /block "A" inserts itself \(A → B → A\)/ });
    const big = blocks(def('SQ', rectLines(0, 0, 1, 1)));
    const array = insert('SQ', [[70, 1000], [71, 1000], [44, 2], [45, 2]]);
    expect(await fault(dxf([array], { before: big }))).toMatchObject({ code: 'TOO_COMPLEX', message: /expands to about 4\.0e\+6 segments/ });
    // An array of an empty block costs its copies, not nothing.
    const empty = blocks(def('NONE', []));
    const t0 = Date.now();
    expect((await fault(dxf([insert('NONE', [[70, 30000], [71, 30000]])], { before: empty }))).code).toBe('TOO_COMPLEX');
    expect(Date.now() - t0).toBeLessThan(1000);
  });

  it('PARSE_TIMEOUT: reading stops at its time limit, checked between entities', async () => {
    const many = Array.from({ length: 40000 }, (_, i) => LINE([i, 0], [i + 1, 0]));
    const t0 = Date.now();
    expect(await fault(dxf([...rectLines(0, 0, 1, 1), ...many]), { timeoutMs: 1 })).toMatchObject({ code: 'PARSE_TIMEOUT', message: /within 0\.001 s/ });
    // Stopping costs the pass over the pairs, a quarter of reading it all (measured 1.2 s against 4.5 s on the shared box under load).
    expect(Date.now() - t0).toBeLessThan(10_000);
  });

  it('PARSE_MEMORY and TOO_LARGE', async () => {
    const many = Array.from({ length: 20000 }, (_, i) => LINE([i, 0], [i + 1, 0]));
    expect(await fault(dxf([...rectLines(0, 0, 1, 1), ...many]), { maxMemoryMb: 4 })).toMatchObject({ code: 'PARSE_MEMORY', message: /about \d+ MiB, over the 4 MiB limit/ });
    expect(await fault(good, { maxBytes: 100 })).toMatchObject({ code: 'TOO_LARGE', message: /file is \d+ bytes, over the 100 bytes limit/ });
  });

  it('every error code is exercised above', () => {
    expect([...seen].sort()).toEqual([...DXF_ERROR_CODES].sort());
  });
});

describe('regressions of the dxf-parser era (BRIEF §4): read now, not refused or looping', () => {
  it('a LAYER table holding a foreign record, odd group codes, LWPOLYLINE vertex ids and no vertex count', async () => {
    const tables: Tag[] = [[0, 'SECTION'], [2, 'TABLES'], [0, 'TABLE'], [2, 'LAYER'], [70, 1], [0, 'LAYER'], [2, 'L1'], [0, 'BOGUS'], [0, 'ENDTAB'], [0, 'ENDSEC']];
    const odd = rectLines(0, 0, 1, 1);
    odd[0] = [...odd[0]!, [155, 'x']];
    expect((await readDrawing(dxf(odd, { before: tables }), { file: 'odd.dxf' })).stats.loops).toBe(1);
    // Vertex ids (91) after each vertex, and no count (90): a unit square.
    const ids: Tag[] = [[0, 'LWPOLYLINE'], [8, '0'], [70, 1], [10, 0], [20, 0], [91, 1], [10, 1], [20, 0], [91, 2], [10, 1], [20, 1], [91, 3], [10, 0], [20, 1], [91, 4]];
    expect((await readDrawing(dxf([ids]), { file: 'ids.dxf' })).stats.segments).toBe(4);
  });
});
