import { DxfError } from '@keelson/dxf';
import { GeometryError } from '@keelson/geometry';
import { UsageError } from './args';
import { InputError } from './inputs';

export interface Fault {
  /** The one stderr line, "keelson: <file>: <cause>". */
  readonly line: string;
  /** 2 bad input (the user can fix it), 1 internal fault (a bug). */
  readonly exit: 1 | 2;
  readonly stack?: string;
}

const oneLine = (s: string) => s.replace(/\s*[\r\n]+\s*/g, ' ').trim();

/** Classifies an error thrown while handling `file` (if any) into its stderr line and exit code. */
export function faultOf(e: unknown, file?: string): Fault {
  const at = file ? `${file}: ` : '';
  if (e instanceof DxfError || e instanceof InputError) return { line: `keelson: ${oneLine(e.message)}`, exit: 2 };
  if (e instanceof UsageError) return { line: `keelson: ${oneLine(e.message)}`, exit: 2 };
  if (e instanceof GeometryError) return { line: `keelson: ${at}${oneLine(e.message)}`, exit: 2 };
  const err = e instanceof Error ? e : new Error(String(e));
  return { line: `keelson: ${at}internal error: ${oneLine(err.message)} (KEELSON_DEBUG=1 shows details)`, exit: 1, stack: err.stack };
}
