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

// Warm the engine (its first evaluation compiles much of mathjs) before saying ready, so that the
// time limit of the first request measures the sheet, not the start-up.
engine.evaluate([{ id: 'warm-up', kind: 'calc', source: 'x_w = lorentzFactor(0.5) * 2 m to cm\nx_w < 3 m' }], { significantFigures: 6 });
engine.clearCache();
port.postMessage({ type: 'ready' } satisfies WorkerReply);
