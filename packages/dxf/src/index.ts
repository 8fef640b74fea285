export { readDrawing, DEFAULT_MAX_BYTES, type Drawing, type ReadOptions } from './read';
export { DxfError, DXF_ERROR_CODES, type DxfErrorCode } from './errors';
export type { ParseLimits } from './parse';
export * from './write';
