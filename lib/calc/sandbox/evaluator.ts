// Runs sheet evaluation in worker threads with a time and a memory limit. A cell that exceeds a
// limit ends with a clear error on that cell; the worker is replaced and the rest of the sheet is
// evaluated without it, so a runaway sheet never takes the server down.
import { createHash } from 'node:crypto';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import type { CellInput, EvaluateOptions, SheetResult } from '../types';
import { PROGRESS_CELL, type EvaluateRequest, type WorkerReply } from './protocol';

export interface SandboxOptions {
  /** Time limit for one evaluation request in one worker, in ms. */
  timeoutMs: number;
  /** Heap limit of each worker, in MB. */
  memoryMb: number;
  /** Number of worker threads. */
  workers: number;
  /** The project root (where lib/ is); defaults to the current directory. */
  root?: string;
}

export function sandboxOptionsFromEnv(): SandboxOptions {
  return {
    timeoutMs: Number(process.env.WORLDSHEET_CALC_TIMEOUT_MS ?? 5000),
    memoryMb: Number(process.env.WORLDSHEET_CALC_MEMORY_MB ?? 256),
    workers: Number(process.env.WORLDSHEET_CALC_WORKERS ?? 2),
  };
}

const WORKER_ENTRY = ['lib', 'calc', 'sandbox', 'worker-entry.mjs'].join(path.sep);

class LimitExceeded extends Error {
  constructor(
    readonly cellIndex: number,
    message: string,
  ) {
    super(message);
  }
}

interface Job {
  request: EvaluateRequest;
  resolve: (r: SheetResult) => void;
  reject: (e: Error) => void;
}

class EvaluationThread {
  private worker: Worker | null = null;
  private ready: Promise<void> | null = null;
  private readonly progress = new Int32Array(new SharedArrayBuffer(4));
  private readonly queue: Job[] = [];
  private current: { job: Job; timer: NodeJS.Timeout } | null = null;
  /** True from taking a job off the queue until its reply or failure. */
  private busy = false;

  constructor(private readonly options: SandboxOptions) {}

  private start(): Promise<void> {
    if (this.ready) return this.ready;
    // The worker loads the engine from source at run time; the app bundler must not follow it.
    const entry = path.join(/* turbopackIgnore: true */ this.options.root ?? process.cwd(), WORKER_ENTRY);
    const worker = new Worker(/* turbopackIgnore: true */ entry, {
      workerData: { progress: this.progress.buffer },
      resourceLimits: { maxOldGenerationSizeMb: this.options.memoryMb, maxYoungGenerationSizeMb: Math.min(64, this.options.memoryMb / 4), stackSizeMb: 4 },
      stdout: false,
      stderr: false,
    });
    this.worker = worker;
    this.ready = new Promise<void>((resolve, reject) => {
      const onReady = (m: WorkerReply) => {
        if (m.type === 'ready') {
          worker.off('message', onReady);
          resolve();
        }
      };
      worker.on('message', onReady);
      worker.once('error', reject);
    });
    worker.on('message', (m: WorkerReply) => this.onReply(m));
    worker.on('error', (error: Error & { code?: string }) => this.onCrash(worker, error));
    worker.on('exit', (code) => this.onCrash(worker, new Error(`the evaluation worker stopped (exit ${code})`)));
    return this.ready;
  }

  run(request: EvaluateRequest): Promise<SheetResult> {
    return new Promise((resolve, reject) => {
      this.queue.push({ request, resolve, reject });
      void this.next();
    });
  }

  private async next(): Promise<void> {
    if (this.busy || this.queue.length === 0) return;
    this.busy = true;
    const job = this.queue.shift()!;
    try {
      await this.start();
    } catch (error) {
      this.reset();
      this.busy = false;
      job.reject(error as Error);
      void this.next();
      return;
    }
    // An idle worker must not keep its host process alive; a busy one must.
    this.worker!.ref();
    Atomics.store(this.progress, PROGRESS_CELL, -1);
    const timer = setTimeout(() => this.fail(new LimitExceeded(this.runningCell(), `stopped after ${this.options.timeoutMs / 1000} s: this cell takes longer than the time limit`)), this.options.timeoutMs);
    this.current = { job, timer };
    this.worker!.postMessage(job.request);
  }

  private runningCell(): number {
    return Atomics.load(this.progress, PROGRESS_CELL);
  }

  private onReply(m: WorkerReply): void {
    if (m.type === 'ready' || !this.current || m.id !== this.current.job.request.id) return;
    const { job, timer } = this.current;
    clearTimeout(timer);
    this.current = null;
    this.busy = false;
    if (m.type === 'done') job.resolve(m.result);
    else job.reject(new Error(m.error));
    if (this.queue.length === 0) this.worker?.unref();
    void this.next();
  }

