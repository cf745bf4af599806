// Runs sheet evaluation in worker threads with a time and a memory limit. A cell that exceeds a
// limit ends with a clear error on that cell; the worker is replaced and the rest of the sheet is
// evaluated without it, so a runaway sheet never takes the server down.
//
// The workers are shared fairly between the people evaluating (SandboxedEvaluator below):
//  - one pool-wide queue; a request waits for any free worker (the sheet's own worker, whose cache
//    makes re-evaluation incremental, when that one is free);
//  - an interactive evaluation (the editor, the scratch pad, POST /api/evaluate) counts against its
//    user's budget: at most `perUserInFlight` running or waiting, the next refused (429, Retry-After);
//    and while others wait, one user runs at most `perUserRunning` of them at once, so a user who
//    floods the server with slow cells holds at most that many workers and everyone else's
//    evaluations go on in the rest;
//  - saves (and imports and a checker's alternate calculation) evaluate what is being stored: they
//    do not count against the interactive budget, so a user is never refused a save because their
//    own editor evaluation is in flight; they go ahead of waiting interactive evaluations, may use any
//    free worker, and are capped separately per user (`perUserSaves`);
//  - a request that hit a limit is retried at once on the worker it holds, without the cell that hit
//    the limit (never put back at the end of the queue), and that cell is remembered for a while:
//    the same cell after the same cells above (the editor sends the whole sheet after every edit)
//    is not run again, but answered with the same error;
//  - the request's size is bounded before it is queued (statements) and its result after it is
//    computed (serialized bytes): beyond either, 413 with what to reduce;
//  - the whole-result cache and the workers' cell caches are partitioned by scope (the project), so
//    a cell another project evaluated is never answered faster, nor reported as a cache hit.
import { createHash } from 'node:crypto';
import os from 'node:os';
import path from 'node:path';
import { CellReceiver } from './cell-transfer';
import { LimitedWorker } from './limited-worker';
import { currentWorkerBundle } from './worker-bundle';
import type { CellInput, EvaluateOptions, SheetResult } from '../types';
import {
  jsonSizeAtMost,
  PROGRESS_CELL,
  PROGRESS_SLOTS,
  PROGRESS_STARTED,
  type EvaluateRequest,
  type WorkerReply,
} from './protocol';

export interface SandboxOptions {
  /** Time limit for one evaluation request in one worker, in ms. */
  timeoutMs: number;
  /** Heap limit of each worker, in MB. */
  memoryMb: number;
  /** Number of worker threads. */
  workers: number;
  /** The project root (where lib/ is); defaults to the current directory. */
  root?: string;
  /** Interactive evaluations one user may have running or waiting; the next is refused (429). Default 2. */
  perUserInFlight?: number;
  /** Evaluations of one user that run at once while anyone else waits. Default workers − 1 (at least 1), at most perUserInFlight. */
  perUserRunning?: number;
  /** Saves one user may have running or waiting. Default 4. */
  perUserSaves?: number;
  /** Interactive evaluations that may wait for a worker in all; the next is refused (429). Default 4 per worker. */
  maxQueued?: number;
  /** Statements (non-blank, non-comment lines of calculation cells) one request may hold. */
  maxStatements?: number;
  /** Serialized size of one result, in bytes. */
  maxResultBytes?: number;
  /** The whole results kept in this process, as JSON, in bytes (RECENT_BYTES below). Default 48 MiB. */
  keepResultsBytes?: number;
  /** How long a cell that hit a limit is answered with that error without running it again, in ms. Default 10 minutes. */
  rememberLimitMs?: number;
  /**
   * How long one request may hold a worker before a request waiting for that worker (its sheet's)
   * takes another that is free, in ms (SPILL_AFTER_MS below). Default 500.
   */
  spillAfterMs?: number;
  /**
   * Load the engine from its TypeScript sources through tsx even when a prebuilt worker for them is
   * built (worker-bundle.ts); for the test that compares the two. Default false.
   */
  fromSource?: boolean;
}

