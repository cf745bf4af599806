// The sandbox: a cell that runs too long or needs too much memory ends with a clear error on that
// cell, the worker is replaced, and the rest of the sheet is still evaluated.
// Expected numbers are the hand-checked arithmetic of the statements under test (common practice),
// with unit conversions by SI prefix definitions (SI Brochure, 9th ed., §3); a physical reference
// value names its source beside it.
import os from 'node:os';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { defaultWorkerCount, EvaluationRefused, SandboxedEvaluator } from '../../lib/calc/sandbox/evaluator';
import type { CellInput } from '../../lib/calc/types';

const evaluator = new SandboxedEvaluator({ timeoutMs: 3000, memoryMb: 96, workers: 1 });
// A cold worker compiles the engine on its first request; warm it so the time limit measures the cell.
beforeAll(async () => {
  await evaluator.evaluate([{ id: 'w', kind: 'calc', source: 'x_w = lorentzFactor(0.5) * 2 m to cm' }], {
    significantFigures: 6,
  });
});
afterAll(() => evaluator.close());

const cells = (...sources: string[]): CellInput[] =>
  sources.map((source, i) => ({ id: `c${i + 1}`, kind: 'calc', source }));

describe('limits', () => {
  // Each waits for a limit and a replacement worker (which starts slowly on a busy machine).
  it('stops a cell that exceeds the time limit and evaluates the others', { timeout: 90_000 }, async () => {
    const r = await evaluator.evaluate(
      cells('a = 1', 'f(x) = x > 0 ? f(x - 1) + f(x - 1) : 0', 'y = f(60)', 'z = a + 1', 'w = y + 1'),
      { significantFigures: 6 },
    );
    expect(r.cells.map((c) => c.ok)).toEqual([true, true, false, true, false]);
    expect(r.cells[2].error).toBe('stopped after 3 s: this cell takes longer than the time limit');
    expect(r.cells[3].statements[0].value?.number).toBe(2);
    expect(r.cells[4].error).toMatch(/^depends on `y`, which is not available/);
  });

  it('stops a cell that exceeds the memory limit and evaluates the others', { timeout: 90_000 }, async () => {
    const r = await evaluator.evaluate(cells('a = 2', 'k = kron(ones(1000, 1000), ones(1, 1000))', 'b_1 = a * 3'), {
      significantFigures: 6,
    });
    expect(r.cells[1].ok).toBe(false);
    expect(r.cells[1].error).toMatch(
      /^stopped: this cell needs more memory than the limit \(96 MB\)|^stopped after 3 s/,
    );
    expect(r.cells[2].statements[0].value?.number).toBe(6);
  });

  it('serves the next request normally after a worker was replaced', async () => {
    const r = await evaluator.evaluate(cells('x = 3 m', 'y = x * 2'), { significantFigures: 6 });
    expect(r.ok).toBe(true);
    expect(r.cells[1].statements[0].value).toMatchObject({ number: 6, unit: 'm' });
  });

  it('answers concurrent requests', async () => {
    const results = await Promise.all(
      Array.from({ length: 6 }, (_, i) =>
        evaluator.evaluate(cells(`x = ${i} s`, 'y = x * 2'), { significantFigures: 6 }),
      ),
    );
    expect(results.map((r) => r.cells[1].statements[0].value?.number)).toEqual([0, 2, 4, 6, 8, 10]);
  });
});

