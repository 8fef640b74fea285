import { describe, expect, it } from 'vitest';
import { cataloguePath } from '../src';

describe('cataloguePath', () => {
  it('joins a drawing path to the manifest folder, either separator, dots resolved', () => {
    expect(cataloguePath('', 'a.dxf')).toBe('a.dxf');
    expect(cataloguePath('cat', './sub\\b.dxf')).toBe('cat/sub/b.dxf');
    expect(cataloguePath('cat/x', '../b.dxf')).toBe('cat/b.dxf');
  });

  it('refuses absolute paths and paths that climb out of the catalogue', () => {
    expect(() => cataloguePath('', '/etc/passwd')).toThrow(/absolute paths are refused/);
    expect(() => cataloguePath('', 'C:\\x.dxf')).toThrow(/absolute/);
    expect(() => cataloguePath('cat', '../../x.dxf')).toThrow(/outside the catalogue/);
  });
});
