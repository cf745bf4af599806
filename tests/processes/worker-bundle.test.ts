// The prebuilt evaluation worker (lib/ops/calc-worker-build.ts) gives exactly the results the worker
// loaded from its TypeScript sources through tsx gives: the same JSON, values to the last bit, errors
// and presentation alike, for the demo installation's sheets (definitions, criteria, sweeps, plots,
// space-time diagrams, first-order and Monte Carlo uncertainty) and the limits' errors.
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoSheets, demoStudySheets } from '../../db/seed';
import { demoStarterSheets } from '../../db/starters';
import { SandboxedEvaluator } from '../../lib/calc/sandbox/evaluator';
import { currentWorkerBundle } from '../../lib/calc/sandbox/worker-bundle';
import type { CellInput, EvaluateOptions } from '../../lib/calc/types';
import { ensureCalcWorkerBundle } from '../../lib/ops/calc-worker-build';

const root = process.cwd();
let prebuilt: SandboxedEvaluator;
let fromSource: SandboxedEvaluator;

beforeAll(async () => {
  ensureCalcWorkerBundle(root);
  prebuilt = new SandboxedEvaluator({ timeoutMs: 20_000, memoryMb: 256, workers: 1 });
  fromSource = new SandboxedEvaluator({ timeoutMs: 20_000, memoryMb: 256, workers: 1, fromSource: true });
  await Promise.all([prebuilt.warm(), fromSource.warm()]);
}, 120_000);
afterAll(async () => {
  await Promise.all([prebuilt?.close(), fromSource?.close()]);
});

const sheets: Array<{ title: string; cells: CellInput[]; significantFigures: number }> = [
  ...demoSheets().map((s) => s.content),
  ...demoStudySheets().map((s) => s.content),
  ...demoStarterSheets().map((s) => s.content),
];

describe('the prebuilt evaluation worker', () => {
  it('is built for the sources of this checkout', () => {
    expect(currentWorkerBundle(root)).toMatch(
      new RegExp(
        `^node_modules\\${path.sep}\\.cache\\${path.sep}worldsheet\\${path.sep}calc-worker-[0-9a-f]{20}\\.mjs$`,
      ),
    );
  });

  it.each(sheets.map((s) => [s.title, s] as const))(
    'answers %s exactly as the worker from source',
    { timeout: 120_000 },
    async (_title, sheet) => {
      for (const options of [
        { significantFigures: sheet.significantFigures },
        { significantFigures: 4, displayUnits: 'trade', monteCarlo: 'always' },
      ] satisfies EvaluateOptions[]) {
        // Different scopes: neither answer comes from the other's whole-result cache.
        const [a, b] = await Promise.all([
          prebuilt.evaluate(sheet.cells, options, 'prebuilt'),
          fromSource.evaluate(sheet.cells, options, 'source'),
        ]);
        expect(a.cells.length).toBe(sheet.cells.length);
        expect(JSON.stringify(a)).toBe(JSON.stringify(b));
      }
    },
  );

  // One limit per request: each limit replaces the worker, and a replacement from source starts in
  // seconds, which counts against the request's budget (three time limits) and not the other's.
  it.each([
    ['a cell over the time limit', 'f(x) = x > 0 ? f(x - 1) + f(x - 1) : 0\ny = f(60)', /^stopped after 5 s/],
    [
      'a cell that recurses too deeply',
      'g(n) = g(n + 1)\nz = g(1)',
      /Maximum call stack size exceeded|recursed too deeply/,
    ],
  ])(
    'stops %s with the same error and evaluates the rest alike',
    { timeout: 120_000 },
    async (_what, runaway, error) => {
      const cells: CellInput[] = [
        { id: 'a', kind: 'calc', source: 'a = 2 m' },
        { id: 'b', kind: 'calc', source: runaway },
        { id: 'c', kind: 'calc', source: 'b_1 = a * 3 + 1 / 0 m' },
      ];
      const limits = { timeoutMs: 5000, memoryMb: 96, workers: 1 };
      const quick = new SandboxedEvaluator(limits);
      const quickSource = new SandboxedEvaluator({ ...limits, fromSource: true });
      try {
        await Promise.all([quick.warm(), quickSource.warm()]);
        const a = await quick.evaluate(cells, { significantFigures: 6 }, 'x');
        const b = await quickSource.evaluate(cells, { significantFigures: 6 }, 'x');
        expect(a.cells[1].error).toMatch(error);
        expect(JSON.stringify(a)).toBe(JSON.stringify(b));
      } finally {
        await Promise.all([quick.close(), quickSource.close()]);
      }
    },
  );
});
