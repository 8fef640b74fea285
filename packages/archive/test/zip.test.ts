import { describe, expect, it } from 'vitest';
import yazl from 'yazl';
import { ArchiveError, readZipCatalogue } from '../src';

function makeZip(files: [string, Buffer | string][]): Promise<Buffer> {
  const zip = new yazl.ZipFile();
  for (const [name, data] of files) zip.addBuffer(Buffer.isBuffer(data) ? data : Buffer.from(data), name);
  zip.end();
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    zip.outputStream.on('data', (c: Buffer) => chunks.push(c));
    zip.outputStream.on('end', () => resolve(Buffer.concat(chunks)));
    zip.outputStream.on('error', reject);
  });
}

/** Renames entries in place (same length, local header and central directory): yazl refuses bad names. */
function rename(buf: Buffer, from: string, to: string): Buffer {
  return Buffer.from(buf.toString('latin1').split(from).join(to), 'latin1');
}

describe('readZipCatalogue', () => {
  it('reads every DXF entry, lists the rest, keeps folders as names only', async () => {
    const buf = await makeZip([
      ['a.dxf', '0\nEOF\n'],
      ['sub/b.DXF', '0\nEOF\n'],
      ['README.txt', 'hello'],
    ]);
    const c = await readZipCatalogue(buf);
    expect(c.drawings.map((d) => d.name).sort()).toEqual(['a.dxf', 'sub/b.DXF']);
    expect(c.ignored).toEqual(['README.txt']);
    expect('data' in c.drawings[0]! && c.drawings[0].data.toString()).toBe('0\nEOF\n');
  });

  it('refuses ../ and absolute names and nested archives entry by entry', async () => {
    let buf = await makeZip([
      ['xx/evil.dxf', 'x'],
      ['Qabs.dxf', 'x'],
      ['inner.zip', 'PK'],
      ['good.dxf', '0\nEOF\n'],
    ]);
    buf = rename(rename(buf, 'xx/evil', '../evil'), 'Qabs', '/abs');
    const c = await readZipCatalogue(buf);
    const byName = Object.fromEntries(c.drawings.map((d) => [d.name, 'error' in d ? d.error : 'ok']));
    expect(byName['../evil.dxf']).toMatch(/\.\.\//);
    expect(byName['/abs.dxf']).toMatch(/absolute/);
    expect(byName['inner.zip']).toMatch(/nested archive/);
    expect(byName['good.dxf']).toBe('ok');
  });

  it('stops a zip bomb by the bytes actually inflated', async () => {
    const zeros = Buffer.alloc(8 * 2 ** 20);
    const buf = await makeZip([['bomb.dxf', zeros], ['ok.dxf', 'x']]);
    expect(buf.length).toBeLessThan(100_000);
    const one = await readZipCatalogue(buf, { maxEntries: 10, maxEntryBytes: 2 ** 20, maxTotalBytes: 2 ** 30 });
    expect(one.drawings.find((d) => d.name === 'bomb.dxf')).toMatchObject({ error: expect.stringMatching(/more than 1048576 bytes/) });
    expect(one.drawings.find((d) => d.name === 'ok.dxf')).toHaveProperty('data');
    await expect(readZipCatalogue(buf, { maxEntries: 10, maxEntryBytes: 2 ** 30, maxTotalBytes: 2 ** 20 })).rejects.toMatchObject({
      code: 'TOO_LARGE',
    });
  });

  it('caps the entry count and refuses what is not a ZIP', async () => {
    const buf = await makeZip(Array.from({ length: 20 }, (_, i): [string, string] => [`p${i}.dxf`, 'x']));
    await expect(readZipCatalogue(buf, { maxEntries: 10, maxEntryBytes: 100, maxTotalBytes: 1000 })).rejects.toMatchObject({
      code: 'TOO_MANY_ENTRIES',
    });
    await expect(readZipCatalogue(Buffer.from('0\nSECTION\n'))).rejects.toBeInstanceOf(ArchiveError);
    await expect(readZipCatalogue(buf.subarray(0, buf.length - 30))).rejects.toMatchObject({ code: 'NOT_ZIP' });
  });
});
