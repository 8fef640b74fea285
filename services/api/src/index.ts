export { build, type BuildOptions } from './app';
export { serve, parsePort, type ServeOptions } from './server';
export { configFromEnv, ConfigError, DEFAULTS, type Config } from './config';
export { ERRORS, DRAWING_CODES, ApiError, type ErrorCode } from './errors';
export type { Store } from './store';
