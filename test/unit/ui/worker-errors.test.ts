/**
 * Failures from the worker reach the page with their kind, and the page reacts to the kind, not to the
 * wording: the real bridge and state classes over a message channel (as a worker's port), with a stand-in
 * worker API wrapped as the analysis worker wraps its own (withWireErrors) and throwing the core's typed
 * errors.
 */
import 'fake-indexeddb/auto';
import * as Comlink from 'comlink';
import { afterEach, describe, expect, it } from 'vitest';
import { withWireErrors } from '../../../src/app/wire';
import { CancelledError, SeriesError, TooFewCellsError } from '../../../src/core/errors';
import { Bridge, errorKind, fromWorker, WorkerError } from '../../../src/ui/bridge';
import { AppState, type Entry } from '../../../src/ui/state/app.svelte';
import type { OpenResult, WorkerApi } from '../../../workers/protocol';

/** What the stand-in worker's analyze and kinetics do; set by each test. */
let analyzeFails: () => never;
let kineticsFails: () => never;
const ports: MessagePort[] = [];

function standIn(): Partial<WorkerApi> {
  return {
    async warmUp() {},
    async open(id, _name, _bytes): Promise<OpenResult> {
      return { id, kind: 'points', width: 100, height: 80, umPerPxFromFile: null, pages: 0, wasColour: false, bitDepth: 8, bitmap: null, thumb: null };
    },
    async analyze() { analyzeFails(); },
    async kinetics() { kineticsFails(); },
    async forget() {},
    cancel() {},
  };
}

/** A worker whose other end is the stand-in API, exposed over a MessageChannel. */
function makeWorker(): Worker {
  const { port1, port2 } = new MessageChannel();
  ports.push(port1, port2);
  Comlink.expose(withWireErrors(standIn()), port2);
  return Object.assign(port1, { terminate: () => { port1.close(); port2.close(); } }) as unknown as Worker;
}

afterEach(() => {
  for (const p of ports.splice(0)) p.close();
});

async function settled(e: Entry): Promise<void> {
  for (let i = 0; i < 500; i++) {
    if (e.status === 'error' || (e.status === 'queued' && e.notice !== null) || e.status === 'done') return;
    await new Promise((r) => setTimeout(r, 2));
  }
  throw new Error(`the entry stayed ${e.status}`);
}

describe('the bridge', () => {
  it('re-creates a core error thrown in the worker as an error of the same kind and message', async () => {
    analyzeFails = () => { throw new TooFewCellsError('Only 2 cells were found; lower the minimum cell area.'); };
    const bridge = new Bridge(makeWorker);
    await bridge.open('a', 'p.csv', new Uint8Array([49]), 1e6);
    const err = await bridge.analyze({ id: 'a', settings: {} }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(WorkerError);
    expect(errorKind(err)).toBe('TooFewCells');
    expect((err as Error).message).toBe('Only 2 cells were found; lower the minimum cell area.');
    bridge.cancelAll();
  });

  it('gives anything that is not a wire error the kind Unexpected, and its own errors their kinds', () => {
    expect(errorKind(fromWorker(new Error('port closed')))).toBe('Unexpected');
    expect(errorKind(fromWorker({ kind: 'Csv', message: 'bad row' }))).toBe('Csv');
    expect(errorKind(new Error('The analysis was cancelled.'))).toBe('Unexpected');
  });
});

describe('the state classes', () => {
  function app(): AppState {
    const a = new AppState(makeWorker);
    return a;
  }

  it('treat a cancel inside the worker as a cancel: queued, with the offer to analyse again', async () => {
    analyzeFails = () => { throw new CancelledError(); };
    const a = app();
    const e = a.addBytes('p.csv', new TextEncoder().encode('x,y\n1,2\n'));
    await settled(e);
    expect(e.status).toBe('queued');
    expect(e.cancelled).toBe(true);
    expect(e.error).toBeNull();
    a.cancel();
  });

  it('treat any other kind as an error shown as it came, even when its words mention cancelling', async () => {
    const text = 'The reference was cancelled by a full disk; free some space.';
    analyzeFails = () => { throw new TooFewCellsError(text); };
    const a = app();
    const e = a.addBytes('p.csv', new TextEncoder().encode('x,y\n1,2\n'));
    await settled(e);
    expect(e.status).toBe('error');
    expect(e.cancelled).toBe(false);
    expect(e.error).toBe(text);
    a.cancel();
  });

  it('show a failed kinetics run\'s message without a class-name prefix', async () => {
    kineticsFails = () => { throw new SeriesError('Times must increase from frame to frame: frame 2 (t = 1) after frame 1 (t = 5).'); };
    const a = app();
    const e = a.addBytes('p.csv', new TextEncoder().encode('x,y\n1,2\n'));
    analyzeFails = () => { throw new CancelledError(); };
    await settled(e);
    e.kind = 'image';
    a.kinetics.toggle(e.id, true);
    await a.kinetics.analyse();
    expect(a.kinetics.error).toBe('Times must increase from frame to frame: frame 2 (t = 1) after frame 1 (t = 5).');
    a.cancel();
  });
});
