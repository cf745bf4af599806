// `npm test`: the static checks (types, lint, format, unused code), then the four test tiers of
// tests/vitest.config.ts (unit, database, processes, browser), each its own vitest run so only the tiers
// that need PostgreSQL and the fakes start them. With file arguments (`npm test -- tests/calc/x.test.ts
// tests/e2e/y.test.ts`) the static checks are skipped and only the tiers holding those files run;
// `--tier unit|database|processes|browser` runs one. Two stages run in the background, each with its
// output in a log file (printed if it fails; a test tier's last lines also when it passes): when the
// browser tier runs after another tier, the production app it serves is built beside the tiers before
// it; and with both, the processes tier runs beside the database tier. On two CPUs the database tier,
// one file at a time, leaves room for them. Prints each stage's time at the end.
import path from 'node:path';
import { BROWSER, PROCESSES, UNIT } from '../../tests/vitest.config';
import { inheritedEnvironment } from '../config';

const TIERS = ['unit', 'database', 'processes', 'browser'] as const;
export type Tier = (typeof TIERS)[number];

/** A glob of the vitest config (`**` for any folders, `*` within a name) as a regular expression. */
function globPattern(glob: string): RegExp {
  const body = glob
    .split(/(\*\*\/|\*)/)
    .map((part) => (part === '**/' ? '(?:.*/)?' : part === '*' ? '[^/]*' : part.replace(/[.+?^${}()|[\]\\]/g, '\\$&')))
    .join('');
  return new RegExp(`^${body}$`);
}
const BROWSER_PATTERNS = BROWSER.map(globPattern);
const UNIT_PATTERNS = UNIT.map(globPattern);
const PROCESSES_PATTERNS = PROCESSES.map(globPattern);

