// The evaluation worker: one sheet engine (with its caches) per thread. The parent terminates the
// thread when a request exceeds the time or memory limit, and reads from the shared progress array
// which cell was running. A result heavier than the request allows is not sent: the parent answers
// that the request asks for too much (413) instead of the thread running out of memory sending it.
import { parentPort, workerData } from 'node:worker_threads';
import { createSheetEngine } from '../sheet-engine';
import { CellSender } from './cell-transfer';
import { PROGRESS_CELL, PROGRESS_STARTED, type EvaluateRequest, type WorkerReply } from './protocol';

const progress = new Int32Array(workerData.progress as SharedArrayBuffer);
const engine = createSheetEngine();
const sender = new CellSender();
const port = parentPort!;

port.on('message', (request: EvaluateRequest) => {
  let reply: WorkerReply;
  try {
    const skip = new Map(request.skip);
    const result = engine.evaluate(request.cells, request.options, {
      skip,
      cacheScope: request.scope,
      // Every result is sent: typeset and format each cell within its own time.
      presentEachCell: true,
      onCellStart: (index) => {
        Atomics.store(progress, PROGRESS_CELL, index);
        // A skipped cell only gets its error; it is not run.
        if (!skip.has(request.cells[index].id)) Atomics.add(progress, PROGRESS_STARTED, 1);
      },
    });
    // Cells sent before go as their numbers (cell-transfer.ts); the size counts the whole result.
    const { packed, bytes } = sender.pack(result, request.full === true, request.maxResultBytes);
    reply =
      bytes > request.maxResultBytes
        ? { type: 'too-large', id: request.id, bytes }
        : { type: 'done', id: request.id, result: packed, bytes };
  } catch (error) {
    reply = { type: 'failed', id: request.id, error: error instanceof Error ? error.message : String(error) };
  }
  Atomics.store(progress, PROGRESS_CELL, -1);
  port.postMessage(reply);
});

// Warm the engine (its first evaluation compiles much of mathjs) before saying ready, so that the
// time limit of the first request measures the sheet, not the start-up.
engine.evaluate([{ id: 'warm-up', kind: 'calc', source: 'x_w = lorentzFactor(0.5) * 2 m to cm\nx_w < 3 m' }], {
  significantFigures: 6,
});
engine.clearCache();
port.postMessage({ type: 'ready' } satisfies WorkerReply);
