// Entry of a reference worker thread: the TypeScript loader first (workers do not inherit it), then the worker.
import { register } from 'tsx/esm/api';

register();
await import('./referenceWorkerMain.ts');
