import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { catalogueKey, codeVersion, loadCatalogue } from '../src';

const dir = mkdtempSync(join(tmpdir(), 'keelson-source-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const HEAD = 'id,drawing,revision,material,units\n';

describe('loadCatalogue (folder)', () => {
  it('reads drawings in subfolders too, skipping dot-folders, and the manifest beside them', async () => {
    const root = join(dir, 'cat');
    mkdirSync(join(root, 'tubes'), { recursive: true });
    mkdirSync(join(root, '.cache'), { recursive: true });
    writeFileSync(join(root, 'a.dxf'), 'A');
    writeFileSync(join(root, 'tubes', 'b.DXF'), 'B');
    writeFileSync(join(root, '.cache', 'c.dxf'), 'C');
    writeFileSync(join(root, 'notes.txt'), 'x');
    writeFileSync(join(root, 'manifest.csv'), `${HEAD}A,a.dxf,,steel,mm\nB,tubes/b.DXF,,steel,mm\n`);
    const l = await loadCatalogue(root);
    expect(l.catalogue.drawings.map((d) => d.path)).toEqual(['a.dxf', 'tubes/b.DXF']);
    expect(l.manifest.rows.map((r) => r.id)).toEqual(['A', 'B']);
    expect(l.manifestDir).toBe('');
    expect(l.key).toBe(catalogueKey(root));
    expect(l.key).toMatch(/^cat-[0-9a-f]{8}$/);
  });

  it('takes a manifest inside the folder relative to itself, one outside relative to the root', async () => {
    const root = join(dir, 'cat2');
    mkdirSync(join(root, 'lists'), { recursive: true });
    writeFileSync(join(root, 'a.dxf'), 'A');
    writeFileSync(join(root, 'lists', 'm.json'), JSON.stringify({ profiles: [{ id: 'A', drawing: '../a.dxf', material: 'steel', units: 'mm' }] }));
    writeFileSync(join(dir, 'outside.csv'), `${HEAD}A,a.dxf,,steel,mm\n`);
    expect((await loadCatalogue(root, { manifest: join(root, 'lists', 'm.json') })).manifestDir).toBe('lists');
    expect((await loadCatalogue(root, { manifest: join(dir, 'outside.csv') })).manifestDir).toBe('');
  });

  it('refuses a folder without manifest, a missing path, a file that is neither folder nor ZIP', async () => {
    const root = join(dir, 'bare');
    mkdirSync(root);
    writeFileSync(join(root, 'a.dxf'), 'A');
    await expect(loadCatalogue(root)).rejects.toMatchObject({ code: 'NO_MANIFEST' });
    await expect(loadCatalogue(join(dir, 'nowhere'))).rejects.toMatchObject({ code: 'UNREADABLE_INPUT', detail: 'no such file or folder' });
    await expect(loadCatalogue(join(root, 'a.dxf'))).rejects.toMatchObject({ code: 'UNREADABLE_INPUT' });
  });
});

describe('codeVersion', () => {
  it('is the workspace version plus a hash of the packages sources, changing with any of them', async () => {
    const root = join(dir, 'repo');
    mkdirSync(join(root, 'packages', 'geometry', 'src'), { recursive: true });
    writeFileSync(join(root, 'package.json'), JSON.stringify({ version: '1.2.3' }));
    writeFileSync(join(root, 'packages', 'geometry', 'src', 'area.ts'), 'export const a = 1;');
    const v1 = await codeVersion(root);
    expect(v1).toMatch(/^1\.2\.3\+[0-9a-f]{12}$/);
    expect(await codeVersion(root)).toBe(v1);
    writeFileSync(join(root, 'packages', 'geometry', 'src', 'area.ts'), 'export const a = 2;');
    expect(await codeVersion(root)).not.toBe(v1);
    expect(await codeVersion()).toMatch(/^\d+\.\d+\.\d+\+[0-9a-f]{12}$/);
  });
});