const DEFAULT_MAX_STATEMENTS = 20_000;
const DEFAULT_MAX_RESULT_BYTES = 32 * 1024 * 1024;

/**
 * Worker threads for this machine: one per CPU the process may use (os.availableParallelism), at
 * least 2 so that one slow sheet never holds the only worker, at most 8 (each may take its memory
 * limit). WORLDSHEET_CALC_WORKERS in `env` overrides. lib/calc reads no environment of its own (it
 * imports nothing outside lib/calc, so not lib/config.ts either): the server's shared evaluator
 * (lib/sheets/evaluate-sandboxed.ts) takes its settings from lib/config.ts, the CLI passes its own.
 */
export function defaultWorkerCount(env: Record<string, string | undefined>): number {
  const set = Number(env.WORLDSHEET_CALC_WORKERS);
  if (env.WORLDSHEET_CALC_WORKERS && Number.isInteger(set) && set >= 1) return set;
  return Math.min(8, Math.max(2, os.availableParallelism()));
}

/** The limits WORLDSHEET_CALC_TIMEOUT_MS, WORLDSHEET_CALC_MEMORY_MB and WORLDSHEET_CALC_WORKERS of `env` set. */
export function sandboxOptionsFromEnv(env: Record<string, string | undefined>): SandboxOptions {
  return {
    timeoutMs: Number(env.WORLDSHEET_CALC_TIMEOUT_MS ?? 5000),
    memoryMb: Number(env.WORLDSHEET_CALC_MEMORY_MB ?? 256),
    workers: defaultWorkerCount(env),
  };
}

/**
 * A request the evaluator will not take: too large (413, with what to reduce) or beyond the
 * caller's share just now (429, with when to try again). lib/calc stays free of the web: the server
 * maps this to its AppError (lib/sheets/evaluate-sandboxed.ts).
 */
export class EvaluationRefused extends Error {
  constructor(
    readonly reason: 'too-large' | 'too-many-requests',
    message: string,
    readonly retryAfterSeconds?: number,
  ) {
    super(message);
    this.name = 'EvaluationRefused';
  }
}

/** Who asks for an evaluation, and of what. */
export interface EvaluationContext {
  /** The person asking; their budget applies. Without one (the command line, tests), no per-user budget. */
  userId?: string;
  /** 'interactive' (the default): POST /api/evaluate. 'save': what a save, import or check stores. */
  kind?: 'interactive' | 'save';
  /**
   * Cache partition: results are shared only between requests of the same scope (the server uses
   * the project, or the user for evaluations outside a sheet). Defaults to the affinity.
   */
  scope?: string;
  /** Sends the same sheet to the same worker when that one is free (its cache makes re-evaluation incremental). */
  affinity?: string;
}

const WORKER_ENTRY = ['lib', 'calc', 'sandbox', 'worker-entry.mjs'].join(path.sep);

class LimitExceeded extends Error {
  constructor(
    readonly cellIndex: number,
    message: string,
    /** The time or memory limit (worth remembering), not a worker that failed to start. */
    readonly limit: boolean,
  ) {
    super(message);
  }
}

class ResultTooLarge extends Error {
  constructor(readonly bytes: number | null) {
    super('result too large');
  }
}

/** One worker thread, running one request at a time (the pool hands it out only when idle). */
class EvaluationThread {
  /** When the request holding this thread was given it (Date.now()), or null while it is free. */
  heldSince: number | null = null;
  private readonly thread: LimitedWorker<WorkerReply>;
  private readonly progress = new Int32Array(new SharedArrayBuffer(4 * PROGRESS_SLOTS));
  /** The cells this worker sent, so that it need not send them again (cell-transfer.ts). */
  private readonly received = new CellReceiver(RECEIVED_CELLS);
  private current: {
    request: EvaluateRequest;
    resolve: (r: SheetResult) => void;
    reject: (e: Error) => void;
    timer: NodeJS.Timeout | null;
  } | null = null;

