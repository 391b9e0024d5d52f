/** Creates the analysis worker (a module worker, bundled by Vite). */
export function makeAnalysisWorker(): Worker {
  return new Worker(new URL('../../workers/analysis.worker.ts', import.meta.url), { type: 'module', name: 'tessellab-analysis' });
}
