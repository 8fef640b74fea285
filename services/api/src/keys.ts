import { createHash } from 'node:crypto';
import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { canonical, type Settings } from './settings';

export const sha256 = (data: Uint8Array | string): string => createHash('sha256').update(data).digest('hex');

const ROOT = join(import.meta.dirname, '..', '..', '..');

function sources(dir: string): string[] {
  let names: string[];
  try {
    names = readdirSync(dir).sort();
  } catch {
    return [];
  }
  return names.flatMap((name) => {
    const p = join(dir, name);
    if (name === 'node_modules' || name === 'test') return [];
    return statSync(p).isDirectory() ? sources(p) : /\.(ts|mjs|js|json)$/.test(name) ? [p] : [];
  });
}

let version: string | undefined;

/**
 * Version of the code that computes results: a hash of the source of every package (and of the
 * pool's task). Any change to the computation gives new result keys, so a stored result is never
 * served by a different algorithm than the one that would compute it now.
 */
export function codeVersion(): string {
  if (version) return version;
  const h = createHash('sha256');
  const files = [...sources(join(ROOT, 'packages')), join(ROOT, 'services', 'api', 'src', 'pool', 'task.ts')];
  for (const f of files) h.update(f.slice(ROOT.length)).update('\0').update(readFileSync(f)).update('\0');
  return (version = h.digest('hex').slice(0, 16));
}

/** Key of a result: who asked (results are not shared between tenants), what, how, and by which code. */
export function resultKey(tenant: string, drawingSha256: string, settings: Settings): string {
  return sha256(JSON.stringify([tenant, drawingSha256, canonical(settings), codeVersion()]));
}
