/** A reference web worker, started by the analysis worker: draws chunks of replicates and transfers the batches back. */
import { answerReferenceRequest, type ReferenceRequest } from '../src/core/reference/workerPool';

self.onmessage = (e: MessageEvent<ReferenceRequest>) => {
  const { reply, transfer } = answerReferenceRequest(e.data);
  (self as unknown as Worker).postMessage(reply, transfer);
};
