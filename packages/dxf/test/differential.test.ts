import { readFileSync, readdirSync } from 'node:fs';
import DxfParser from 'dxf-parser';
import { describe, expect, it } from 'vitest';
import { readStructure } from '../src/structure';
import { readTags } from '../src/tags';
import { Fields } from '../src/fields';

const demo = new URL('../../../fixtures/demo/', import.meta.url);

interface ParsedEntity {
  type: string;
  handle?: string;
  layer?: string;
  vertices?: { x: number; y: number; bulge?: number }[];
  center?: { x: number; y: number };
  radius?: number;
  startAngle?: number;
  endAngle?: number;
}

// Keelson reads the group codes itself; dxf-parser, which it used before, is the second opinion:
// on the demo catalogue both must see the same entities with the same numbers.
describe('the tag reader agrees with dxf-parser where dxf-parser is right', () => {
  for (const name of readdirSync(demo).filter((f) => f.endsWith('.dxf'))) {
    it(name, () => {
      const text = readFileSync(new URL(name, demo), 'utf8');
      const theirs = (new DxfParser().parseSync(text) as unknown as { entities: ParsedEntity[] }).entities;
      const { tags, complete } = readTags(text, name);
      const ours = readStructure(tags, complete, name).entities;
      expect(ours.map((e) => [e.type, e.handle, e.layer])).toEqual(theirs.map((e) => [e.type, e.handle, e.layer]));
      ours.forEach((e, i) => {
        const f = new Fields(tags, e.at, e.end, e, name);
        const t = theirs[i]!;
        if (e.type === 'LINE') expect([f.point(10, 'a'), f.point(11, 'b')]).toEqual(t.vertices!.map(({ x, y }) => ({ x, y })));
        if (e.type === 'ARC' || e.type === 'CIRCLE') {
          expect(f.point(10, 'c')).toEqual({ x: t.center!.x, y: t.center!.y });
          expect(f.num(40, 'r')).toBe(t.radius);
        }
        // dxf-parser gives ARC angles in radians (converted in another order: equal to the last bit or two).
        if (e.type === 'ARC')
          [f.num(50, 'a0'), f.num(51, 'a1')].forEach((d, k) => expect((d * Math.PI) / 180).toBeCloseTo([t.startAngle, t.endAngle][k]!, 14));
        if (e.type === 'LWPOLYLINE') {
          const xs = [];
          for (let k = e.at + 1; k < e.end; k++) if (tags.codes[k] === 10) xs.push(f.numAt(k));
          expect(xs).toEqual(t.vertices!.map((v) => v.x));
        }
      });
    });
  }
});
