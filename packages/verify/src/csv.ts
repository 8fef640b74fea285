import { VerifyError } from './errors';

/** A CSV record with the 1-based line it starts on (for error messages). */
export interface CsvRecord {
  readonly line: number;
  readonly cells: string[];
}

/**
 * Parses RFC 4180 CSV: quoted fields with doubled quotes and line breaks, CRLF or LF, a leading BOM
 * dropped. The delimiter is a comma, or a semicolon when the first line has semicolons and no comma
 * (spreadsheets in locales with a decimal comma save that way). Blank lines are skipped.
 */
export function parseCsv(text: string, file: string): CsvRecord[] {
  const src = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const firstLine = src.slice(0, src.search(/\r?\n|$/));
  const sep = !firstLine.includes(',') && firstLine.includes(';') ? ';' : ',';
  const out: CsvRecord[] = [];
  let cells: string[] = [];
  let cell = '';
  let line = 1;
  let start = 1;
  let quoted = false;
  let i = 0;
  const endRecord = () => {
    cells.push(cell);
    if (cells.length > 1 || cells[0]!.trim() !== '') out.push({ line: start, cells });
    cells = [];
    cell = '';
  };
  while (i < src.length) {
    const c = src[i]!;
    if (quoted) {
      if (c === '"' && src[i + 1] === '"') {
        cell += '"';
        i += 2;
        continue;
      }
      if (c === '"') quoted = false;
      else {
        if (c === '\n') line++;
        cell += c;
      }
      i++;
      continue;
    }
    if (c === '"') {
      if (cell.trim() !== '') throw new VerifyError('MANIFEST_SYNTAX', `${file}: line ${line}: a quote inside an unquoted field`);
      cell = '';
      quoted = true;
    } else if (c === sep) {
      cells.push(cell);
      cell = '';
    } else if (c === '\n' || c === '\r') {
      endRecord();
      if (c === '\r' && src[i + 1] === '\n') i++;
      line++;
      start = line;
    } else cell += c;
    i++;
  }
  if (quoted) throw new VerifyError('MANIFEST_SYNTAX', `${file}: line ${start}: a quoted field is not closed`);
  if (cell !== '' || cells.length) endRecord();
  return out;
}

/** One RFC 4180 field: quoted when it holds a comma, quote or line break. */
export const csvField = (s: string): string => (/[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

/** Lines of CSV from rows of fields, CRLF-free, with a final newline. */
export const csvText = (rows: readonly (readonly string[])[]): string => rows.map((r) => r.map(csvField).join(',')).join('\n') + '\n';
