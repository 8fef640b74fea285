// Runs dxf-parser off the main thread, so that a file that makes it loop or balloon can be
// stopped (time and memory limits are set by parse.ts). Plain JavaScript: it runs as is under
// node, tsx and vitest. Whatever the parser prints goes into `notes` instead of the terminal.
import { format } from 'node:util';
import { parentPort, workerData } from 'node:worker_threads';

const notes = [];
const keep = (...args) => {
  if (notes.length < 20) notes.push(format(...args));
};
for (const k of ['log', 'info', 'warn', 'error', 'debug', 'trace']) globalThis.console[k] = keep;

// Imported after console is replaced: its logger binds the console methods when it loads.
const { default: DxfParser } = await import('dxf-parser');

try {
  const dxf = new DxfParser().parseSync(workerData.text);
  parentPort.postMessage({ ok: true, header: dxf?.header ?? {}, entities: dxf?.entities ?? [], notes });
} catch (e) {
  parentPort.postMessage({ ok: false, message: e instanceof Error ? e.message : String(e), notes });
}
