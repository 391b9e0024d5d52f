/** A reference worker thread: draws the chunks of replicates it is sent and transfers the batches back. */
import { parentPort } from 'node:worker_threads';
import { answerReferenceRequest, type ReferenceRequest } from '../core/reference/workerPool';

const port = parentPort!;
port.on('message', (m: ReferenceRequest) => {
  const { reply, transfer } = answerReferenceRequest(m);
  port.postMessage(reply, transfer);
});