// The workers are shared fairly: a user who floods the server with slow cells holds at most their
// share, the rest of their requests are refused (429 with Retry-After), and another user's trivial
// evaluation goes on meanwhile. Order of completion is what is asserted, never a duration: the slow
// cell never ends by itself (2^60 calls), so it ends only at the time limit.
describe('fair shares of the workers', () => {
  const SLOW = 'f(x) = x > 0 ? f(x - 1) + f(x - 1) : 0\ny_s = f(60)';
  const pool = new SandboxedEvaluator({ timeoutMs: 4000, memoryMb: 96, workers: 2 });
  beforeAll(() => pool.warm());
  afterAll(() => pool.close());

  it(
    'serves user B while user A floods slow cells; A is refused beyond two in flight, with Retry-After; the timed-out cell is never run again',
    { timeout: 90_000 },
    async () => {
      const startedBefore = pool.cellsStarted();
      const settled = { a1: false, a2: false };
      const a1 = pool
        .evaluate(cells(SLOW), { significantFigures: 6 }, { userId: 'user-a', scope: 'project:p1' })
        .finally(() => (settled.a1 = true));
      const a2 = pool
        .evaluate(cells(SLOW), { significantFigures: 6 }, { userId: 'user-a', scope: 'project:p1' })
        .finally(() => (settled.a2 = true));
      const refusals = await Promise.allSettled(
        Array.from({ length: 10 }, () =>
          pool.evaluate(cells(SLOW), { significantFigures: 6 }, { userId: 'user-a', scope: 'project:p1' }),
        ),
      );
      for (const r of refusals) {
        expect(r.status).toBe('rejected');
        const reason = (r as PromiseRejectedResult).reason as EvaluationRefused;
        expect(reason).toBeInstanceOf(EvaluationRefused);
        expect(reason.reason).toBe('too-many-requests');
        expect(reason.retryAfterSeconds).toBe(4);
        expect(reason.message).toMatch(/^You have 2 evaluations in progress already; at most 2 at a time\./);
      }
      const b = await pool.evaluate(
        cells('x = 3 m', 'y = x * 2'),
        { significantFigures: 6 },
        { userId: 'user-b', scope: 'project:p2' },
      );
      expect(b.cells[1].statements[0].value).toMatchObject({ number: 6, unit: 'm' });
      // B was answered while both of A's were still pending: A held one worker, not both.
      expect(settled).toEqual({ a1: false, a2: false });
      // A save by A is not refused for A's own evaluations in flight, and does not wait for them.
      const save = await pool.evaluate(
        cells('z = 2 s'),
        { significantFigures: 6 },
        { userId: 'user-a', kind: 'save', scope: 'project:p1' },
      );
      expect(save.ok).toBe(true);
      expect(settled).toEqual({ a1: false, a2: false });
      const [r1, r2] = await Promise.all([a1, a2]);
      expect(r1.cells[0].error).toBe('stopped after 4 s: this cell takes longer than the time limit');
      expect(r2.cells[0].error).toBe('stopped after 4 s: this cell takes longer than the time limit');
      // Cells started: A1's slow cell once, B's two, the save's one. A1's retry and A2 skipped the
      // slow cell (A2 after the same cells as A1: remembered), so it ran once in all.
      expect(pool.cellsStarted() - startedBefore).toBe(4);
    },
  );

  it('a request within the share is not refused once the earlier ones are done', async () => {
    const r = await pool.evaluate(
      cells('w = 5 kg'),
      { significantFigures: 6 },
      { userId: 'user-a', scope: 'project:p1' },
    );
    expect(r.ok).toBe(true);
  });

  it('sizes the pool from the CPU count unless WORLDSHEET_CALC_WORKERS says otherwise', () => {
    expect(defaultWorkerCount({})).toBe(Math.min(8, Math.max(2, os.availableParallelism())));
    expect(defaultWorkerCount({ WORLDSHEET_CALC_WORKERS: '3' })).toBe(3);
    expect(
      new SandboxedEvaluator({
        timeoutMs: 1000,
        memoryMb: 64,
        workers: defaultWorkerCount({ WORLDSHEET_CALC_WORKERS: '3' }),
      }).size,
    ).toBe(3);
  });
});

