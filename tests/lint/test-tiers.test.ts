// npm test's stages (lib/ops/test-tiers.ts): each test file runs in the tier its vitest project names, and
// a run with file arguments starts only the tiers that hold them.
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { plan, runStages, tierOf, type Stage } from '../../lib/ops/test-tiers';

const root = process.cwd();

describe('test tiers', () => {
  it('puts a file in the tier of its project', () => {
    expect(tierOf('tests/calc/format.test.ts')).toBe('unit');
    expect(tierOf('tests/checks/policy.test.ts')).toBe('unit');
    expect(tierOf('tests/e2e/journey.test.ts')).toBe('browser');
    expect(tierOf('tests/http/csp-reports.test.ts')).toBe('database');
    expect(tierOf('tests/checks/workflow.test.ts')).toBe('database');
    // Tests that start processes of their own wait on them: a tier of their own, not the fast one.
    expect(tierOf('tests/processes/sandbox.test.ts')).toBe('processes');
    expect(tierOf('tests/processes/calc-cli.test.ts')).toBe('processes');
    expect(tierOf(path.join('.', 'tests', 'ui', 'contrast.test.ts'))).toBe('unit');
  });

  it('runs the static checks first, then the four tiers, with no arguments', () => {
    expect(plan([], root).map((s) => s.name)).toEqual([
      'types (tsc --noEmit)',
      'lint (eslint)',
      'format (prettier --check)',
      'unused code (knip)',
      'app build (beside the tiers)',
      'unit tier',
      'processes tier',
      'database tier',
      'browser tier',
    ]);
    const stages = plan([], root);
    expect(stages.find((s) => s.name === 'app build (beside the tiers)')).toMatchObject({ background: true });
    expect(stages.find((s) => s.name === 'browser tier')?.after).toBe('app build (beside the tiers)');
    // The processes tier beside the database tier, its output in a log of its own.
    expect(stages.find((s) => s.name === 'processes tier')).toMatchObject({
      background: true,
      log: path.join('.data', 'processes-tier.log'),
    });
    expect(stages.find((s) => s.name === 'processes tier')?.command).toContain('processes');
    expect(plan(['--tier', 'unit'], root).map((s) => s.name)).toEqual(['unit tier']);
    // Alone, or named by a file, it runs in the foreground.
    expect(plan(['--tier', 'processes'], root)).toEqual([expect.objectContaining({ name: 'processes tier' })]);
    expect(plan(['--tier', 'processes'], root)[0].background).toBeUndefined();
    expect(plan(['tests/processes/sandbox.test.ts'], root).map((s) => [s.name, s.background])).toEqual([
      ['processes tier', undefined],
    ]);
    // The browser tier alone builds the app itself, as before (the harness's buildIfStale).
    expect(plan(['--tier', 'browser'], root).map((s) => s.name)).toEqual(['browser tier']);
  });

  it('runs a background stage beside the stages after it; the stage that waits for it fails with it', async () => {
    const events: string[] = [];
    let finishBuild: (code: number) => void = () => {};
    const stages: Stage[] = [
      { name: 'build', command: [], background: true },
      { name: 'one', command: [] },
      { name: 'two', command: [], after: 'build' },
    ];
    const run = (stage: Stage) => {
      events.push(`start ${stage.name}`);
      if (stage.background) return new Promise<number>((resolve) => (finishBuild = resolve));
      return Promise.resolve(0);
    };
    const done = runStages(stages, run, () => {});
    await new Promise((r) => setTimeout(r, 10));
    // "one" ran while the build was still going; "two" waits for it.
    expect(events).toEqual(['start build', 'start one']);
    finishBuild(0);
    expect(await done).toBe(0);
    expect(events).toEqual(['start build', 'start one', 'start two']);

    events.length = 0;
    const failing = runStages(stages, run, () => {});
    await new Promise((r) => setTimeout(r, 10));
    finishBuild(1);
    expect(await failing).toBe(1);
    expect(events).toEqual(['start build', 'start one']);
  });

  it('waits at the end for a background stage no stage waits for, and fails with it', async () => {
    const stages: Stage[] = [
      { name: 'beside', command: [], background: true },
      { name: 'one', command: [] },
    ];
    for (const exit of [0, 1]) {
      let finish: (code: number) => void = () => {};
      let settled = false;
      const run = (stage: Stage) =>
        stage.background ? new Promise<number>((resolve) => (finish = resolve)) : Promise.resolve(0);
      const done = runStages(stages, run, () => {}).then((code) => {
        settled = true;
        return code;
      });
      await new Promise((r) => setTimeout(r, 10));
      // "one" is done, the background stage is not: the run is not over.
      expect(settled).toBe(false);
      finish(exit);
      expect(await done).toBe(exit);
    }
  });

  it('runs only the tiers holding the files named', () => {
    const stages = plan(['tests/calc/format.test.ts', 'tests/e2e/landing.test.ts', '-t', 'x'], root);
    expect(stages.map((s) => s.name)).toEqual(['app build (beside the tiers)', 'unit tier', 'browser tier']);
    expect(stages[1].command.slice(-4)).toEqual(['--passWithNoTests', '-t', 'x', 'tests/calc/format.test.ts']);
    expect(stages[2].command.at(-1)).toBe('tests/e2e/landing.test.ts');
    expect(plan(['tests/e2e/landing.test.ts'], root).map((s) => s.name)).toEqual(['browser tier']);
    expect(plan(['tests/sheets'], root).map((s) => s.name)).toEqual(['unit tier', 'database tier']);
    // A folder that may hold files of every tier: the processes tier beside the database tier.
    expect(plan(['tests'], root).map((s) => s.name)).toEqual([
      'app build (beside the tiers)',
      'unit tier',
      'processes tier',
      'database tier',
      'browser tier',
    ]);
  });
});
