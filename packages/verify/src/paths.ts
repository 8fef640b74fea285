import { VerifyError } from './errors';

/**
 * Joins a drawing path of the manifest to the manifest's folder inside the catalogue: `/` or `\`
 * separators, `.` and `..` resolved; a path that is absolute or climbs out of the catalogue is refused
 * (names are labels inside the catalogue, never paths on the server's disk).
 */
export function cataloguePath(base: string, rel: string): string {
  if (/^([a-zA-Z]:)?[\\/]/.test(rel)) throw new VerifyError('BAD_DRAWING_PATH', `drawing "${rel}": absolute paths are refused; give it relative to the manifest`);
  const out: string[] = [];
  for (const part of [...base.split(/[\\/]/), ...rel.split(/[\\/]/)]) {
    if (part === '' || part === '.') continue;
    if (part === '..') {
      if (!out.length) throw new VerifyError('BAD_DRAWING_PATH', `drawing "${rel}" lies outside the catalogue`);
      out.pop();
    } else out.push(part);
  }
  return out.join('/');
}
