import { describe, expect, it } from 'vitest';
import { DxfError } from '@keelson/dxf';
import { GeometryError } from '@keelson/geometry';
import { UsageError, parseArgs } from '../src/args';
import { faultOf } from '../src/faults';
import { sig4 } from '../src/number';
import { run } from '../src/cli';

describe('parseArgs', () => {
  it('reads props with its options in either form', () => {
    expect(parseArgs(['props', 'a.dxf'])).toEqual({ command: 'props', target: 'a.dxf', format: 'table', units: undefined, drawingUnits: undefined });
    expect(parseArgs(['props', '--units=cm', 'a.dxf', '--csv', '--drawing-units', 'ft'])).toEqual({
      command: 'props',
      target: 'a.dxf',
      format: 'csv',
      units: 'cm',
      drawingUnits: 'ft',
    });
    expect(parseArgs(['props', '--help'])).toEqual({ command: 'help' });
  });

  it.each([
    [[], /no command/],
    [['props'], /no file or folder given/],
    [['props', 'a', 'b'], /one file or folder at a time/],
    [['props', 'a', '--json', '--csv'], /exclude each other/],
    [['props', 'a', '--units', 'ft'], /--units must be mm, cm, m or in, not "ft"/],
    [['props', 'a', '--units'], /--units needs a value/],
    [['props', 'a', '--drawing-units', 'yd'], /--drawing-units must be/],
    [['props', 'a', '--units', 'mm', '--units', 'cm'], /given twice/],
    [['props', 'a', '--json=1'], /takes no value/],
    [['zip', 'a'], /unknown command "zip"/],
  ])('%j is a usage error', (argv, msg) => {
    expect(() => parseArgs(argv)).toThrow(UsageError);
    expect(() => parseArgs(argv)).toThrow(msg);
  });
});

describe('sig4', () => {
  it.each([
    [0, '0'],
    [1695.0000001, '1695'],
    [496.34, '496.3'],
    [-22.5, '-22.50'],
    [0.012345, '0.01235'],
    [4_126_000, '4.126×10⁶'],
    [459_500, '459.5×10³'],
    [999_960, '1.000×10⁶'],
    [12_345, '12.35×10³'],
    [0.001234, '1.234×10⁻³'],
    [-6.1e-9, '-6.100×10⁻⁹'],
  ])('%d → %s', (v, s) => expect(sig4(v)).toBe(s));
});

describe('faultOf', () => {
  it('bad input exits 2 with the file named once', () => {
    expect(faultOf(new DxfError('EMPTY_FILE', 'a.dxf', 'file is empty'), 'a.dxf')).toEqual({ line: 'keelson: a.dxf: file is empty', code: 'EMPTY_FILE', exit: 2 });
    expect(faultOf(new GeometryError('EMPTY_REGION', 'region has no parts'), 'b.dxf').line).toBe('keelson: b.dxf: region has no parts');
  });

  it('anything else is an internal fault: exit 1, one line, the stack kept for KEELSON_DEBUG', () => {
    const f = faultOf(new TypeError('x is not a function\n  more'), 'c.dxf');
    expect(f.exit).toBe(1);
    expect(f.line).toBe('keelson: c.dxf: internal error: x is not a function more (KEELSON_DEBUG=1 shows details)');
    expect(f.stack).toMatch(/TypeError/);
  });

  it('help lists every command with its usage; props --help only props', async () => {
    const out: string[] = [];
    const io = { out: (l: string) => out.push(l), err: () => {}, debug: false };
    expect(await run(['help'], io)).toBe(0);
    for (const c of ['props', 'verify', 'diff', 'serve']) expect(out.join('')).toContain(`usage: keelson ${c} `);
    expect(out.join('')).toMatch(/licensed engineer/);
    out.length = 0;
    expect(await run(['props', '--help'], io)).toBe(0);
    expect(out.join('')).toMatch(/^usage: keelson props /);
    expect(out.join('')).not.toContain('keelson verify');
  });

  it('run prints the stack of an internal fault only when debugging', async () => {
    const lines: string[] = [];
    const io = (debug: boolean) => ({ out: () => {}, err: (l: string) => lines.push(l), debug });
    // A target that is neither file nor folder makes stat fail with a code we do not map: stands in for a bug.
    const bad = '\0';
    expect(await run(['props', bad], io(false))).toBe(1);
    expect(lines).toHaveLength(1);
    expect(await run(['props', bad], io(true))).toBe(1);
    expect(lines.length).toBeGreaterThan(2);
  });
});
