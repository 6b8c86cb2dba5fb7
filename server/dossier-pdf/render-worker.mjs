// Entry of the PDF worker thread. Plain JavaScript because a worker thread starts without the parent's
// TypeScript loader: it registers tsx, then loads the TypeScript worker.
import { register } from 'tsx/esm/api';

register();
await import('./render-worker.ts');
