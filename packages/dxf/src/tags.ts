import { DxfError } from './errors';

/**
 * The group-code/value pairs of an ASCII DXF, as flat arrays over the original text: pair i has
 * code `codes[i]` and its value between `starts[i]` and `ends[i]` (trimmed), on line 2i + 2 of the
 * file (its code on line 2i + 1; ASCII DXF is strictly one line per code and one per value).
 * Values are sliced only when read, so a 64 MiB file costs 12 bytes per pair plus the text.
 */
export class Tags {
  constructor(
    readonly text: string,
    readonly count: number,
    readonly codes: Int32Array,
    readonly starts: Uint32Array,
    readonly ends: Uint32Array,
    /** Line number of pair 0's code line (blank lines before it are skipped). */
    private readonly base: number,
  ) {}

  value(i: number): string {
    return this.text.slice(this.starts[i]!, this.ends[i]!);
  }

  /** Line number (1-based) of pair i's code line. */
  line(i: number): number {
    return this.base + 2 * i;
  }

  /** Whether pair i is (code, value) without slicing unless the lengths agree. */
  is(i: number, code: number, value: string): boolean {
    return this.codes[i] === code && this.ends[i]! - this.starts[i]! === value.length && this.text.startsWith(value, this.starts[i]!);
  }
}

export const BINARY_SENTINEL = 'AutoCAD Binary DXF';

function printable(s: string): string {
  const t = s.slice(0, 24).replace(/[^\x20-\x7e]/g, '?');
  return JSON.stringify(s.length > 24 ? t + '…' : t);
}

const isSpace = (c: number) => c === 32 || c === 9;

/**
 * Splits the text into pairs up to the `0 EOF` pair, refusing what is not ASCII DXF: empty files,
 * binary DXF (only ASCII is read: the sentinel gets its own message), binary data, and code lines
 * that are not integers. Linear in the text with no backtracking: nothing here can loop, and memory
 * grows by three numbers per pair. `complete` is false when the text ends before `0 EOF`.
 */
export function readTags(text: string, file: string): { tags: Tags; complete: boolean } {
  if (/^\s*$/.test(text)) throw new DxfError('EMPTY_FILE', file, 'file is empty');
  if (text.startsWith(BINARY_SENTINEL))
    throw new DxfError('BINARY_DXF', file, 'binary DXF is not read: save the drawing as ASCII DXF (any version)');
  const nul = text.indexOf('\0');
  if (nul >= 0 && nul < 4096) {
    const first = text.trimStart().split(/\r\n|\r|\n/, 1)[0]!.trim();
    throw new DxfError('NOT_DXF', file, `not a DXF file: it starts with ${printable(first)}, not a group code`);
  }

  let cap = 1024;
  let codes = new Int32Array(cap);
  let starts = new Uint32Array(cap);
  let ends = new Uint32Array(cap);
  let n = 0;
  const n0 = text.length;
  let pos = 0;
  // Bounds of the next line (trimmed), and where the line after it starts.
  let ls = 0;
  let le = 0;
  const nextLine = (): boolean => {
    if (pos >= n0) return false;
    let e = pos;
    while (e < n0) {
      const c = text.charCodeAt(e);
      if (c === 10 || c === 13) break;
      e++;
    }
    ls = pos;
    le = e;
    pos = e < n0 && text.charCodeAt(e) === 13 && text.charCodeAt(e + 1) === 10 ? e + 2 : e + 1;
    while (ls < le && isSpace(text.charCodeAt(ls))) ls++;
    while (le > ls && isSpace(text.charCodeAt(le - 1))) le--;
    return true;
  };

  let eof = false;
  let sections = 0;
  // Leading blank lines are tolerated (some writers start with one); inside the file a blank code line is an error.
  let base = 1;
  for (; pos < n0 && /\s/.test(text[pos]!); pos++) if (text[pos] === '\n' || (text[pos] === '\r' && text[pos + 1] !== '\n')) base++;
  while (nextLine()) {
    const codeStart = ls;
    const codeEnd = le;
    let code = 0;
    let k = codeStart;
    const neg = k < codeEnd && text.charCodeAt(k) === 45;
    if (neg) k++;
    const digits = codeEnd - k;
    for (; k < codeEnd; k++) {
      const d = text.charCodeAt(k) - 48;
      if (d < 0 || d > 9) break;
      code = code * 10 + d;
    }
    if (k !== codeEnd || digits === 0 || digits > 9) {
      const found = text.slice(codeStart, codeEnd);
      if (n === 0) throw new DxfError('NOT_DXF', file, `not a DXF file: it starts with ${printable(found)}, not a group code`);
      throw new DxfError(sections ? 'MALFORMED' : 'NOT_DXF', file, `line ${base + 2 * n}: expected a group code, found ${printable(found)}`);
    }
    if (!nextLine()) break;
    if (n === cap) {
      cap *= 2;
      const grow = <T extends Int32Array | Uint32Array>(a: T, b: T) => (b.set(a), b);
      codes = grow(codes, new Int32Array(cap));
      starts = grow(starts, new Uint32Array(cap));
      ends = grow(ends, new Uint32Array(cap));
    }
    codes[n] = neg ? -code : code;
    starts[n] = ls;
    ends[n] = le;
    n++;
    if (code === 0 && le - ls === 7 && text.startsWith('SECTION', ls)) sections++;
    if (code === 0 && le - ls === 3 && text.startsWith('EOF', ls)) {
      eof = true;
      break;
    }
  }
  if (!sections) throw new DxfError('NOT_DXF', file, 'not a DXF file: no SECTION found');
  return { tags: new Tags(text, n, codes, starts, ends, base), complete: eof };
}
