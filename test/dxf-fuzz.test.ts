import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { PROPERTY_DIMENSION, sectionProperties, type PropertyKey } from '@keelson/geometry';
import { DXF_ERROR_CODES, DxfError, readProfiles, SPLIT_MODES } from '@keelson/dxf';
import { ARC, CIRCLE, LINE, LWPOLYLINE, POLYLINE, dxf, rectLines } from '../packages/dxf/test/dxf';

const fixture = (name: string) => readFileSync(new URL(`../fixtures/import/${name}.dxf`, import.meta.url), 'latin1');

/** Small drawings covering every entity kind, block nesting, arrays, hatches, layers and OCS. */
const SEEDS: readonly string[] = [
  dxf([...rectLines(0, 0, 100, 50), CIRCLE([50, 25], 10)]),
  dxf([LWPOLYLINE([[0, 0], [20, 0, 1], [20, 10], [0, 10, 1]]), ARC([10, 5], 3, 0, 180, -1), LINE([7, 5], [13, 5])]),
  dxf([POLYLINE([[0, 0], [20, 0, 0.5], [20, 10], [0, 10]])]),
  ...[
    'quarter-disc-mirrored-arc',
    'angle-mirrored-insert',
    'plate-rotated-scaled-insert',
    'nested-blocks',
    'ellipse-half-mirrored',
    'circle-rational-spline',
    'parabola-spline',
    't-overlapping-rectangles',
    'rectangle-lines-small-gaps',
    'hole-on-other-layer',
    'hatch-rounded-plate',
    'hatch-edges',
    'array-insert',
    'split-sheet',
  ].map(fixture),
];

const VALUES = ['', ' ', 'NaN', 'nan', 'inf', '1e999', '-1e400', '1e300', '-1e300', '1e-300', '0', '-0', '-1', '1', '2', '3', '7', '32767', '2147483648', '1e9', '0.5', '360', '-360', 'x', 'EOF', 'SECTION', 'ENDSEC', 'POLYLINE', 'VERTEX', 'SEQEND', 'INSERT', 'BLOCK', 'ENDBLK', 'HATCH', 'SPLINE', 'ELLIPSE', 'LWPOLYLINE', 'ENTITIES', 'BLOCKS', '*U1', 'PLATE', 'DISC', 'AutoCAD Binary DXF'];
const CODES = ['0', '2', '5', '8', '10', '20', '11', '21', '40', '41', '42', '43', '44', '45', '50', '51', '62', '66', '67', '70', '71', '72', '73', '74', '90', '91', '92', '93', '94', '95', '96', '97', '210', '220', '230', '-1', '1071', 'x', ''];

/** One edit of the text's lines (or a cut of its characters). */
type Mutation = (lines: string[]) => string[];

const index = fc.nat();
// Value edits keep the pairs aligned and reach the geometry; line edits and cuts break the structure.
const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  { weight: 4, arbitrary: fc.tuple(index, fc.constantFrom(...VALUES)).map(([i, v]) => (l: string[]) => l.map((x, k) => (k === ((i % l.length) | 1) ? v : x))) },
  { weight: 4, arbitrary: fc.tuple(index, fc.double()).map(([i, v]) => (l: string[]) => l.map((x, k) => (k === ((i % l.length) | 1) ? String(v) : x))) },
  {
    weight: 3,
    arbitrary: fc.tuple(index, fc.double({ min: -2, max: 2, noNaN: true })).map(([i, f]) => (l: string[]) =>
      // A number nudged: geometry moves a little, entities stay well formed.
      l.map((x, k) => (k === ((i % l.length) | 1) && x.trim() !== '' && Number.isFinite(Number(x)) ? String(Number(x) * (1 + f / 10) + f) : x)),
    ),
  },
  { weight: 1, arbitrary: fc.tuple(index, fc.constantFrom(...CODES)).map(([i, c]) => (l: string[]) => l.map((x, k) => (k === (i % l.length) - ((i % l.length) & 1) ? c : x))) },
  { weight: 1, arbitrary: fc.tuple(index).map(([i]) => (l: string[]) => l.filter((_, k) => k !== i % l.length)) },
  { weight: 1, arbitrary: fc.tuple(index).map(([i]) => (l: string[]) => [...l.slice(0, (i % l.length) + 1), ...l.slice(i % l.length)]) },
  {
    weight: 1,
    arbitrary: fc.tuple(index, index).map(([i, j]) => (l: string[]) => {
      const out = [...l];
      const [a, b] = [i % l.length, j % l.length];
      [out[a], out[b]] = [out[b]!, out[a]!];
      return out;
    }),
  },
  {
    weight: 2,
    arbitrary: fc.tuple(index, fc.constantFrom(...CODES), fc.constantFrom(...VALUES)).map(([i, c, v]) => (l: string[]) => [...l.slice(0, i % l.length & ~1), c, v, ...l.slice(i % l.length & ~1)]),
  },
  { weight: 1, arbitrary: fc.tuple(index).map(([i]) => (l: string[]) => l.slice(0, 1 + (i % Math.max(1, l.length)))) },
);

