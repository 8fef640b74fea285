import { describe, expect, it } from 'vitest';
import { DEFAULT_TOLERANCES, VerifyError, parseCsv, parseManifest, parseMaterials, parseTolerance, type VerifyErrorCode } from '../src';

const HEAD = 'id,drawing,revision,material,units';

function fault(f: () => unknown): { code: VerifyErrorCode; message: string } {
  try {
    f();
  } catch (e) {
    if (e instanceof VerifyError) return { code: e.code, message: e.message };
    throw e;
  }
  throw new Error('no error thrown');
}

describe('parseCsv', () => {
  it('reads RFC 4180: quotes, doubled quotes, line breaks in quotes, CRLF, BOM; blank lines skipped', () => {
    const text = '\ufeffa,b,c\r\n"x, y","say ""hi""","two\nlines"\r\n\r\n1,,3\n';
    expect(parseCsv(text, 'f.csv')).toEqual([
      { line: 1, cells: ['a', 'b', 'c'] },
      { line: 2, cells: ['x, y', 'say "hi"', 'two\nlines'] },
      { line: 5, cells: ['1', '', '3'] },
    ]);
  });

  it('takes semicolons as the delimiter when the header has no comma', () => {
    expect(parseCsv('id;A\nX;12.5\n', 'f.csv').map((r) => r.cells)).toEqual([['id', 'A'], ['X', '12.5']]);
  });

  it('refuses an unclosed quote, naming its line', () => {
    expect(fault(() => parseCsv('a,b\n1,"open\n', 'f.csv'))).toEqual({ code: 'MANIFEST_SYNTAX', message: 'f.csv: line 2: a quoted field is not closed' });
  });
});

describe('tolerances', () => {
  it('reads "0.5%" as relative and a plain number as absolute', () => {
    expect(parseTolerance('0.5%')).toEqual({ kind: 'relative', value: 0.005 });
    expect(parseTolerance(' 2 % ')).toEqual({ kind: 'relative', value: 0.02 });
    expect(parseTolerance('0.3')).toEqual({ kind: 'absolute', value: 0.3 });
    expect(parseTolerance('-1%')).toBeNull();
    expect(parseTolerance('about 1%')).toBeNull();
  });

  it('has a documented default for every key', () => {
    expect(DEFAULT_TOLERANCES.A).toEqual({ kind: 'relative', value: 0.01 });
    expect(DEFAULT_TOLERANCES.J).toEqual({ kind: 'relative', value: 0.1 });
    expect(DEFAULT_TOLERANCES.cx).toEqual({ kind: 'absolute', value: 0.2 });
    expect(DEFAULT_TOLERANCES.theta).toEqual({ kind: 'absolute', value: 0.5 });
    expect(DEFAULT_TOLERANCES.P).toEqual({ kind: 'relative', value: 0.01 });
    expect(Object.keys(DEFAULT_TOLERANCES)).toHaveLength(35);
  });
});