  constructor(
    readonly index: number,
    private readonly options: SandboxOptions,
  ) {
    this.thread = new LimitedWorker<WorkerReply>({
      // The prebuilt worker when one matches the sources of the moment (about half the memory and a
      // tenth of the start-up time), else the sources through tsx. Looked up at each start: a worker
      // replaced after a limit loads what is current then, as one loading from source would.
      entry: () => (!options.fromSource && currentWorkerBundle(options.root ?? process.cwd())) || WORKER_ENTRY,
      root: options.root,
      memoryMb: options.memoryMb,
      // 16 MB of young generation, not 64: two workers filling their caches held about 95 MiB less
      // resident memory for about 8 % more CPU (tests/bench/README.md, Load).
      youngMb: Math.min(16, options.memoryMb / 4),
      workerData: { progress: this.progress.buffer },
      label: 'evaluation worker',
      onMessage: (m) => this.onReply(m),
      onCrash: (error) => this.onCrash(error),
    });
  }

  /** Cells this thread has started evaluating since it was created (cache hits not counted). */
  cellsStarted(): number {
    return Atomics.load(this.progress, PROGRESS_STARTED);
  }

  start(): Promise<void> {
    return this.thread.start();
  }

  async run(request: EvaluateRequest): Promise<SheetResult> {
    try {
      await this.start();
    } catch (error) {
      this.reset();
      throw new LimitExceeded(-1, `stopped: ${(error as Error).message}`, false);
    }
    return new Promise<SheetResult>((resolve, reject) => {
      Atomics.store(this.progress, PROGRESS_CELL, -1);
      this.current = { request, resolve, reject, timer: null };
      this.current.timer = setTimeout(
        () =>
          this.fail(
            new LimitExceeded(
              this.runningCell(),
              `stopped after ${this.options.timeoutMs / 1000} s: this cell takes longer than the time limit`,
              true,
            ),
          ),
        this.options.timeoutMs,
      );
      // A busy worker keeps its host process alive; an idle one does not.
      this.thread.post(request);
    });
  }

  private runningCell(): number {
    return Atomics.load(this.progress, PROGRESS_CELL);
  }

  private onReply(m: WorkerReply): void {
    const current = this.current;
    if (m.type === 'ready' || !current || m.id !== current.request.id) return;
    const result = m.type === 'done' ? this.received.unpack(m.result) : null;
    if (m.type === 'done' && !result) {
      // A cell sent before is no longer kept here: the same request again, every cell in full (all
      // cache hits in the worker), within the same time limit.
      current.request = { ...current.request, full: true };
      this.thread.post(current.request);
      return;
    }
    if (current.timer) clearTimeout(current.timer);
    this.current = null;
    this.thread.idle();
    if (result) {
      resultBytes.set(result, (m as { bytes: number }).bytes);
      current.resolve(result);
    } else if (m.type === 'too-large') current.reject(new ResultTooLarge(m.bytes));
    else if (m.type === 'failed') current.reject(new Error(m.error));
  }

  private onCrash(error: Error & { code?: string }): void {
    const cell = this.runningCell();
    const outOfMemory = error.code === 'ERR_WORKER_OUT_OF_MEMORY';
    // Out of memory with no cell running: building or sending the whole result did not fit.
    if (outOfMemory && cell < 0 && this.current) return this.fail(new ResultTooLarge(null));
    const message = outOfMemory
      ? `stopped: this cell needs more memory than the limit (${this.options.memoryMb} MB)`
      : error.message.includes('Maximum call stack')
        ? 'stopped: the calculation recursed too deeply'
        : `stopped: ${error.message}`;
    this.fail(new LimitExceeded(cell, message, outOfMemory || error.message.includes('Maximum call stack')));
  }

  /** Ends the current request with `error` and replaces the worker. */
  private fail(error: Error): void {
    const current = this.current;
    this.current = null;
    this.reset();
    if (current) {
      if (current.timer) clearTimeout(current.timer);
      current.reject(error);
    }
  }

  private reset(): void {
    this.thread.reset();
  }

  close(): Promise<void> {
    return this.thread.close();
  }
}

/** A request waiting for a worker. */
interface Ticket {
  userId: string | null;
  kind: 'interactive' | 'save';
  affinity: number | null;
  grant: (thread: EvaluationThread) => void;
}

