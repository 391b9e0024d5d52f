/**
 * The only place that loads opencv.js.
 *
 * The opencv.js module object has a `then` method, so it must never be the resolution value of a promise
 * (that loops forever). We await readiness and hand it on inside a plain object: `{ cv }`.
 * In Node it is loaded with createRequire; in the browser the worker imports `./browser` first, which
 * registers the statically imported module here.
 */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type CV = any;

export interface CvHandle {
  cv: CV;
}

let handle: CvHandle | null = null;
let pending: Promise<void> | null = null;
let registered: CV | null = null;

/** Called by the browser entry with the statically imported module. */
export function registerCv(mod: CV): void {
  registered = mod;
}

function waitReady(mod: CV): Promise<void> {
  return new Promise<void>((resolve) => {
    if (mod && typeof mod.Mat === 'function') {
      resolve();
      return;
    }
    mod.onRuntimeInitialized = () => resolve();
  });
}

/** Loads opencv.js once and resolves to a plain object holding it. */
export async function loadCv(): Promise<CvHandle> {
  if (handle) return handle;
  if (!pending) {
    pending = (async () => {
      let mod: CV = registered;
      if (!mod) {
        const { createRequire } = await import('node:module');
        mod = createRequire(import.meta.url)('@techstark/opencv-js');
      }
      await waitReady(mod);
      handle = { cv: mod };
    })();
  }
  await pending;
  return handle as unknown as CvHandle;
}
