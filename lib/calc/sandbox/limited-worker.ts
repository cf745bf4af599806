// One worker thread with resource limits, started on first use and replaced after a failure: the
// plumbing shared by the evaluation sandbox (lib/calc/sandbox/evaluator.ts) and the signature parser
// (lib/issue/signature-parser.ts). The worker entry posts { type: 'ready' } once it has loaded; every
// message after that goes to `onMessage`; an error or exit of the current worker goes to `onCrash`
// (never for a worker already replaced). An idle worker does not keep its host process alive.
import path from 'node:path';
import { Worker } from 'node:worker_threads';

export interface LimitedWorkerOptions<M> {
  /** Path of the entry module under `root` (default the working directory), or a function giving it at each start. */
  entry: string | (() => string);
  root?: string;
  /** Old-generation heap limit in MB; the young generation gets `youngMb`. */
  memoryMb: number;
  youngMb: number;
  workerData?: unknown;
  /** What the worker is, for messages: "evaluation worker". */
  label: string;
  onMessage: (message: M) => void;
  onCrash: (error: Error & { code?: string }) => void;
}

export class LimitedWorker<M extends { type: string }> {
  private worker: Worker | null = null;
  private ready: Promise<void> | null = null;

  constructor(private readonly options: LimitedWorkerOptions<M>) {}

  /** Starts the worker if none runs; resolves once it has posted `ready`. A failed start rejects. */
  start(): Promise<void> {
    if (this.ready) return this.ready;
    const { entry, root, memoryMb, youngMb, workerData, label } = this.options;
    // The entry loads its code from source at run time; the app bundler must not follow it.
    const file = path.join(
      /* turbopackIgnore: true */ root ?? process.cwd(),
      typeof entry === 'string' ? entry : entry(),
    );
    const worker = new Worker(/* turbopackIgnore: true */ file, {
      workerData,
      resourceLimits: { maxOldGenerationSizeMb: memoryMb, maxYoungGenerationSizeMb: youngMb, stackSizeMb: 4 },
      stdout: false,
      stderr: false,
    });
    this.worker = worker;
    worker.unref();
    this.ready = new Promise<void>((resolve, reject) => {
      const onReady = (m: M) => {
        if (m.type === 'ready') {
          worker.off('message', onReady);
          resolve();
        }
      };
      worker.on('message', onReady);
      worker.once('error', reject);
      worker.once('exit', (code) => reject(new Error(`the ${label} stopped while starting (exit ${code})`)));
    });
    // A failed start is reported to the caller that waits for it; nobody else awaits this promise.
    this.ready.catch(() => undefined);
    worker.on('message', (m: M) => {
      if (worker === this.worker) this.options.onMessage(m);
    });
    worker.on('error', (error: Error & { code?: string }) => {
      if (worker === this.worker) this.options.onCrash(error);
    });
    worker.on('exit', (code) => {
      if (worker === this.worker) this.options.onCrash(new Error(`the ${label} stopped (exit ${code})`));
    });
    return this.ready;
  }

  /** Sends a request to the started worker and keeps the host process alive until `idle()`. */
  post(message: unknown): void {
    this.worker!.ref();
    this.worker!.postMessage(message);
  }

  /** The worker has nothing to do: it no longer keeps the host process alive. */
  idle(): void {
    this.worker?.unref();
  }

  /** Drops the worker (after a failure or a limit): the next `start()` makes a new one. */
  reset(): void {
    const w = this.worker;
    this.worker = null;
    this.ready = null;
    if (w) void w.terminate();
  }

  async close(): Promise<void> {
    const w = this.worker;
    this.worker = null;
    this.ready = null;
    if (w) await w.terminate();
  }
}