/**
 * A request with an affinity (a sheet) waits for its own worker while another is free, unless the
 * request holding its worker has held it this long. Its worker holds the sheet's cells in its cache,
 * and the cells it sent before, which the server keeps (cell-transfer.ts): there, an edit re-evaluates
 * the cells it affects and sends those. Any other worker evaluates the whole sheet and sends all of
 * it, and its cache makes room for it by dropping cells of its own sheets. With 16 clients saving
 * 500-cell sheets on 2 workers, about half of the saves went to the other worker that way (every
 * cell's result received, frozen and digested again) while their own was busy for tens of
 * milliseconds. Waiting behind short requests is what a busy server should do (going elsewhere only
 * adds a whole evaluation: with a limit on the wait instead, the saves that waited longest under load
 * went elsewhere and took longest of all); a slow request on the sheet's worker (up to the time limit)
 * no longer holds the request back once it has run this long.
 */
const SPILL_AFTER_MS = 500;

/** Whole results kept in this process, so that the same sheet asked again (a save right after the editor's evaluation) is not sent to a worker. */
const RECENT_RESULTS = 24;
/**
 * And at most this much of them, as JSON, unless told (a result may weigh up to maxResultBytes,
 * 32 MiB: 24 of those would hold most of the server's memory). A result heavier than a quarter of
 * it is not kept.
 */
const RECENT_BYTES = 48 * 1024 * 1024;
/** Each result's size as JSON, as its worker counted it. */
const resultBytes = new WeakMap<SheetResult, number>();
/** Cell results kept per worker thread so that the worker need not send them again (about 1.2 KiB of JSON each on the benchmark sheets). */
const RECEIVED_CELLS = 5000;
/** Cells remembered as having hit a limit. */
const REMEMBERED_LIMITS = 2000;

export class SandboxedEvaluator {
  private readonly threads: EvaluationThread[];
  private readonly idle: Set<EvaluationThread>;
  private readonly waiting: Ticket[] = [];
  /** Per user: interactive requests in flight (running or waiting), saves in flight, and requests running. */
  private readonly budgets = new Map<string, { interactive: number; saves: number; running: number }>();
  private nextId = 1;
  private roundRobin = 0;
  private readonly recent = new Map<string, SheetResult>();
  /** The size of the results in `recent`, as JSON. */
  private recentBytes = 0;
  private readonly keepResultsBytes: number;
  /** Cells that hit a limit, by scope and everything up to and including the cell, with the error they ended with. */
  private readonly limitHits = new Map<string, { message: string; at: number }>();
  private readonly perUserInFlight: number;
  private readonly perUserRunning: number;
  private readonly perUserSaves: number;
  private readonly maxQueued: number;
  private readonly maxStatements: number;
  private readonly maxResultBytes: number;
  private readonly rememberLimitMs: number;
  /** Requests sent to a worker (retries included), for tests and benchmarks. */
  workerRuns = 0;

  constructor(readonly options: SandboxOptions) {
    this.threads = Array.from({ length: Math.max(1, options.workers) }, (_, i) => new EvaluationThread(i, options));
    this.idle = new Set(this.threads);
    this.perUserInFlight = Math.max(1, options.perUserInFlight ?? 2);
    this.perUserRunning = Math.max(
      1,
      Math.min(this.perUserInFlight, options.perUserRunning ?? this.threads.length - 1),
    );
    this.perUserSaves = Math.max(1, options.perUserSaves ?? 4);
    this.maxQueued = Math.max(1, options.maxQueued ?? 4 * this.threads.length);
    this.maxStatements = options.maxStatements ?? DEFAULT_MAX_STATEMENTS;
    this.maxResultBytes = options.maxResultBytes ?? DEFAULT_MAX_RESULT_BYTES;
    this.rememberLimitMs = options.rememberLimitMs ?? 10 * 60_000;
    this.keepResultsBytes = options.keepResultsBytes ?? RECENT_BYTES;
  }