describe('parseManifest (CSV)', () => {
  it('reads rows: published values, <key>_tol, blank cells not checked', () => {
    const m = parseManifest(`${HEAD},description,A,A_tol,Ix,J,J_tol\nMX 1,a/b.dxf,C,aluminium,cm,"Tube, round",4.43,0.5%,12.28,,\nMX 2,c.dxf,,steel,mm,,300,,,,3\n`, 'm.csv');
    expect(m.rows).toEqual([
      {
        id: 'MX 1',
        drawing: 'a/b.dxf',
        revision: 'C',
        material: 'aluminium',
        units: 'cm',
        description: 'Tube, round',
        published: { A: 4.43, Ix: 12.28 },
        tolerances: { A: { kind: 'relative', value: 0.005 } },
      },
      { id: 'MX 2', drawing: 'c.dxf', revision: '', material: 'steel', units: 'mm', published: { A: 300 }, tolerances: { J: { kind: 'absolute', value: 3 } } },
    ]);
    expect(m.hash).toMatch(/^[0-9a-f]{64}$/);
    expect(m.materials.steel!.density).toBe(7850);
  });

  it('refuses a misspelt column rather than check nothing', () => {
    expect(fault(() => parseManifest(`${HEAD},IX\nX,x.dxf,,steel,mm,1\n`, 'm.csv'))).toMatchObject({ code: 'MANIFEST_INVALID', message: expect.stringMatching(/^m\.csv: unknown column "IX"/) });
  });

  it('names line and column of a value that is not a number', () => {
    expect(fault(() => parseManifest(`${HEAD},A\nX,x.dxf,,steel,mm,1\nY,y.dxf,,steel,mm,"12,5"\n`, 'm.csv'))).toEqual({
      code: 'MANIFEST_INVALID',
      message: 'm.csv: line 3, column A: "12,5" is not a number (use a decimal point, no thousands separator)',
    });
  });

  it('names line and column of a bad unit or tolerance', () => {
    expect(fault(() => parseManifest(`${HEAD},A\nX,x.dxf,,steel,inch,1\n`, 'm.csv')).message).toMatch(/^m\.csv: line 2, column units: units must be one of mm, cm, m, in/);
    expect(fault(() => parseManifest(`${HEAD},A,A_tol\nX,x.dxf,,steel,mm,1,lots\n`, 'm.csv')).message).toMatch(/^m\.csv: line 2, column A_tol: "lots" is not a tolerance/);
  });

  it('refuses duplicate ids and unknown materials', () => {
    expect(fault(() => parseManifest(`${HEAD}\nX,a.dxf,,steel,mm\nX,b.dxf,,steel,mm\n`, 'm.csv'))).toEqual({ code: 'DUPLICATE_ID', message: 'm.csv: line 3: id "X" already used' });
    expect(fault(() => parseManifest(`${HEAD}\nX,a.dxf,,titanium,mm\n`, 'm.csv'))).toEqual({
      code: 'UNKNOWN_MATERIAL',
      message: 'm.csv: line 2: unknown material "titanium"; known: steel, aluminium',
    });
  });

  it('refuses a manifest without rows', () => {
    expect(fault(() => parseManifest(`${HEAD}\n`, 'm.csv')).code).toBe('MANIFEST_INVALID');
    expect(fault(() => parseManifest('', 'm.csv')).code).toBe('MANIFEST_INVALID');
  });
});

describe('parseManifest (JSON)', () => {
  it('reads profiles with published values and tolerances, and custom materials', () => {
    const m = parseManifest(
      JSON.stringify({
        materials: { titanium: { name: 'Ti-6Al-4V', density: 4430, E: 114_000, G: 44_000, source: 'supplier sheet' } },
        profiles: [{ id: 'T1', drawing: 't1.dxf', material: 'titanium', units: 'mm', published: { A: 120, J: 800 }, tolerances: { A: '0.2%', J: 40 } }],
      }),
      'm.json',
    );
    expect(m.rows[0]).toEqual({ id: 'T1', drawing: 't1.dxf', revision: '', material: 'titanium', units: 'mm', published: { A: 120, J: 800 }, tolerances: { A: { kind: 'relative', value: 0.002 }, J: { kind: 'absolute', value: 40 } } });
    expect(m.materials.titanium).toEqual({ name: 'Ti-6Al-4V', density: 4430, E: 114_000, G: 44_000, source: 'supplier sheet' });
  });

  it('names the path of an invalid value and the profile it belongs to', () => {
    const text = JSON.stringify({ profiles: [{ id: 'T1', drawing: 't1.dxf', material: 'steel', units: 'mm', published: { Ix: 'big' } }] });
    expect(fault(() => parseManifest(text, 'm.json')).message).toMatch(/^m\.json: profiles\[0\] \(T1\)\.published\.Ix: /);
    expect(fault(() => parseManifest('{"profiles": [', 'm.json')).code).toBe('MANIFEST_SYNTAX');
    expect(fault(() => parseManifest(JSON.stringify({ profiles: [{ id: 'T', drawing: 'x', material: 'steel', units: 'mm', published: { Q: 1 } }] }), 'm.json')).code).toBe('MANIFEST_INVALID');
  });
});

describe('parseMaterials', () => {
  it('reads a materials file and names what is wrong in one', () => {
    expect(parseMaterials('{"brass": {"density": 8500, "E": 100000, "G": 37000}}', 'm.json')).toEqual({ brass: { density: 8500, E: 100000, G: 37000 } });
    expect(fault(() => parseMaterials('{"brass": {"density": -1, "E": 1, "G": 1}}', 'm.json'))).toMatchObject({ code: 'MANIFEST_INVALID', message: expect.stringMatching(/^m\.json: brass\.density: /) });
    expect(fault(() => parseMaterials('nope', 'm.json')).code).toBe('MANIFEST_SYNTAX');
  });
});
