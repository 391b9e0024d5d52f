/**
 * The analysis worker: every heavy step of the web app runs here (decoding, opencv.js, measuring,
 * tessellating, exports, and storing results in IndexedDB), so the page never blocks. Its API is made of
 * one module per feature (features/: analysis and preview, edits, exports, kinetics) over the application
 * layer (src/app) and the core, behind the one protocol of protocol.ts. A failure reaches the page as a
 * WireError (kind and message), never as text to match. opencv.js and the core load lazily, on the first
 * call that needs them.
 */
import * as Comlink from 'comlink';
import { withWireErrors } from '../src/app/wire';
import { analysisFeature } from './features/analysis';
import { exportsFeature } from './features/exports';
import { kineticsFeature } from './features/kinetics';
import type { WorkerApi } from './protocol';
import { createSession } from './session';

const session = createSession();

const api: WorkerApi = withWireErrors({
  ...analysisFeature(session),
  ...exportsFeature(session),
  ...kineticsFeature(session),
  crash() {
    setTimeout(() => { throw new Error('Tessellab test: the worker was made to fail.'); }, 0);
  },
});

Comlink.expose(api);
