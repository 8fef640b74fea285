import { run } from './cli';

// A closed pipe (`keelson props … | head`) is not an error of ours.
process.stdout.on('error', (e: NodeJS.ErrnoException) => {
  if (e.code !== 'EPIPE') throw e;
});

process.exitCode = await run(process.argv.slice(2), {
  out: (text) => process.stdout.write(text),
  err: (line) => process.stderr.write(`${line}\n`),
  debug: process.env.KEELSON_DEBUG === '1',
});
