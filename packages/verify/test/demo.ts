import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import type { Catalogue } from '../src';

/** The demo catalogue (fixtures/demo) as a verification reads a folder: every drawing by name. */
export const DEMO_DIR = join(import.meta.dirname, '../../../fixtures/demo');

export function demoCatalogue(): Catalogue {
  const drawings = readdirSync(DEMO_DIR)
    .filter((n) => n.endsWith('.dxf'))
    .sort()
    .map((path) => ({ path, bytes: new Uint8Array(readFileSync(join(DEMO_DIR, path))) }));
  return { name: 'demo', source: DEMO_DIR, drawings };
}

export const demoManifestText = (): string => readFileSync(join(DEMO_DIR, 'manifest.csv'), 'utf8');
