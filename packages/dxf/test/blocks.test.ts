import { describe, expect, it } from 'vitest';
import { regionMoments, type Region } from '@keelson/geometry';
import { readDrawing, writeDxfDrawing, type DxfDrawing, type DxfEntity } from '../src';

const read = (d: DxfDrawing, opts: { hiddenLayers?: boolean } = {}) => readDrawing(writeDxfDrawing(d), { file: 'b.dxf', ...opts });
const area = (r: Region) => regionMoments(r).a;
const square = (x: number, y: number, s: number, layer?: string): DxfEntity => ({
  type: 'LWPOLYLINE',
  vertices: [[x, y], [x + s, y], [x + s, y + s], [x, y + s]].map(([vx, vy]) => ({ x: vx!, y: vy!, bulge: 0 })),
  ...(layer ? { layer } : {}),
});

describe('blocks and layers', () => {
  // A block holding a 2 × 2 square on layer 0 (it takes the INSERT's layer) and a 1 × 1 square on its own layer OWN.
  const blocks = [{ name: 'B', entities: [square(0, 0, 2), square(10, 0, 1, 'OWN')] }];
  const at = (layer: string): DxfEntity => ({ type: 'INSERT', block: 'B', at: { x: 0, y: 0 }, layer });

  it('an INSERT on a frozen layer hides its whole block', async () => {
    const d = await read({ unit: 'mm', layers: [{ name: 'F', frozen: true }, { name: 'OWN' }], blocks, entities: [at('F'), square(50, 0, 3)] });
    // Only the loose 3 × 3 square is left — common practice.
    expect(area(d.region)).toBe(9);
    expect(d.warnings[0]).toBe('read layer 0; left out F (frozen, 1 entity)');
  });

  it('an INSERT on a switched-off layer hides what lies on layer 0 in its block, not what has a layer of its own', async () => {
    const d = await read({ unit: 'mm', layers: [{ name: 'X', off: true }, { name: 'OWN' }], blocks, entities: [at('X')] });
    expect(area(d.region)).toBe(1);
    expect(d.warnings[0]).toBe('read layer OWN; left out X (off, 1 entity)');
    // With hidden layers read, both squares: 4 + 1.
    expect(area((await read({ unit: 'mm', layers: [{ name: 'X', off: true }, { name: 'OWN' }], blocks, entities: [at('X')] }, { hiddenLayers: true })).region)).toBe(5);
  });

  it('an entity on layer 0 inside a block is on the layer of its INSERT', async () => {
    const text = writeDxfDrawing({ unit: 'mm', layers: [{ name: 'PROFILE' }, { name: 'OWN' }], blocks, entities: [at('PROFILE')] });
    const d = await readDrawing(text, { file: 'b.dxf', layers: ['PROFILE'] });
    expect(area(d.region)).toBe(4);
  });

  it('an external reference is reported, not read', async () => {
    const text = writeDxfDrawing({ unit: 'mm', blocks: [{ name: 'XR', entities: [] }], entities: [{ type: 'INSERT', block: 'XR', at: { x: 0, y: 0 } }, square(0, 0, 1)] })
      // Block flag 4: an external reference (AutoCAD DXF Reference, BLOCK group 70).
      .replace('\n2\nXR\n70\n0\n', '\n2\nXR\n70\n4\n');
    const d = await readDrawing(text, { file: 'b.dxf' });
    expect(d.warnings).toContain('not read: external reference XR (drawn in another file)');
  });

  it('block names are matched case-insensitively, and entities inserted report the block they came through', async () => {
    const open: DxfEntity = { type: 'LINE', a: { x: 0, y: 0 }, b: { x: 5, y: 0 } };
    const text = writeDxfDrawing({ unit: 'mm', blocks: [{ name: 'Inner', entities: [open] }, { name: 'OUTER', entities: [{ type: 'INSERT', block: 'INNER', at: { x: 1, y: 1 } }] }], entities: [{ type: 'INSERT', block: 'outer', at: { x: 0, y: 0 } }] });
    await expect(readDrawing(text, { file: 'b.dxf' })).rejects.toMatchObject({ code: 'NO_CLOSED_OUTLINE', message: /\(1, 1\) on LINE \(handle \w+, layer 0, line \d+\) in block OUTER → Inner/ });
  });
});
