export { ArchiveError, type ArchiveErrorCode } from './errors';
export { DEFAULT_ZIP_LIMITS, readZipCatalogue, type ZipCatalogue, type ZipDrawing, type ZipLimits } from './zip';
export { fileSystemCause } from './fs-cause';
