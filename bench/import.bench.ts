/**
 * Import of a generated 1,000-profile catalogue: `readDrawing` (tags, blocks, entities, stitching,
 * region resolution) on each drawing in turn on one core, against bare dxf-parser parsing of the same
 * bytes (the parser Keelson no longer uses, kept as a yardstick). Not a test: prints figures, asserts
 * nothing. Run with `npx tsx bench/import.bench.ts [count]`.
 *
 * The catalogue: the twelve demo profiles (fixtures/catalogue.ts), each drawn 83 or 84 times scaled
 * (0.5–2×) and moved, half as closed LWPOLYLINEs with bulges, half as shuffled loose LINE/ARC/CIRCLE.
 */
import { createRequire } from 'node:module';
import { cpus } from 'node:os';
import { performance } from 'node:perf_hooks';
import { readDrawing, type Drawing } from '@keelson/dxf';
import { sectionProperties, segmentCount, transformRegion } from '@keelson/geometry';
import { PROFILES, renderProfile } from '../fixtures/catalogue';

// dxf-parser is a devDependency of @keelson/dxf only: resolve it from there.
const require = createRequire(new URL('../packages/dxf/package.json', import.meta.url));
const DxfParser = require('dxf-parser') as new () => { parseSync(text: string): unknown };

const count = Number(process.argv[2] ?? 1000);
const drawings = Array.from({ length: count }, (_, i) => {
  const p = PROFILES[i % PROFILES.length]!;
  const k = 0.5 + ((i * 37) % 150) / 100;
  const t = { a: k, b: 0, c: 0, d: k, tx: (i % 17) * 250, ty: (i % 23) * 130 };
  return renderProfile({ ...p, name: `${p.name}-${i}`, build: () => transformRegion(p.build(), t) });
});
const bytes = drawings.reduce((n, d) => n + Buffer.byteLength(d), 0);

function time(f: () => void): number {
  const t0 = performance.now();
  f();
  return (performance.now() - t0) / 1000;
}

// Warm both up (JIT) on a tenth of the set, then measure the whole set three times and keep the best.
const parser = new DxfParser();
for (const d of drawings.slice(0, count / 10)) parser.parseSync(d);
for (const d of drawings.slice(0, count / 10)) await readDrawing(d, { file: 'warm.dxf' });

let segments = 0;
let clipped = 0;
let importS = Infinity;
let propsS = Infinity;
let parseS = Infinity;
for (let round = 0; round < 3; round++) {
  const t0 = performance.now();
  const read: Drawing[] = [];
  for (const [i, d] of drawings.entries()) read.push(await readDrawing(d, { file: `p${i}.dxf` }));
  importS = Math.min(importS, (performance.now() - t0) / 1000);
  segments = read.reduce((n, r) => n + segmentCount(r.region), 0);
  // resolveLoops clips only where loops cross or overlap, and says so in a warning.
  clipped = read.filter((r) => r.warnings.some((w) => /united/.test(w))).length;
  propsS = Math.min(propsS, time(() => read.forEach((r) => sectionProperties(r.region))));
  parseS = Math.min(parseS, time(() => drawings.forEach((d) => parser.parseSync(d))));
}

const rate = (s: number) => `${Math.round(count / s)} profiles/s`;
console.log(`${count} drawings, ${(bytes / 2 ** 20).toFixed(1)} MiB, ${segments} segments; ${cpus()[0]?.model ?? 'cpu'}, node ${process.version}`);
console.log(`import (read, stitch, resolve):  ${importS.toFixed(2)} s  ${rate(importS)}`);
console.log(`  + sectionProperties:           ${propsS.toFixed(2)} s  ${rate(importS + propsS)} together`);
console.log(`bare dxf-parser parseSync:       ${parseS.toFixed(2)} s  ${rate(parseS)}`);
console.log(`import / bare parse: ${(importS / parseS).toFixed(2)}; drawings that needed clipping: ${clipped}`);