  private onCrash(worker: Worker, error: Error & { code?: string }): void {
    if (worker !== this.worker) return;
    const cell = this.runningCell();
    const message =
      error.code === 'ERR_WORKER_OUT_OF_MEMORY'
        ? `stopped: this cell needs more memory than the limit (${this.options.memoryMb} MB)`
        : error.message.includes('Maximum call stack')
          ? 'stopped: the calculation recursed too deeply'
          : `stopped: ${error.message}`;
    this.fail(new LimitExceeded(cell, message));
  }

  /** Ends the current job with `error`, replaces the worker and goes on with the queue. */
  private fail(error: Error): void {
    const current = this.current;
    this.current = null;
    this.busy = false;
    this.reset();
    if (current) {
      clearTimeout(current.timer);
      current.job.reject(error);
    }
    void this.next();
  }

  private reset(): void {
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

/** Whole results kept in this process, so that the same sheet asked again (a save right after the editor's evaluation) is not sent to a worker. */
const RECENT_RESULTS = 24;

export class SandboxedEvaluator {
  private readonly threads: EvaluationThread[];
  private nextId = 1;
  private roundRobin = 0;
  private readonly recent = new Map<string, SheetResult>();

  constructor(readonly options: SandboxOptions) {
    this.threads = Array.from({ length: Math.max(1, options.workers) }, () => new EvaluationThread(options));
  }

  /**
   * Evaluates a sheet. `affinity` (a sheet id, say) sends the same sheet to the same worker, whose
   * cache then makes re-evaluation after an edit cost only the edited cells.
   */
  async evaluate(cells: CellInput[], options: EvaluateOptions, affinity?: string): Promise<SheetResult> {
    // The engine is deterministic: the same cells and options always give the same result. Cited
    // revisions belong in the key: the same value reads differently once its revision is superseded.
    const key = createHash('sha256')
      .update(JSON.stringify([cells, options.significantFigures, options.tables ?? [], options.references ?? [], options.monteCarlo ?? 'auto']))
      .digest('base64');
    const hit = this.recent.get(key);
    if (hit) {
      this.recent.delete(key);
      this.recent.set(key, hit);
      return { ...hit, evaluatedCells: 0 };
    }
    const result = await this.evaluateInWorker(cells, options, affinity);
    // A result cut short by a limit depends on the load of the moment: not kept.
    if (!result.cells.some((c) => c.error !== null && /^(stopped|not evaluated)/.test(c.error))) {
      if (this.recent.size >= RECENT_RESULTS) this.recent.delete(this.recent.keys().next().value as string);
      this.recent.set(key, result);
    }
    return result;
  }

  private async evaluateInWorker(cells: CellInput[], options: EvaluateOptions, affinity?: string): Promise<SheetResult> {
    const thread = this.threads[affinity ? this.workerFor(affinity) : this.roundRobin++ % this.threads.length];
    const skip = new Map<string, string>();
    const budgetEnds = Date.now() + 3 * this.options.timeoutMs;
    for (let attempt = 0; attempt <= cells.length; attempt++) {
      try {
        return await thread.run({ id: this.nextId++, cells, options, skip: [...skip] });
      } catch (error) {
        if (!(error instanceof LimitExceeded) || error.cellIndex < 0 || error.cellIndex >= cells.length) throw error;
        skip.set(cells[error.cellIndex].id, error.message);
        if (Date.now() > budgetEnds) {
          for (const c of cells.slice(error.cellIndex + 1)) {
            if (!skip.has(c.id)) skip.set(c.id, 'not evaluated: the sheet used up its time budget on the cells above');
          }
        }
      }
    }
    throw new Error('evaluation did not finish');
  }

  /** Which worker (0-based) evaluates the sheets with this affinity. */
  workerFor(affinity: string): number {
    return hash(affinity) % this.threads.length;
  }

  async close(): Promise<void> {
    await Promise.all(this.threads.map((t) => t.close()));
  }
}

function hash(text: string): number {
  let h = 2166136261;
  for (let i = 0; i < text.length; i++) h = Math.imul(h ^ text.charCodeAt(i), 16777619);
  return h >>> 0;
}

const globalForEvaluator = globalThis as unknown as { worldsheetEvaluator?: SandboxedEvaluator };

/** The server's shared evaluator. */
export function getEvaluator(): SandboxedEvaluator {
  globalForEvaluator.worldsheetEvaluator ??= new SandboxedEvaluator(sandboxOptionsFromEnv());
  return globalForEvaluator.worldsheetEvaluator;
}
