/**
 * Time of `sectionProperties` (area, centroid, second moments, extreme fibres, plastic moduli) on
 * (a) a finned heat-sink outline of about 2,000 lines and arcs and (b) every demo-catalogue profile.
 * Not a test: prints figures, asserts nothing. Run with `pnpm bench`.
 */
import { existsSync, readFileSync, readdirSync } from 'node:fs';
import { cpus } from 'node:os';
import { fileURLToPath } from 'node:url';
import { performance } from 'node:perf_hooks';
import { makeRegion, sectionProperties, segmentCount, type Region } from '@keelson/geometry';
import { filletedPolygon, type Corner } from '@keelson/shapes';
import { PROFILES } from '../fixtures/catalogue';

/**
 * Extruded heat sink: base plate w × tb with `fins` fins of thickness tf and height hf standing on it,
 * root fillets rr, fin-tip radii rt, base corners rb. Every corner is filleted: 4 per fin + 4 for the
 * base → 2 segments per corner (arc and side).
 */
function heatSink(fins: number): Region {
  const tb = 6;
  const tf = 1.2;
  const gap = 1.6;
  const hf = 30;
  const margin = 2;
  const rr = 0.5;
  const rt = 0.5;
  const rb = 1;
  const w = 2 * margin + fins * tf + (fins - 1) * gap;
  const corners: Corner[] = [
    { x: 0, y: 0, r: rb },
    { x: w, y: 0, r: rb },
    { x: w, y: tb, r: rb },
  ];
  // Along the top of the base from right to left, up and down each fin.
  for (let i = fins - 1; i >= 0; i--) {
    const x1 = margin + i * (tf + gap) + tf;
    const x0 = x1 - tf;
    corners.push({ x: x1, y: tb, r: rr }, { x: x1, y: tb + hf, r: rt }, { x: x0, y: tb + hf, r: rt }, { x: x0, y: tb, r: rr });
  }
  corners.push({ x: 0, y: tb, r: rb });
  return makeRegion([{ outer: filletedPolygon(corners), holes: [] }]);
}

interface Case {
  name: string;
  region: Region;
}

/** Demo profiles as the reader gets them from fixtures/demo, or as the builders draw them if the reader is absent. */
async function demoCases(): Promise<{ cases: Case[]; source: string }> {
  const dir = fileURLToPath(new URL('../fixtures/demo/', import.meta.url));
  const index = fileURLToPath(new URL('../packages/dxf/src/index.ts', import.meta.url));
  const dxf: Record<string, unknown> = existsSync(index) ? await import(index) : {};
  if (typeof dxf.readDrawing !== 'function')
    return { cases: PROFILES.map((p) => ({ name: p.name, region: p.build() })), source: 'built with @keelson/shapes' };
  const read = dxf.readDrawing as (text: string, o: { file: string }) => Promise<{ region: Region }> | { region: Region };
  const cases: Case[] = [];
  for (const file of readdirSync(dir).filter((f) => f.endsWith('.dxf')).sort()) {
    const { region } = await read(readFileSync(dir + file, 'utf8'), { file });
    cases.push({ name: file.replace(/\.dxf$/, ''), region });
  }
  return { cases, source: 'read from fixtures/demo with readDrawing' };
}

const quantile = (sorted: number[], q: number) => sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)]!;

/** Median and 95th percentile over at least `minRuns` timed runs (and at least `budgetMs` of them), after warm-up. */
function measure(region: Region, minRuns = 50, budgetMs = 1000): { median: number; p95: number; runs: number } {
  let sink = 0;
  const warmEnd = performance.now() + 200;
  for (let i = 0; i < 10 || performance.now() < warmEnd; i++) sink += sectionProperties(region).A;
  const times: number[] = [];
  const end = performance.now() + budgetMs;
  while (times.length < minRuns || (performance.now() < end && times.length < 10_000)) {
    const t0 = performance.now();
    sink += sectionProperties(region).A;
    times.push(performance.now() - t0);
  }
  if (!Number.isFinite(sink)) throw new Error('non-finite area');
  times.sort((a, b) => a - b);
  return { median: quantile(times, 0.5), p95: quantile(times, 0.95), runs: times.length };
}

const sink = heatSink(250);
const { cases, source } = await demoCases();
const all: Case[] = [{ name: 'heat-sink-250-fins (synthetic)', region: sink }, ...cases];

console.log(`sectionProperties — Node ${process.version}, ${cpus().length} × ${cpus()[0]?.model ?? 'unknown CPU'}`);
console.log(`synthetic outline: ${segmentCount(sink)} segments; demo profiles ${source}`);
console.log('');
const rows = [['profile', 'segments', 'median ms', 'p95 ms', 'runs']];
for (const c of all) {
  const m = measure(c.region);
  rows.push([c.name, String(segmentCount(c.region)), m.median.toFixed(3), m.p95.toFixed(3), String(m.runs)]);
}
const widths = rows[0]!.map((_, i) => Math.max(...rows.map((r) => r[i]!.length)));
const cell = (s: string, i: number) => (i === 0 ? s.padEnd(widths[i]!) : s.padStart(widths[i]!));
rows.forEach((r, k) => {
  console.log(r.map(cell).join('  '));
  if (k === 0) console.log(widths.map((w) => '-'.repeat(w)).join('  '));
});
