// Runs dxf-parser off the main thread, so that a file that makes it loop or balloon can be
// stopped (time and memory limits are set by parse.ts). One thread serves many files in turn.
// Plain JavaScript: it runs as is under node, tsx and vitest. Whatever the parser prints goes
// into `notes`, returned with each result, instead of the terminal.
import { format } from 'node:util';
import { parentPort } from 'node:worker_threads';

let notes = [];
const keep = (...args) => {
  if (notes.length < 20) notes.push(format(...args));
};
for (const k of ['log', 'info', 'warn', 'error', 'debug', 'trace']) globalThis.console[k] = keep;

// Imported after console is replaced: its logger binds the console methods when it loads.
const { default: DxfParser } = await import('dxf-parser');

parentPort.on('message', ({ id, text }) => {
  notes = [];
  try {
    const dxf = new DxfParser().parseSync(text);
    parentPort.postMessage({ id, ok: true, header: dxf?.header ?? {}, entities: dxf?.entities ?? [], notes });
  } catch (e) {
    parentPort.postMessage({ id, ok: false, message: e instanceof Error ? e.message : String(e), notes });
  }
});
