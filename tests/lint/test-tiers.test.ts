// npm test's stages (lib/ops/test-tiers.ts): each test file runs in the tier its vitest project names, and
// a run with file arguments starts only the tiers that hold them.
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { plan, tierOf } from '../../lib/ops/test-tiers';

const root = process.cwd();

describe('test tiers', () => {
  it('puts a file in the tier of its project', () => {
    expect(tierOf('tests/calc/format.test.ts')).toBe('unit');
    expect(tierOf('tests/checks/policy.test.ts')).toBe('unit');
    expect(tierOf('tests/e2e/journey.test.ts')).toBe('browser');
    expect(tierOf('tests/http/csp-reports.test.ts')).toBe('database');
    expect(tierOf('tests/checks/workflow.test.ts')).toBe('database');
    // Tests that start processes of their own wait on them: not in the fast tier.
    expect(tierOf('tests/processes/sandbox.test.ts')).toBe('database');
    expect(tierOf('tests/processes/calc-cli.test.ts')).toBe('database');
    expect(tierOf(path.join('.', 'tests', 'ui', 'contrast.test.ts'))).toBe('unit');
  });

  it('runs the static checks first, then the three tiers, with no arguments', () => {
    expect(plan([], root).map((s) => s.name)).toEqual([
      'types (tsc --noEmit)',
      'lint (eslint)',
      'format (prettier --check)',
      'unused code (knip)',
      'unit tier',
      'database tier',
      'browser tier',
    ]);
    expect(plan(['--tier', 'unit'], root).map((s) => s.name)).toEqual(['unit tier']);
  });

  it('runs only the tiers holding the files named', () => {
    const stages = plan(['tests/calc/format.test.ts', 'tests/e2e/landing.test.ts', '-t', 'x'], root);
    expect(stages.map((s) => s.name)).toEqual(['unit tier', 'browser tier']);
    expect(stages[0].command.slice(-4)).toEqual(['--passWithNoTests', '-t', 'x', 'tests/calc/format.test.ts']);
    expect(stages[1].command.at(-1)).toBe('tests/e2e/landing.test.ts');
    expect(plan(['tests/sheets'], root).map((s) => s.name)).toEqual(['unit tier', 'database tier']);
  });
});
