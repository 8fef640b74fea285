import { DxfError } from '@keelson/dxf';
import { GeometryError } from '@keelson/geometry';
import { UsageError } from './args';
import { InputError } from './inputs';

export interface Fault {
  /** The one stderr line, "keelson: <file>: <cause>". */
  readonly line: string;
  /** Stable code for scripts: the DxfError or GeometryError code, UNREADABLE_INPUT, USAGE or INTERNAL. */
  readonly code: string;
  /** 2 bad input (the user can fix it), 1 internal fault (a bug). */
  readonly exit: 1 | 2;
  readonly stack?: string;
}

const oneLine = (s: string) => s.replace(/\s*[\r\n]+\s*/g, ' ').trim();

/** Classifies an error thrown while handling `file` (if any) into its stderr line, code and exit code. */
export function faultOf(e: unknown, file?: string): Fault {
  const at = file ? `${file}: ` : '';
  if (e instanceof DxfError) return { line: `keelson: ${oneLine(e.message)}`, code: e.code, exit: 2 };
  if (e instanceof InputError) return { line: `keelson: ${oneLine(e.message)}`, code: 'UNREADABLE_INPUT', exit: 2 };
  if (e instanceof UsageError) return { line: `keelson: ${oneLine(e.message)}`, code: 'USAGE', exit: 2 };
  if (e instanceof GeometryError) return { line: `keelson: ${at}${oneLine(e.message)}`, code: e.code, exit: 2 };
  const err = e instanceof Error ? e : new Error(String(e));
  return {
    line: `keelson: ${at}internal error: ${oneLine(err.message)} (KEELSON_DEBUG=1 shows details)`,
    code: 'INTERNAL',
    exit: 1,
    stack: err.stack,
  };
}
