export { SourceError, type SourceErrorCode } from './errors';
export { catalogueKey, loadCatalogue, type LoadOptions, type LoadedCatalogue } from './catalogue-source';
export { FileRunHistory, type RunEntry, type RunHistory } from './history';
export { codeVersion } from './code-version';
export { fetchTransport } from './http-transport';
