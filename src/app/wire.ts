/**
 * Errors across the worker boundary. Class instances do not survive structured cloning (a core error
 * arrives as a bare Error, its kind lost), so the worker sends each failure as plain data: the typed
 * error's kind and its one-line message. The page re-creates an error of that kind and reacts to the
 * kind, never to the wording.
 */
import { describeError, TessellabError } from '../core/errors';

/** Kind of a failure that is not one of the core's typed errors (a bug, a browser error). */
export const UNEXPECTED = 'Unexpected';

/** A failure as it crosses the worker boundary. */
export interface WireError {
  /** The core error's kind ('Cancelled', 'Csv', 'ImageDecode', ... see src/core/errors.ts) or {@link UNEXPECTED}. */
  kind: string;
  /** One line for a person: what is wrong and what to do. */
  message: string;
}

/** The wire form of anything thrown: a typed core error keeps its kind and message. */
export function toWireError(e: unknown): WireError {
  if (e instanceof TessellabError) return { kind: e.kind, message: e.message };
  return { kind: UNEXPECTED, message: describeError(e) };
}

/** Whether a value is a {@link WireError} (a plain object with a string kind and message). */
export function isWireError(v: unknown): v is WireError {
  if (v === null || typeof v !== 'object' || v instanceof Error) return false;
  const o = v as Record<string, unknown>;
  return typeof o.kind === 'string' && typeof o.message === 'string';
}

/**
 * The same API with every method's failure turned into a {@link WireError} (thrown, or the rejection of
 * the promise it returns), so that the kind survives the trip to the page.
 */
export function withWireErrors<T extends object>(api: T): T {
  const out: Record<string, unknown> = {};
  for (const [key, fn] of Object.entries(api)) {
    if (typeof fn !== 'function') {
      out[key] = fn;
      continue;
    }
    out[key] = (...args: unknown[]): unknown => {
      let r: unknown;
      try {
        r = (fn as (...a: unknown[]) => unknown).apply(api, args);
      } catch (e) {
        throw toWireError(e);
      }
      if (r instanceof Promise) return r.catch((e: unknown) => { throw toWireError(e); });
      return r;
    };
  }
  return out as T;
}
