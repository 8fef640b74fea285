import { USAGE, parseArgs } from './args';
import { faultOf } from './faults';
import { propsCommand, type Io } from './props-command';
import { SERVE_USAGE, serveCommand } from './serve-command';

/** The whole CLI as a function of its arguments: returns the exit code. */
export async function run(argv: readonly string[], io: Io): Promise<number> {
  try {
    if (argv[0] === 'serve') return await serveCommand(argv.slice(1), io);
    // Loaded on demand, like the server: `keelson props` never pays for the verification modules.
    if (argv[0] === 'verify') return await (await import('./verify-command')).verifyCommand(argv.slice(1), io);
    if (argv[0] === 'diff') return await (await import('./diff-command')).diffCommand(argv.slice(1), io);
    const args = parseArgs(argv);
    if (args.command === 'help') {
      io.out(argv[0] === 'props' ? `${USAGE}\n` : await overview());
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

/** Every command with its usage line (`keelson help`). */
async function overview(): Promise<string> {
  const { VERIFY_USAGE } = await import('./verify-command');
  const { DIFF_USAGE } = await import('./diff-command');
  return [
    'keelson: section properties of DXF profile drawings (computed geometric properties; structural adequacy is for a licensed engineer under local codes)',
    '',
    '  props   properties of a drawing, a folder or a catalogue ZIP (table, JSON or CSV)',
    `          ${USAGE}`,
    '  verify  compare a catalogue with its manifest of published values; exit 3 when a check fails',
    `          ${VERIFY_USAGE}`,
    '  diff    what changed between two verification runs',
    `          ${DIFF_USAGE}`,
    '  serve   the HTTP service (API and web page)',
    `          ${SERVE_USAGE}`,
    '',
  ].join('\n');
}