/** Which tier a test file belongs to, by the same globs the vitest projects use. */
export function tierOf(file: string): Tier {
  const rel = file.split(path.sep).join('/').replace(/^\.\//, '');
  if (BROWSER_PATTERNS.some((p) => p.test(rel))) return 'browser';
  if (UNIT_PATTERNS.some((p) => p.test(rel))) return 'unit';
  if (PROCESSES_PATTERNS.some((p) => p.test(rel))) return 'processes';
  return 'database';
}

export type Stage = {
  name: string;
  command: string[];
  /**
   * Started and not waited for: the stage named by a later stage's `after`, or else waited for once
   * the other stages are done. Its output goes to `log` (under the project).
   */
  background?: boolean;
  log?: string;
  /** A background stage this one waits for (and fails with) before it starts. */
  after?: string;
};

const APP_BUILD = 'app build (beside the tiers)';

/** With the browser tier after another tier: the app's build starts first, in the background. */
function buildBeside(stages: Stage[], root: string, node: string): Stage[] {
  const browser = stages.findIndex((s) => s.name === 'browser tier');
  const firstTier = stages.findIndex((s) => s.name.endsWith(' tier'));
  if (browser < 0 || browser === firstTier) return stages;
  const distDir = inheritedEnvironment().WORLDSHEET_TEST_DIST_DIR ?? '.next-test';
  const build: Stage = {
    name: APP_BUILD,
    command: [node, '--import', 'tsx', path.join(root, 'lib', 'ops', 'build-app.ts'), distDir],
    background: true,
    log: path.join('.data', 'app-build.log'),
  };
  const out = stages.map((s, i) => (i === browser ? { ...s, after: APP_BUILD } : s));
  out.splice(firstTier, 0, build);
  return out;
}

/** With the database tier: the processes tier runs beside it, in the background. */
function processesBeside(stages: Stage[]): Stage[] {
  const database = stages.findIndex((s) => s.name === 'database tier');
  const processes = stages.findIndex((s) => s.name === 'processes tier');
  if (database < 0 || processes < 0) return stages;
  const out = stages.filter((_, i) => i !== processes);
  out.splice(out.indexOf(stages[database]), 0, {
    ...stages[processes],
    background: true,
    log: path.join('.data', 'processes-tier.log'),
  });
  return out;
}

/** The stages `npm test` runs for these arguments. */
export function plan(args: string[], root: string): Stage[] {
  const node = process.execPath;
  const bin = (pkg: string, file: string) => path.join(root, 'node_modules', pkg, file);
  const vitest = (tier: Tier, extra: string[]) => ({
    name: `${tier} tier`,
    command: [
      node,
      bin('vitest', 'vitest.mjs'),
      'run',
      '--config',
      'tests/vitest.config.ts',
      '--project',
      tier,
      ...extra,
    ],
  });
  const tierFlag = args.indexOf('--tier');
  const onlyTier = tierFlag >= 0 ? (args[tierFlag + 1] as Tier) : null;
  if (onlyTier && !TIERS.includes(onlyTier)) throw new Error(`--tier takes one of ${TIERS.join(', ')}`);
  const rest = tierFlag >= 0 ? args.filter((_, i) => i !== tierFlag && i !== tierFlag + 1) : args;
  const files = rest.filter((a) => !a.startsWith('-') && /\.test\.ts$|\/$|^tests/.test(a));
  const flags = rest.filter((a) => !files.includes(a));
  if (files.length === 0) {
    const stages: Stage[] = [];
    if (!onlyTier)
      stages.push(
        {
          name: 'types (tsc --noEmit)',
          command: [node, bin('typescript', 'bin/tsc'), '--noEmit', '-p', 'tsconfig.json'],
        },
        {
          name: 'lint (eslint)',
          command: [node, bin('eslint', 'bin/eslint.js'), '-c', '.lint/eslint.config.mjs', '.'],
        },
        { name: 'format (prettier --check)', command: [node, bin('prettier', 'bin/prettier.cjs'), '--check', '.'] },
        {
          name: 'unused code (knip)',
          command: [node, bin('knip', 'bin/knip.js'), '-c', '.lint/knip.jsonc'],
        },
      );
    for (const tier of onlyTier ? [onlyTier] : TIERS) stages.push(vitest(tier, flags));
    return buildBeside(processesBeside(stages), root, node);
  }
  // A folder argument may hold files of several tiers: give it to each tier, vitest filters by its globs.
  const tiers = TIERS.filter((tier) => (onlyTier ? tier === onlyTier : true))
    .map((tier) => ({ tier, mine: files.filter((f) => !f.endsWith('.test.ts') || tierOf(f) === tier) }))
    .filter(({ mine, tier }) => mine.some((f) => f.endsWith('.test.ts') || couldHold(f, tier)))
    .map(({ tier, mine }) => vitest(tier, ['--passWithNoTests', ...flags, ...mine]));
  return buildBeside(processesBeside(tiers), root, node);
}

function couldHold(folder: string, tier: Tier): boolean {
  const f = folder.replace(/\/$/, '');
  if (tier === 'browser') return f === 'tests' || f.startsWith('tests/e2e');
  if (tier === 'processes') return f === 'tests' || f.startsWith('tests/processes');
  return !f.startsWith('tests/e2e') && !f.startsWith('tests/processes');
}

/**
 * Runs the stages in order, stopping at the first failure (a background stage is started and waited
 * for by the stage that names it in `after`); logs each stage's time; returns the exit code.
 */
export async function runStages(
  stages: Stage[],
  run: (stage: Stage) => Promise<number>,
  log: (line: string) => void,
): Promise<number> {
  const times: string[] = [];
  const background = new Map<string, Promise<number>>();
  let code = 0;
  for (const stage of stages) {
    const started = Date.now();
    const timed = (c: number) => `${stage.name} ${((Date.now() - started) / 1000).toFixed(1)} s${c ? ' (failed)' : ''}`;
    if (stage.background) {
      log(`── ${stage.name}: started`);
      background.set(
        stage.name,
        run(stage).then((c) => {
          times.push(timed(c));
          return c;
        }),
      );
      continue;
    }
    const before = stage.after ? background.get(stage.after) : undefined;
    if (before) {
      log(`── ${stage.name}: waiting for the ${stage.after}`);
      code = await before;
      if (code) break;
    }
    log(`── ${stage.name}`);
    code = await run(stage);
    times.push(timed(code));
    if (code) break;
  }
  // A background stage no stage waited for is waited for now; its failure is the run's. (After a
  // failure the run stops: its runner stops what is still going.)
  for (const stage of stages) {
    if (code || !stage.background || stages.some((s) => s.after === stage.name)) continue;
    log(`── waiting for the ${stage.name}`);
    code = await background.get(stage.name)!;
  }
  log(`Times: ${times.join('; ')}`);
  return code;
}
