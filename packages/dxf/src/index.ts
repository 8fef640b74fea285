export {
  readDrawing,
  readProfiles,
  DEFAULT_MAX_BYTES,
  DEFAULT_MAX_SEGMENTS,
  type Drawing,
  type DrawingFault,
  type DrawingSet,
  type ReadOptions,
} from './read';
export { DEFAULT_JOIN_TOLERANCE } from './assemble';
export type { ParseLimits } from './limits';
export { SPLIT_MODES, type SplitMode } from './split';
export type { LayerSelection } from './layers';
export { DxfError, DXF_ERROR_CODES, type DxfErrorCode } from './errors';
export * from './write';
export { deviationBounds } from './accuracy';
