import { describe, expect, it } from 'vitest';
import { fileSystemCause } from '../src';

describe('fileSystemCause', () => {
  it('names the file system’s ordinary refusals and leaves anything else to be a fault', () => {
    expect(fileSystemCause(Object.assign(new Error('x'), { code: 'ENOENT' }))).toBe('no such file or folder');
    expect(fileSystemCause({ code: 'EACCES' })).toBe('permission denied');
    expect(fileSystemCause({ code: 'EISDIR' })).toBe('is a folder');
    expect(fileSystemCause({ code: 'EMFILE' })).toBeNull();
    expect(fileSystemCause(new TypeError('bug'))).toBeNull();
    expect(fileSystemCause(null)).toBeNull();
  });
});