  /**
   * Evaluates a sheet. `context` says who asks and for what (a bare string is the affinity, as for a
   * caller with no user: no per-user budget, its own cache scope).
   */
  async evaluate(
    cells: CellInput[],
    options: EvaluateOptions,
    context: string | EvaluationContext = {},
  ): Promise<SheetResult> {
    const ctx: EvaluationContext = typeof context === 'string' ? { affinity: context, kind: 'save' } : context;
    const scope = ctx.scope ?? ctx.affinity ?? '';
    const statements = countStatements(cells);
    if (statements > this.maxStatements) {
      throw new EvaluationRefused(
        'too-large',
        `This evaluation holds ${statements.toLocaleString('en')} statements; at most ${this.maxStatements.toLocaleString('en')} are evaluated in one request. Evaluate fewer cells at a time (split the sheet), or fewer statements per cell.`,
      );
    }
    // The engine is deterministic: the same cells and options always give the same result. Cited
    // revisions belong in the key: the same value reads differently once its revision is superseded.
    // The scope (the project) too: another project's identical cells are evaluated afresh.
    const key = createHash('sha256')
      .update(
        JSON.stringify([
          scope,
          cells,
          options.significantFigures,
          options.tables ?? [],
          options.references ?? [],
          options.monteCarlo ?? 'auto',
          options.displayUnits ?? 'si',
        ]),
      )
      .digest('base64');
    const hit = this.recent.get(key);
    if (hit) {
      this.recent.delete(key);
      this.recent.set(key, hit);
      return { ...hit, evaluatedCells: 0 };
    }
    const release = await this.acquire(ctx);
    let result: SheetResult;
    try {
      result = await this.evaluateInWorker(release.thread, cells, options, scope);
    } finally {
      release.done();
    }
    // A result cut short by a limit depends on the load of the moment: not kept.
    const bytes = resultBytes.get(result) ?? jsonSizeAtMost(result, this.maxResultBytes);
    if (
      bytes <= this.keepResultsBytes / 4 &&
      !this.recent.has(key) &&
      !result.cells.some((c) => c.error !== null && /^(stopped|not evaluated)/.test(c.error))
    ) {
      while (
        this.recent.size >= RECENT_RESULTS ||
        (this.recent.size > 0 && this.recentBytes + bytes > this.keepResultsBytes)
      ) {
        const oldest = this.recent.keys().next().value as string;
        this.recentBytes -= resultBytes.get(this.recent.get(oldest)!) ?? 0;
        this.recent.delete(oldest);
      }
      resultBytes.set(result, bytes);
      this.recent.set(key, result);
      this.recentBytes += bytes;
    }
    return result;
  }

  /** Waits for a worker within the caller's budget; refuses (429) beyond it. */
  private acquire(ctx: EvaluationContext): Promise<{ thread: EvaluationThread; done: () => void }> {
    const kind = ctx.kind ?? 'interactive';
    const userId = ctx.userId ?? null;
    const retryAfter = Math.max(1, Math.ceil(this.options.timeoutMs / 1000));
    const budget = userId === null ? null : (this.budgets.get(userId) ?? { interactive: 0, saves: 0, running: 0 });
    if (budget && kind === 'interactive' && budget.interactive >= this.perUserInFlight) {
      throw new EvaluationRefused(
        'too-many-requests',
        `You have ${budget.interactive} evaluations in progress already; at most ${this.perUserInFlight} at a time. Wait for them to finish, then try again.`,
        retryAfter,
      );
    }
    if (budget && kind === 'save' && budget.saves >= this.perUserSaves) {
      throw new EvaluationRefused(
        'too-many-requests',
        `You have ${budget.saves} saves being evaluated already; at most ${this.perUserSaves} at a time. Wait for them to finish, then try again.`,
        retryAfter,
      );
    }
    // The queue bound applies to people's requests; the server's own callers (no user) bound themselves.
    if (
      userId !== null &&
      kind === 'interactive' &&
      this.waiting.filter((t) => t.kind === 'interactive').length >= this.maxQueued
    ) {
      throw new EvaluationRefused(
        'too-many-requests',
        'The server is evaluating many sheets just now; try again in a few seconds.',
        retryAfter,
      );
    }
    if (budget && userId !== null) {
      if (kind === 'interactive') budget.interactive++;
      else budget.saves++;
      this.budgets.set(userId, budget);
    }
    const affinity = ctx.affinity ? hash(ctx.affinity) % this.threads.length : null;
    return new Promise((resolve) => {
      const ticket: Ticket = {
        userId,
        kind,
        affinity,
        grant: (thread) => {
          if (budget) budget.running++;
          resolve({
            thread,
            done: () => {
              if (budget && userId !== null) {
                budget.running--;
                if (kind === 'interactive') budget.interactive--;
                else budget.saves--;
                if (budget.interactive === 0 && budget.saves === 0 && budget.running === 0) this.budgets.delete(userId);
              }
              thread.heldSince = null;
              this.idle.add(thread);
              this.dispatch();
            },
          });
        },
      };
      this.waiting.push(ticket);
      this.dispatch();
    });
  }

