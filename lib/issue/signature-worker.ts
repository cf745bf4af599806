// The signature parser's worker thread: parses CMS SignedData containers (already within the size
// and element budget) off the server's main thread. The parent terminates the thread when a parse
// exceeds its time budget; the thread's heap is capped by the parent's resourceLimits.
import { parentPort } from 'node:worker_threads';
import { verifySignedData } from './cades';
import type { ParseReply, ParseRequest } from './signature-parser';

const port = parentPort!;

port.on('message', (request: ParseRequest) => {
  const reply: ParseReply = { type: 'done', id: request.id, check: verifySignedData(request.der, request.digest) };
  port.postMessage(reply);
});

port.postMessage({ type: 'ready' } satisfies ParseReply);
