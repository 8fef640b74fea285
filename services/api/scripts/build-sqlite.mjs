/* global process, console */
// Builds better-sqlite3's native binding after `pnpm install`.
//
// Its own install script downloads a prebuilt binary, or else compiles with node-gyp, which downloads
// Node's headers: neither works on a machine that reaches only the npm registry, and pnpm does not
// pass npm's `nodedir` setting on to build scripts. So pnpm-workspace.yaml skips that script and this
// one compiles the binding against the running Node's own headers when they are installed beside it
// (<prefix>/include/node), letting node-gyp fetch them otherwise. Nothing to do when a binding that
// loads is already there.
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';

const require = createRequire(join(import.meta.dirname, '..', 'package.json'));
const pkg = dirname(require.resolve('better-sqlite3/package.json'));
const binding = join(pkg, 'build', 'Release', 'better_sqlite3.node');

const loads = () =>
  existsSync(binding) &&
  spawnSync(process.execPath, ['-e', `new (require(${JSON.stringify(pkg)}))(':memory:').close()`], { stdio: 'ignore' }).status === 0;

if (loads()) process.exit(0);

const gyp = require.resolve('node-gyp/bin/node-gyp.js');
const prefix = dirname(dirname(process.execPath));
const args = [gyp, 'rebuild', '--release', '--jobs=max', '--loglevel=error'];
if (existsSync(join(prefix, 'include', 'node', 'node.h'))) args.push(`--nodedir=${prefix}`);
console.log(`building better-sqlite3 (${args.slice(1).join(' ')}), about a minute…`);
const r = spawnSync(process.execPath, args, { cwd: pkg, stdio: ['ignore', 'ignore', 'inherit'] });
if (r.status !== 0 || !loads()) {
  console.error('better-sqlite3 did not build: install python3, make and a C++ compiler (and Node headers offline), then run pnpm install again');
  process.exit(1);
}
