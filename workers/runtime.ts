/**
 * What the worker loads lazily, once: opencv.js with the analysis pipeline (on the first call that needs
 * them), the exporters, and the reference's web workers.
 */
import type { ClosablePool } from '../src/core/reference/workerPool';
import type { ProgressFn } from './protocol';
import { createBrowserReferencePool } from './referencePool';

/** The application layer's analysis and the core pipeline, with opencv.js registered and ready. */
export interface Pipeline {
  app: typeof import('../src/app/analyse');
  core: typeof import('../src/core/analyze');
}

let loading: Promise<Pipeline> | null = null;

/** The pipeline, loaded on first use (a failed load is tried again on the next call). */
export function pipeline(onProgress?: ProgressFn): Promise<Pipeline> {
  if (!loading) {
    loading = (async () => {
      onProgress?.('Loading opencv.js', 0);
      await import('../src/core/cv/browser');
      const cvIndex = await import('../src/core/cv/index');
      // loadCv resolves to a plain { cv } handle; awaiting it only waits for the WebAssembly runtime.
      await cvIndex.loadCv();
      onProgress?.('Loading opencv.js', 1);
      const [app, core] = await Promise.all([import('../src/app/analyse'), import('../src/core/analyze')]);
      return { app, core };
    })();
    loading.catch(() => { loading = null; });
  }
  return loading;
}

let pool: ClosablePool | null = null;

/** The reference's web workers, started on the first analysis that draws a reference. */
export function referencePool(): ClosablePool {
  return (pool ??= createBrowserReferencePool());
}

export function exporters(): Promise<typeof import('../src/core/export/index')> {
  return import('../src/core/export/index');
}
