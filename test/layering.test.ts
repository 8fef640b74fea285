import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = join(import.meta.dirname, '..');

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    if (name === 'node_modules') return [];
    return statSync(p).isDirectory() ? sources(p) : /\.(ts|mjs)$/.test(name) ? [p] : [];
  });
}

const imports = (file: string) => [...readFileSync(file, 'utf8').matchAll(/from\s+'([^']+)'/g)].map((m) => m[1]!);

// Architecture rule (DEVELOPERS.md): libraries are pure, services do the I/O, and data flows one way.
describe('package layering', () => {
  const pkgs = readdirSync(join(root, 'packages'));
  for (const pkg of pkgs) {
    it(`packages/${pkg} imports no service and writes nothing to the console`, () => {
      for (const file of sources(join(root, 'packages', pkg, 'src'))) {
        const text = readFileSync(file, 'utf8');
        for (const spec of imports(file)) expect(spec, file).not.toMatch(/^@keelson\/(cli|api|web|worker)/);
        expect(text, file).not.toMatch(/process\.exit|console\.(log|error|warn)/);
      }
    });
  }

  it('geometry depends on no other Keelson package', () => {
    for (const file of sources(join(root, 'packages', 'geometry', 'src')))
      for (const spec of imports(file)) expect(spec, file).not.toMatch(/^@keelson\//);
  });
});