  /**
   * Hands free workers to waiting requests: saves first, then interactive ones within their user's
   * running share, each in the order they came. A request with an affinity takes its own worker;
   * while that one is busy it leaves a free one to the requests after it, unless the request holding
   * its worker has held it spillAfterMs (SPILL_AFTER_MS): then it takes any.
   */
  private dispatch(): void {
    const now = Date.now();
    const spillAfter = this.options.spillAfterMs ?? SPILL_AFTER_MS;
    let nextSpill = Infinity;
    const running = (t: Ticket) => (t.userId === null ? 0 : (this.budgets.get(t.userId)?.running ?? 0));
    const order = [...this.waiting.filter((t) => t.kind === 'save'), ...this.waiting.filter((t) => t.kind !== 'save')];
    for (const ticket of order) {
      if (this.idle.size === 0) break;
      if (ticket.kind !== 'save' && ticket.userId !== null && running(ticket) >= this.perUserRunning) continue;
      const preferred = ticket.affinity === null ? null : this.threads[ticket.affinity];
      let thread: EvaluationThread;
      const heldSince = preferred?.heldSince ?? null;
      if (preferred && this.idle.has(preferred)) thread = preferred;
      else if (!preferred || heldSince === null || now - heldSince >= spillAfter) thread = this.pickIdle();
      else {
        nextSpill = Math.min(nextSpill, heldSince + spillAfter);
        continue;
      }
      this.waiting.splice(this.waiting.indexOf(ticket), 1);
      this.idle.delete(thread);
      thread.heldSince = now;
      ticket.grant(thread);
    }
    // A request left waiting for its busy worker while another is free: looked at again when its wait is up.
    if (nextSpill < Infinity && this.idle.size > 0 && !this.spillTimer) {
      this.spillTimer = setTimeout(
        () => {
          this.spillTimer = null;
          this.dispatch();
        },
        Math.max(0, nextSpill - now),
      );
      this.spillTimer.unref();
    }
  }

  private spillTimer: NodeJS.Timeout | null = null;

  private pickIdle(): EvaluationThread {
    const free = [...this.idle];
    return free[this.roundRobin++ % free.length];
  }

