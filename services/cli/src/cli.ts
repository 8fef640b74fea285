import { USAGE, parseArgs } from './args';
import { faultOf } from './faults';
import { propsCommand, type Io } from './props-command';
import { serveCommand } from './serve-command';

/** The whole CLI as a function of its arguments: returns the exit code. */
export async function run(argv: readonly string[], io: Io): Promise<number> {
  try {
    if (argv[0] === 'serve') return await serveCommand(argv.slice(1), io);
    // Loaded on demand, like the server: `keelson props` never pays for the verification modules.
    if (argv[0] === 'verify') return await (await import('./verify-command')).verifyCommand(argv.slice(1), io);
    if (argv[0] === 'diff') return await (await import('./diff-command')).diffCommand(argv.slice(1), io);
    const args = parseArgs(argv);
    if (args.command === 'help') {
      io.out(`${USAGE}\n`);
      return 0;
    }
    return await propsCommand(args, io);
  } catch (e) {
    const f = faultOf(e);
    io.err(f.line);
    if (f.exit === 1 && io.debug && f.stack) io.err(f.stack);
    return f.exit;
  }
}
