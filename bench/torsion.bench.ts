/**
 * Time of the full property set of a typical extrusion profile at the default target (1e-3 on J):
 * `profileOf` on the drawing, i.e. the exact closed-form set (area … plastic moduli, with their
 * bounds and the symmetry test) plus J, Cw and the shear centre by finite elements (mesh, two
 * quadratic levels, Richardson estimate). The profile is a finned heat sink with about 500
 * boundary segments (lines and fillet arcs) and two screw holes, written to DXF and read back
 * once before timing, as the CLI and the service would read it. Not a test: prints figures,
 * asserts nothing. Run with `pnpm bench:torsion` (one core: the work is single-threaded).
 */
import { cpus, loadavg } from 'node:os';
import { performance } from 'node:perf_hooks';
import { readDrawing, writeDxf } from '@keelson/dxf';
import { arc, makeRegion, sectionProperties, segmentCount, type Region } from '@keelson/geometry';
import { profileOf } from '@keelson/profile';
import { filletedPolygon, type Corner } from '@keelson/shapes';
import { torsionProperties } from '@keelson/torsion';

/**
 * Heat sink: base plate w × tb with `fins` fins (thickness tf, height hf) on top and `ribs` short
 * ribs underneath, every corner filleted (root radius rr, tip radius rt), and two round holes
 * (screw ports) in the base. Units: mm.
 */
export function extrusion(fins = 30, ribs = 30): Region {
  const tb = 10;
  const tf = 2.5;
  const pitch = 7;
  const hf = 35;
  const rr = 1;
  const rt = 0.8;
  const w = fins * pitch + 6;
  const corners: Corner[] = [];
  // Underside from left to right: ribs 3 deep, 2.5 wide.
  corners.push({ x: 0, y: 0, r: 2 });
  const rp = (w - 12) / ribs;
  for (let i = 0; i < ribs; i++) {
    const x0 = 6 + i * rp + (rp - 2.5) / 2;
    corners.push({ x: x0, y: 0, r: rr }, { x: x0, y: -3, r: rt }, { x: x0 + 2.5, y: -3, r: rt }, { x: x0 + 2.5, y: 0, r: rr });
  }
  corners.push({ x: w, y: 0, r: 2 }, { x: w, y: tb, r: 2 });
  // Top from right to left: fins.
  for (let i = fins - 1; i >= 0; i--) {
    const x0 = 3 + i * pitch + (pitch - tf) / 2;
    corners.push({ x: x0 + tf, y: tb, r: rr }, { x: x0 + tf, y: tb + hf, r: rt }, { x: x0, y: tb + hf, r: rt }, { x: x0, y: tb, r: rr });
  }
  corners.push({ x: 0, y: tb, r: 2 });
  const hole = (cx: number) => [arc({ x: cx, y: tb / 2 }, 2.2, 0, 2 * Math.PI)];
  return makeRegion([{ outer: filletedPolygon(corners), holes: [hole(w * 0.25), hole(w * 0.75)] }]);
}

function quantile(sorted: number[], q: number): number {
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1));
  return sorted[i]!;
}

/** Median, 95th percentile and minimum of the wall-clock times of `runs` calls, after `warm` untimed ones. */
function timeOf(f: () => unknown, warm: number, runs: number): { median: number; p95: number; min: number; cpu: number } {
  for (let i = 0; i < warm; i++) f(); // the engine compiles the hot loops during these
  const times: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < runs; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    f();
    times.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
  }
  times.sort((a, b) => a - b);
  cpu.sort((a, b) => a - b);
  return { median: quantile(times, 0.5), p95: quantile(times, 0.95), min: times[0]!, cpu: quantile(cpu, 0.5) };
}

const region = extrusion();
const drawing = await readDrawing(writeDxf(region, { unit: 'mm' }), { file: 'heat-sink-216.dxf' });
const runs = Number(process.env.RUNS ?? 30);
const load0 = loadavg()[0]!;
const full = timeOf(() => profileOf(drawing, 'heat-sink-216', 'heat-sink-216.dxf'), 10, runs);
const closed = timeOf(() => sectionProperties(drawing.region), 10, runs);
const fe = timeOf(() => torsionProperties(drawing.region), 10, runs);
const load1 = loadavg()[0]!;
const g = sectionProperties(drawing.region);
const p = torsionProperties(drawing.region);
const ms = (t: { median: number; p95: number; min: number }) =>
  `median ${t.median.toFixed(1)} ms, p95 ${t.p95.toFixed(1)} ms, min ${t.min.toFixed(1)} ms`;
console.log(`torsion bench — Node ${process.version}, ${cpus()[0]?.model ?? 'cpu'}`);
console.log(`profile: heat sink ${(g.xmax - g.xmin).toFixed(0)} × ${(g.ymax - g.ymin).toFixed(0)} mm, ${segmentCount(drawing.region)} boundary segments, 2 holes, A = ${g.A.toFixed(1)} mm²`);
console.log(`J  = ${p.J.toPrecision(6)} mm⁴  (±${(p.accuracy.J * 100).toPrecision(2)} %)`);
console.log(`Cw = ${p.Cw.toPrecision(6)} mm⁶  (±${(p.accuracy.Cw * 100).toPrecision(2)} %)`);
console.log(`xs, ys = ${p.xs.toFixed(3)}, ${p.ys.toFixed(3)} mm  (±${(p.accuracy.xs * 100).toPrecision(2)} % of size); order ${p.order.toFixed(2)}`);
for (const [i, L] of p.levels.entries())
  console.log(`level ${i}: ${L.nodes} nodes, ${L.elements} elements, ${p.iterations[i]} CG iterations`);
console.log(`full property set (profileOf), ${runs} runs: ${ms(full)} (target: median ≤ 100 ms)`);
console.log(`  of which closed-form set (sectionProperties): ${ms(closed)}`);
console.log(`  of which torsion and warping (torsionProperties): ${ms(fe)}`);
console.log(`CPU time per full run: median ${full.cpu.toFixed(1)} ms; load average ${load0.toFixed(1)} → ${load1.toFixed(1)} on ${cpus().length} cores`);
