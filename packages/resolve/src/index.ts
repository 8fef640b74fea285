export { resolveLoops, type Resolution } from './resolve';
export { ResolveError, type ResolveErrorCode } from './errors';
export { unionPolygons, type UnionResult } from './clip';