  /**
   * Runs the request on `thread`, which it holds until done: after a cell hits a limit the request
   * is sent again at once, to the same thread, without that cell (never back to the queue), and
   * the cell is remembered so that the next request with the same cells up to it skips it too.
   */
  private async evaluateInWorker(
    thread: EvaluationThread,
    cells: CellInput[],
    options: EvaluateOptions,
    scope: string,
  ): Promise<SheetResult> {
    // The prefix keys (a SHA-256 per cell) are worked out only when a limit is remembered or hit.
    let prefixKeys = this.limitHits.size > 0 ? this.prefixKeys(cells, options, scope) : null;
    const skip = new Map<string, string>();
    const now = Date.now();
    for (const [i, k] of (prefixKeys ?? []).entries()) {
      const remembered = this.limitHits.get(k);
      if (remembered && now - remembered.at < this.rememberLimitMs) skip.set(cells[i].id, remembered.message);
      else if (remembered) this.limitHits.delete(k);
    }
    const budgetEnds = Date.now() + 3 * this.options.timeoutMs;
    for (let attempt = 0; attempt <= cells.length; attempt++) {
      try {
        this.workerRuns++;
        return await thread.run({
          id: this.nextId++,
          cells,
          options,
          skip: [...skip],
          scope,
          maxResultBytes: this.maxResultBytes,
        });
      } catch (error) {
        if (error instanceof ResultTooLarge) {
          throw new EvaluationRefused(
            'too-large',
            `The results of this evaluation are larger than ${error.bytes === null ? `the worker's memory limit (${this.options.memoryMb} MB) can hold` : `the ${formatBytes(this.maxResultBytes)} returned for one request`}. Evaluate fewer cells or statements at a time (split the sheet), or make large lists and matrices smaller.`,
          );
        }
        if (!(error instanceof LimitExceeded) || error.cellIndex < 0 || error.cellIndex >= cells.length) throw error;
        skip.set(cells[error.cellIndex].id, error.message);
        if (error.limit) {
          if (this.limitHits.size >= REMEMBERED_LIMITS)
            this.limitHits.delete(this.limitHits.keys().next().value as string);
          prefixKeys ??= this.prefixKeys(cells, options, scope);
          this.limitHits.set(prefixKeys[error.cellIndex], { message: error.message, at: Date.now() });
        }
        if (Date.now() > budgetEnds) {
          for (const c of cells.slice(error.cellIndex + 1)) {
            if (!skip.has(c.id)) skip.set(c.id, 'not evaluated: the sheet used up its time budget on the cells above');
          }
        }
      }
    }
    throw new Error('evaluation did not finish');
  }

  /** For each cell, a key of the scope, the options and every cell up to and including it. */
  private prefixKeys(cells: CellInput[], options: EvaluateOptions, scope: string): string[] {
    let h = createHash('sha256')
      .update(
        JSON.stringify([
          scope,
          options.significantFigures,
          options.tables ?? [],
          options.references ?? [],
          options.monteCarlo ?? 'auto',
          options.displayUnits ?? 'si',
        ]),
      )
      .digest('base64');
    return cells.map((c) => (h = createHash('sha256').update(`${h}\0${c.kind}\0${c.source}`).digest('base64')));
  }

  /** Which worker (0-based) a sheet with this affinity goes to when that worker is free. */
  workerFor(affinity: string): number {
    return hash(affinity) % this.threads.length;
  }

  /** The number of worker threads. */
  get size(): number {
    return this.threads.length;
  }

  /** Cells the workers have started evaluating (cache hits and skipped cells not counted), for tests and benchmarks. */
  cellsStarted(): number {
    return this.threads.reduce((n, t) => n + t.cellsStarted(), 0);
  }

  /** Starts every worker now rather than on its first request. */
  async warm(): Promise<void> {
    await Promise.all(this.threads.map((t) => t.start()));
  }

  async close(): Promise<void> {
    if (this.spillTimer) clearTimeout(this.spillTimer);
    this.spillTimer = null;
    await Promise.all(this.threads.map((t) => t.close()));
  }
}

/** Statements of a request: the non-blank lines of its calculation cells that are not only a comment. */
function countStatements(cells: CellInput[]): number {
  let n = 0;
  for (const c of cells) {
    if (c.kind !== 'calc') continue;
    for (const line of c.source.split('\n')) {
      const t = line.trim();
      if (t !== '' && !t.startsWith('#')) n++;
    }
  }
  return n;
}

function formatBytes(bytes: number): string {
  return bytes >= 1024 * 1024 ? `${Math.floor(bytes / (1024 * 1024))} MiB` : `${Math.floor(bytes / 1024)} KiB`;
}

function hash(text: string): number {
  let h = 2166136261;
  for (let i = 0; i < text.length; i++) h = Math.imul(h ^ text.charCodeAt(i), 16777619);
  return h >>> 0;
}