describe('the size of a request and of its result', () => {
  const small = new SandboxedEvaluator({ timeoutMs: 5000, memoryMb: 96, workers: 1, maxResultBytes: 200_000 });
  afterAll(() => small.close());

  it('refuses 1,000 cells of 60 statements before evaluating anything, saying what to reduce', async () => {
    const big = Array.from({ length: 1000 }, (_, i): CellInput => ({
      id: `k${i}`,
      kind: 'calc',
      source: Array.from({ length: 60 }, (_, j) => `v_${i}_${j} = ${j} m`).join('\n'),
    }));
    const runs = small.workerRuns;
    const error = await small.evaluate(big, { significantFigures: 6 }).then(
      () => null,
      (e: unknown) => e,
    );
    expect(error).toBeInstanceOf(EvaluationRefused);
    expect((error as EvaluationRefused).reason).toBe('too-large');
    expect((error as EvaluationRefused).message).toBe(
      'This evaluation holds 60,000 statements; at most 20,000 are evaluated in one request. Evaluate fewer cells at a time (split the sheet), or fewer statements per cell.',
    );
    expect(small.workerRuns).toBe(runs);
  });

  it(
    'refuses a result heavier than the limit, and the worker serves the next request',
    { timeout: 60_000 },
    async () => {
      const many = Array.from({ length: 20 }, (_, i): CellInput => ({
        id: `m${i}`,
        kind: 'calc',
        source: Array.from({ length: 40 }, (_, j) => `u_${i}_${j} = ${j + 1} MeV`).join('\n'),
      }));
      const error = await small.evaluate(many, { significantFigures: 6 }).then(
        () => null,
        (e: unknown) => e,
      );
      expect(error).toBeInstanceOf(EvaluationRefused);
      expect((error as EvaluationRefused).reason).toBe('too-large');
      expect((error as EvaluationRefused).message).toBe(
        'The results of this evaluation are larger than the 195 KiB returned for one request. Evaluate fewer cells or statements at a time (split the sheet), or make large lists and matrices smaller.',
      );
      const r = await small.evaluate(cells('x = 1 m'), { significantFigures: 6 });
      expect(r.ok).toBe(true);
    },
  );
});

// The whole results the server keeps (so that a save right after the editor's evaluation of the
// same cells needs no worker) are bounded by their size, not only by their number.
describe('the results kept in the server', () => {
  const kept = new SandboxedEvaluator({ timeoutMs: 5000, memoryMb: 96, workers: 1, keepResultsBytes: 40_000 });
  afterAll(() => kept.close());
  // About 5 KB of results as JSON (invented values); one with 40 statements about 15 KB.
  const medium = (tag: string) =>
    cells(Array.from({ length: 12 }, (_, j) => `w_${tag}_${j} = ${j + 1} MeV`).join('\n'));

  it('answers the same cells again without a worker, but keeps no result heavier than a quarter of the bound', async () => {
    const runs = () => kept.workerRuns;
    const before = runs();
    await kept.evaluate(cells('y_k = 2 m'), { significantFigures: 6 });
    await kept.evaluate(cells('y_k = 2 m'), { significantFigures: 6 });
    expect(runs() - before).toBe(1);

    // Over 10 KB: evaluated again every time.
    const heavy = cells(Array.from({ length: 40 }, (_, j) => `h_${j} = ${j + 1} MeV`).join('\n'));
    const start = runs();
    await kept.evaluate(heavy, { significantFigures: 6 });
    await kept.evaluate(heavy, { significantFigures: 6 });
    expect(runs() - start).toBe(2);
  });

  it('lets the oldest results go once the ones kept would weigh more than the bound', async () => {
    for (const tag of ['a', 'b', 'c', 'd', 'e', 'f', 'g', 'h', 'i'])
      await kept.evaluate(medium(tag), { significantFigures: 6 });
    const start = kept.workerRuns;
    // The latest is still kept; the first went when the later ones filled the 40 KB.
    await kept.evaluate(medium('i'), { significantFigures: 6 });
    expect(kept.workerRuns - start).toBe(0);
    await kept.evaluate(medium('a'), { significantFigures: 6 });
    expect(kept.workerRuns - start).toBe(1);
  });
});

