// Entry of the computation threads (piscina). Plain JavaScript, so that it starts the same under
// node, tsx and vitest, whose TypeScript loaders do not all reach worker threads: it registers tsx's
// loader in this thread, then loads the TypeScript task.
import { register } from 'tsx/esm/api';

register();
const { runTask } = await import('./task.ts');

export default runTask;
