// The evaluation worker: one sheet engine (with its caches) per thread. The parent terminates the
// thread when a request exceeds the time or memory limit, and reads from the shared progress array
// which cell was running.
import { parentPort, workerData } from 'node:worker_threads';
import { createSheetEngine } from '../sheet-engine';
import { PROGRESS_CELL, type EvaluateRequest, type WorkerReply } from './protocol';

const progress = new Int32Array(workerData.progress as SharedArrayBuffer);
const engine = createSheetEngine();
const port = parentPort!;

port.on('message', (request: EvaluateRequest) => {
  let reply: WorkerReply;
  try {
    const result = engine.evaluate(request.cells, request.options, {
      skip: new Map(request.skip),
      onCellStart: (index) => Atomics.store(progress, PROGRESS_CELL, index),
    });
    reply = { type: 'done', id: request.id, result };
  } catch (error) {
    reply = { type: 'failed', id: request.id, error: error instanceof Error ? error.message : String(error) };
  }
  Atomics.store(progress, PROGRESS_CELL, -1);
  port.postMessage(reply);
});

port.postMessage({ type: 'ready' } satisfies WorkerReply);