// Results are shared only within a scope (the server's scope is the project): the same cells from
// another project are evaluated afresh and reported so, never answered from the first one's cache.
describe('the result caches are per project', () => {
  const shared = new SandboxedEvaluator({ timeoutMs: 5000, memoryMb: 96, workers: 1 });
  afterAll(() => shared.close());

  it('does not reveal to project 2 that project 1 evaluated the same cell', { timeout: 60_000 }, async () => {
    const secret = cells('I_beam = 312.5 mA\nP_dump = I_beam * 6.5 MV');
    const first = await shared.evaluate(
      secret,
      { significantFigures: 6 },
      { userId: 'u1', scope: 'project:one', affinity: 'sheet-1' },
    );
    expect(first.evaluatedCells).toBe(1);
    const started = shared.cellsStarted();
    const other = await shared.evaluate(
      secret,
      { significantFigures: 6 },
      { userId: 'u2', scope: 'project:two', affinity: 'sheet-9' },
    );
    expect(other.evaluatedCells).toBe(1);
    // Evaluated again in the worker (same worker: there is one), not served from its cell cache either.
    expect(shared.cellsStarted() - started).toBe(1);
    expect(other.cells).toEqual(first.cells);
    // Within project 1 the cache still serves.
    const again = await shared.evaluate(
      secret,
      { significantFigures: 6 },
      { userId: 'u1', scope: 'project:one', affinity: 'sheet-1' },
    );
    expect(again.evaluatedCells).toBe(0);
  });
});

// A sheet's evaluations go to one worker (its affinity), whose cell cache holds the sheet: there an
// edit evaluates only the cells it affects. When that worker is busy, the request waits for it rather
// than take a free worker that would evaluate the whole sheet again, unless the request holding its
// worker has held it spillAfterMs: then it takes the free one. What is asserted is which worker answered, told by how many
// cells it evaluated, and the order of completion, never a duration: the busy worker's cell (2^23
// calls of a function, over a second on this machine) outlasts the 100 ms wait of the second case.
// Expected values: the statements' own arithmetic (common practice).
describe('a sheet waits for its own worker', () => {
  const BUSY = 'f(x) = x > 0 ? f(x - 1) + f(x - 1) : 0\ny_b = f(22)';
  /** 12 cells that read nothing of each other; `last` is the last one's length. */
  const sheet = (last: number): CellInput[] =>
    Array.from({ length: 12 }, (_, i) => ({
      id: `k${i + 1}`,
      kind: 'calc',
      source: `L_${i + 1} = ${i === 11 ? last : i + 1} m\nA_${i + 1} = L_${i + 1} * 2 m`,
    }));
  /** An affinity other than `of` that goes to the same worker. */
  const sameWorker = (pool: SandboxedEvaluator, of: string) => {
    for (let k = 0; ; k++) if (pool.workerFor(`busy-${k}`) === pool.workerFor(of)) return `busy-${k}`;
  };

  /** Evaluates the sheet, makes its worker busy, then evaluates the sheet with its last cell edited. */
  async function editWhileBusy(spillAfterMs: number) {
    const pool = new SandboxedEvaluator({ timeoutMs: 60_000, memoryMb: 96, workers: 2, spillAfterMs });
    try {
      await pool.warm();
      const first = await pool.evaluate(sheet(12), { significantFigures: 6 }, { affinity: 'sheet-x' });
      expect(first.evaluatedCells).toBe(12);
      const order: string[] = [];
      const busy = pool
        .evaluate(cells(BUSY), { significantFigures: 6 }, { affinity: sameWorker(pool, 'sheet-x') })
        .finally(() => order.push('busy'));
      const edit = pool
        .evaluate(sheet(7), { significantFigures: 6 }, { affinity: 'sheet-x' })
        .finally(() => order.push('edit'));
      const [b, e] = await Promise.all([busy, edit]);
      expect(b.ok).toBe(true);
      expect(e.cells[11].statements[1].value).toMatchObject({ number: 14, unit: 'm^2' });
      return { evaluated: e.evaluatedCells, order };
    } finally {
      await pool.close();
    }
  }

  it('waits for its busy worker, then evaluates there only the edited cell', { timeout: 90_000 }, async () => {
    const { evaluated, order } = await editWhileBusy(60_000);
    expect(order).toEqual(['busy', 'edit']);
    expect(evaluated).toBe(1);
  });

  it(
    'takes the free worker once its own has been held spillAfterMs by one request, and evaluates the whole sheet there',
    { timeout: 90_000 },
    async () => {
      const { evaluated, order } = await editWhileBusy(100);
      expect(order).toEqual(['edit', 'busy']);
      expect(evaluated).toBe(12);
    },
  );
});
