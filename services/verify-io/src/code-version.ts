import { createHash } from 'node:crypto';
import { readFile, readdir } from 'node:fs/promises';
import { join } from 'node:path';

const ROOT = join(import.meta.dirname, '../../..');

/**
 * The version of the code that computes properties: the workspace version and a hash of every
 * source file of the packages (geometry, dxf, torsion, profile, verify…). Any edit to the
 * computation changes it, so a stored run's values are reused only by the code that made them.
 */
export async function codeVersion(root = ROOT): Promise<string> {
  const pkg = JSON.parse(await readFile(join(root, 'package.json'), 'utf8')) as { version: string };
  const h = createHash('sha256');
  const packages = (await readdir(join(root, 'packages'))).sort();
  for (const p of packages) {
    const src = join(root, 'packages', p, 'src');
    const files = await readdir(src, { recursive: true }).catch(() => [] as string[]);
    for (const f of files.filter((n) => /\.(ts|mjs|js)$/.test(n)).sort()) h.update(`${p}/${f}\0`).update(await readFile(join(src, f))).update('\0');
  }
  return `${pkg.version}+${h.digest('hex').slice(0, 12)}`;
}
