import { UsageError } from './args';
import type { Io } from './props-command';

export const SERVE_USAGE = 'usage: keelson serve [--port N] [--host H] [--demo FOLDER]   (also PORT; data in ./data or KEELSON_DATA_DIR)';

export interface ServeArgs {
  readonly port?: number;
  readonly host?: string;
  /** Folder of DXF drawings submitted as the first job (`pnpm start`: the demo catalogue). */
  readonly demo?: string;
}

/** Parses `serve [--port N] [--host H] [--demo FOLDER]`; accepts `--opt value` and `--opt=value`. */
export function parseServeArgs(argv: readonly string[]): ServeArgs {
  const out: { port?: number; host?: string; demo?: string } = {};
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    const eq = a.indexOf('=');
    const name = eq < 0 ? a : a.slice(0, eq);
    if (name !== '--port' && name !== '--host' && name !== '--demo') throw new UsageError(`unknown option ${a}; ${SERVE_USAGE}`);
    const v = eq >= 0 ? a.slice(eq + 1) : argv[++i];
    if (v === undefined || v === '' || v.startsWith('--')) throw new UsageError(`${name} needs a value`);
    if (name === '--port') {
      const n = Number(v);
      if (!Number.isInteger(n) || n < 0 || n > 65535) throw new UsageError(`--port must be an integer from 0 to 65535, not "${v}"`);
      out.port = n;
    } else if (name === '--host') out.host = v;
    else out.demo = v;
  }
  return out;
}

/**
 * `keelson serve`: the HTTP service (services/api) in this process. Loaded on demand, so `keelson
 * props` never pays for the server's modules. Returns once listening; SIGTERM stops it.
 */
export async function serveCommand(argv: readonly string[], io: Io): Promise<number> {
  if (argv.some((a) => a === '--help' || a === '-h')) {
    io.out(`${SERVE_USAGE}\n`);
    return 0;
  }
  const args = parseServeArgs(argv);
  const { serve, ConfigError } = await import('@keelson/api');
  try {
    await serve({ ...args, print: (line) => io.out(`${line}\n`) });
    return 0;
  } catch (e) {
    const code = (e as { code?: string }).code;
    if (e instanceof ConfigError) io.err(`keelson: ${e.message}`);
    else if (code === 'EADDRINUSE') io.err(`keelson: the port is in use: choose another with --port or PORT (${(e as Error).message})`);
    else if (code === 'EACCES') io.err(`keelson: not allowed to listen there: ${(e as Error).message}`);
    else throw e;
    return 2;
  }
}