const mutated = fc.record({
  seed: fc.constantFrom(...SEEDS.keys()),
  edits: fc.array(mutation, { minLength: 1, maxLength: 4 }),
  // A cut at any character, now and then: truncated files.
  cut: fc.oneof({ weight: 9, arbitrary: fc.constant(undefined) }, { weight: 1, arbitrary: fc.nat() }),
  split: fc.constantFrom(...SPLIT_MODES),
});

const KEYS = Object.keys(PROPERTY_DIMENSION) as PropertyKey[];
const CODES_KNOWN = new Set<string>(DXF_ERROR_CODES);
const RUNS = Number(process.env.FUZZ_RUNS ?? 3000);
const LIMIT_MS = 2000;

describe('fuzz: mutated and truncated drawings give a result or a clear error', () => {
  it(`${RUNS} mutations: never a crash, a hang past the limit, or a non-finite property`, async () => {
    let results = 0;
    let refusals = 0;
    let slowest = 0;
    const codes = new Map<string, number>();
    const t0 = performance.now();
    await fc.assert(
      fc.asyncProperty(mutated, async ({ seed, edits, cut, split }) => {
        let lines = SEEDS[seed]!.split('\n');
        for (const edit of edits) if (lines.length) lines = edit(lines);
        let text = lines.join('\n');
        if (cut !== undefined) text = text.slice(0, cut % (text.length + 1));
        const start = performance.now();
        try {
          const set = await readProfiles(text, { file: 'fuzz.dxf', split, drawingUnits: 'mm', timeoutMs: LIMIT_MS, maxSegments: 100_000 });
          for (const p of set.profiles) {
            if ('error' in p) {
              expect(p.error).toBeInstanceOf(DxfError);
              expect(p.error.message).not.toMatch(/[\r\n]/);
              continue;
            }
            const props = sectionProperties(p.region);
            for (const k of KEYS) expect(Number.isFinite(props[k]), `${k} = ${props[k]}`).toBe(true);
            expect(Number.isFinite(p.deviation)).toBe(true);
          }
          results++;
        } catch (e) {
          if (!(e instanceof DxfError)) throw e;
          expect(CODES_KNOWN.has(e.code)).toBe(true);
          expect(e.message).not.toMatch(/[\r\n]/);
          expect(e.message.startsWith('fuzz.dxf: ')).toBe(true);
          refusals++;
          codes.set(e.code, (codes.get(e.code) ?? 0) + 1);
        }
        slowest = Math.max(slowest, performance.now() - start);
        expect(performance.now() - start).toBeLessThan(LIMIT_MS + 500);
      }),
      { numRuns: RUNS, seed: Number(process.env.FUZZ_SEED ?? 20261201), endOnFailure: true },
    );
    const seconds = (performance.now() - t0) / 1000;
    // For the record (issue 3 asks for the run count and time): printed, never asserted beyond the limits above.
    console.info(`fuzz: ${RUNS} drawings in ${seconds.toFixed(1)} s (${results} read, ${refusals} refused; slowest ${slowest.toFixed(0)} ms): ${[...codes].map(([c, n]) => `${c} ${n}`).join(', ')}`);
    expect(results + refusals).toBe(RUNS);
  }, 120_000);
});
