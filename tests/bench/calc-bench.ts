// Benchmarks of the calculation engine, reported as ratios measured in one run (`npm run bench`;
// alone: `node --expose-gc --import tsx tests/bench/calc-bench.ts`).
//  1. Full evaluation of a generated 2,000-cell sheet with units, against bare mathjs compiling and
//     evaluating the same statements (with the same library functions) in the same process.
//  2. Re-evaluation after editing one cell late in that sheet, against one full evaluation (each run).
//  3. Worst accuracy in ulp of each speed function over log-spaced grids of β.
import { performance } from 'node:perf_hooks';
import { all, create } from 'mathjs';
import { CONSTANTS } from '../../lib/calc/constants';
import { LIBRARY } from '../../lib/calc/functions';
import { bindLibrary } from '../../lib/calc/library-adapter';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import type { CellInput } from '../../lib/calc/types';

export function generateSheet(n: number): CellInput[] {
  const cells: CellInput[] = [];
  for (let i = 1; i <= n; i++) {
    const lines = [
      `T_${i} = ${(50 + (i % 200)).toFixed(1)} MeV`,
      `v_${i} = speedFromKinetic(T_${i}, m_p)`,
      `L_${i} = lengthContraction(${1 + (i % 10)} m, v_${i}) to cm`,
      i === 1 ? `s_${i} = L_${i}` : `s_${i} = s_${i - 1} + L_${i}`,
    ];
    cells.push({ id: `c${i}`, kind: 'calc', source: lines.join('\n') });
  }
  return cells;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

/** Collects the garbage of what ran before (when node runs with --expose-gc), so each timing starts alike. */
const collect = (globalThis as { gc?: () => void }).gc ?? (() => {});

function time(fn: () => void, collectFirst = true): number {
  if (collectFirst) collect();
  const t0 = performance.now();
  fn();
  return performance.now() - t0;
}

/** Edits timed in each run of the calculation engine's benchmark; the run's figure is their mean. */
const EDITS_PER_RUN = 10;

export function runCalcBench(repeats = 7) {
  const sheet = generateSheet(2000);
  const statements = sheet.flatMap((c) => c.source.split('\n'));

  const bare = create(all);
  const bootstrap = create(all);
  const bindings: Record<string, unknown> = {};
  for (const b of bindLibrary(bootstrap, LIBRARY)) bindings[b.name] = b.fn;
  bare.import(bindings);
  const constants = new Map<string, unknown>(
    CONSTANTS.map((k) => [k.name, k.unit === '' ? k.value : bare.unit(k.value, k.unit)]),
  );
  const bareRun = () => {
    const scope = new Map(constants);
    for (const s of statements) bare.compile(s).evaluate(scope);
  };

  const bareTimes: number[] = [];
  const fullTimes: number[] = [];
  const presentedTimes: number[] = [];
  const editRatios: number[] = [];
  const editTimes: number[] = [];
  bareRun(); // warm-up of both paths, so the JIT treats them alike
  createSheetEngine().evaluate(sheet, { significantFigures: 6 });
  for (let r = 0; r < repeats; r++) {
    bareTimes.push(time(bareRun));
    const engine = createSheetEngine();
    const full = time(() => engine.evaluate(sheet, { significantFigures: 6 }));
    fullTimes.push(full);
    // The same evaluation with every statement typeset, substituted and formatted, as the sandbox
    // sends it to the editor (each cell presented as it is evaluated).
    presentedTimes.push(
      time(() => createSheetEngine().evaluate(sheet, { significantFigures: 6 }, { presentEachCell: true })),
    );
    const editedTo = (energy: string) =>
      sheet.map((c, i) =>
        i === 1989 ? { ...c, source: c.source.replace(/^T_1990 = [\d.]+ MeV/, `T_1990 = ${energy} MeV`) } : c,
      );
    // Editing goes on: EDITS_PER_RUN untimed edits, then EDITS_PER_RUN edits to new values, timed as
    // they come (no collection first, which would shrink the young generation and charge an edit
    // with what steady editing does not pay) and averaged. One edit takes a few milliseconds: timed
    // on one edit, a single garbage-collection pause decided a run, and with one untimed edit before,
    // the timed ones still paid for collecting the two full evaluations just before them (about a
    // second of allocation: 14.2 ms per edit with one untimed edit, 6.4 ms with ten, in one run).
    // The mean carries the collections that editing itself causes.
    for (let e = 0; e < EDITS_PER_RUN; e++)
      engine.evaluate(editedTo(`${200 + r * EDITS_PER_RUN + e}.25`), { significantFigures: 6 });
    let edit = 0;
    for (let e = 0; e < EDITS_PER_RUN; e++) {
      const edited = editedTo(`${100 + r * EDITS_PER_RUN + e}.5`);
      let evaluated = 0;
      edit += time(() => {
        evaluated = engine.evaluate(edited, { significantFigures: 6 }).evaluatedCells;
      }, false);
      if (evaluated !== 11) throw new Error(`expected the edit to re-evaluate 11 cells, it re-evaluated ${evaluated}`);
    }
    edit /= EDITS_PER_RUN;
    editTimes.push(edit);
    editRatios.push(edit / full);
  }
  const bareMs = median(bareTimes);
  const fullMs = median(fullTimes);
  const presentedMs = median(presentedTimes);
  const editMs = median(editTimes);
  return {
    cells: sheet.length,
    statements: statements.length,
    bareMs,
    fullMs,
    presentedMs,
    editMs,
    fullOverBare: fullMs / bareMs,
    presentedOverBare: presentedMs / bareMs,
    editOverFull: editMs / fullMs,
    editRatios,
  };
}

const STUDY_MODEL = (energy: string) =>
  [
    `T_kin = ${energy}`,
    'beta = speedFromKinetic(T_kin, m_p) / c',
    'gamma_L = lorentzFactor(beta)',
    'p = momentumFromKinetic(T_kin, m_p)',
    'Brho = magneticRigidity(p, q_e) to T*m',
    'B_dip = Brho / (1.5 m) to T',
  ].join('\n');

/** Evaluations timed together for each repeat of the model with and without first-order uncertainty. */
const PER_REPEAT = 50;

/**
 * Studies: a 200-step sweep against 200 evaluations of the sheet with the value written in; the
 * first-order uncertainty of five results against the same sheet without uncertainties (each the mean
 * of PER_REPEAT evaluations, so that one garbage-collection pause does not decide it); the Monte
 * Carlo propagation (10 000 draws for each of five results) against the same.
 */
export function runStudyBench(repeats = 5) {
  const cells = (source: string, extra = ''): CellInput[] => [
    { id: 'm', kind: 'calc', source },
    ...(extra ? [{ id: 's', kind: 'calc' as const, source: extra }] : []),
  ];
  const energies = Array.from({ length: 200 }, (_, k) => 70 + (180 * k) / 199);
  const sweepTimes: number[] = [];
  const singleTimes: number[] = [];
  const plainTimes: number[] = [];
  const firstOrderTimes: number[] = [];
  const monteCarloTimes: number[] = [];
  for (let r = 0; r < repeats + 1; r++) {
    const engine = createSheetEngine();
    const sweep = time(() =>
      engine.evaluate(
        cells(STUDY_MODEL('250 MeV'), 'sweep(T_kin, points(70 MeV, 250 MeV, 200), beta, gamma_L, Brho, B_dip)'),
        { significantFigures: 6 },
      ),
    );
    const single = time(() => {
      for (const t of energies) engine.evaluate(cells(STUDY_MODEL(`${t} MeV`)), { significantFigures: 6 });
    });
    // One evaluation of this model takes about a millisecond, so one garbage-collection pause could
    // decide a repeat: each figure is the mean of PER_REPEAT evaluations, each after clearCache (so
    // each evaluates everything, as the first would).
    const evaluations = (source: string) =>
      time(() => {
        for (let i = 0; i < PER_REPEAT; i++) {
          engine.clearCache();
          engine.evaluate(cells(source), { significantFigures: 6 });
        }
      }) / PER_REPEAT;
    const plain = evaluations(STUDY_MODEL('250 MeV'));
    const firstOrder = evaluations(STUDY_MODEL('250 MeV ± 0.4 MeV'));
    engine.clearCache();
    const monteCarlo = time(() =>
      engine.evaluate(cells(STUDY_MODEL('250 MeV ± 0.4 MeV')), { significantFigures: 6, monteCarlo: 'always' }),
    );
    if (r === 0) continue; // warm-up
    sweepTimes.push(sweep);
    singleTimes.push(single);
    plainTimes.push(plain);
    firstOrderTimes.push(firstOrder);
    monteCarloTimes.push(monteCarlo);
  }
  const [sweepMs, singleMs, plainMs, firstOrderMs, monteCarloMs] = [
    sweepTimes,
    singleTimes,
    plainTimes,
    firstOrderTimes,
    monteCarloTimes,
  ].map(median);
  return {
    sweepMs,
    singleMs,
    plainMs,
    firstOrderMs,
    monteCarloMs,
    sweepOverSingles: sweepMs / singleMs,
    firstOrderOverPlain: firstOrderMs / plainMs,
    monteCarloOverPlain: monteCarloMs / plainMs,
  };
}

async function main() {
  const st = runStudyBench();
  console.log('Studies (median of 5 runs)');
  console.log(
    `  sweep of 200 steps: ${st.sweepMs.toFixed(1)} ms; 200 evaluations with the value written in: ${st.singleMs.toFixed(1)} ms; ratio ${st.sweepOverSingles.toFixed(3)}`,
  );
  console.log(
    `  5 results with first-order uncertainty: ${st.firstOrderMs.toFixed(2)} ms against ${st.plainMs.toFixed(2)} ms without (each the mean of ${PER_REPEAT} evaluations); ratio ${st.firstOrderOverPlain.toFixed(2)}   (aim ≤ 1.5)`,
  );
  console.log(
    `  the same with Monte Carlo (10 000 draws each): ${st.monteCarloMs.toFixed(1)} ms, ${(st.monteCarloMs / 5).toFixed(1)} ms per result   (aim ≤ 50 ms per result)\n`,
  );
  const r = runCalcBench();
  console.log('Calculation engine, 2,000-cell sheet with units (median of 7 runs)');
  console.log(`  bare mathjs compile + evaluate:    ${r.bareMs.toFixed(1)} ms for ${r.statements} statements`);
  console.log(
    `  Worldsheet full evaluation:        ${r.fullMs.toFixed(1)} ms  (parse, plan, checks, evaluation, keys)`,
  );
  console.log(`  ratio full / bare:                 ${r.fullOverBare.toFixed(2)}   (aim ≤ 1.3)`);
  console.log(
    `  with every statement typeset, substituted and formatted (as the editor receives it): ${r.presentedMs.toFixed(1)} ms; ratio to bare ${r.presentedOverBare.toFixed(2)} (no aim: made once per cell, kept with its cached result)`,
  );
  console.log(
    `  re-evaluation after editing cell 1990 of 2000: ${r.editMs.toFixed(1)} ms (each run: the mean of ${EDITS_PER_RUN} edits)`,
  );
  console.log(`  ratio edit / full:                 ${r.editOverFull.toFixed(4)}   (aim ≤ 0.03)`);
  console.log(
    `  each run's edit / full: ${r.editRatios.map((x) => x.toFixed(4)).join(', ')}; worst ${Math.max(...r.editRatios).toFixed(4)} (aim ≤ 0.03, steady)`,
  );
  const { worstUlpTable } = await import('../calc/reference-math');
  console.log('\nWorst error in ulp over the β grids (1e-12 … 1 − 1e-15), against 50-digit references (aim ≤ 4)');
  for (const row of worstUlpTable())
    console.log(`  ${row.name.padEnd(34)} ${row.worstUlp.toFixed(2).padStart(6)} ulp  (${row.samples} samples)`);
}

if (process.argv[1]?.endsWith('calc-bench.ts')) await main();
