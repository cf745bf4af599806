// The engine's caches never change an answer: after any sequence of edits, a long-lived engine
// (parse cache, cell cache, the previous plan of the sheet, memoised cell keys) returns exactly what
// a fresh engine returns for the same cells, and a cell's statements read the same whether they were
// presented as the cell was evaluated (the sandbox) or on first read. Common practice: an
// incremental computation is checked against computing from scratch.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import type { CellInput, EvaluateOptions, SheetResult } from '../../lib/calc/types';
import { seedFastCheck } from './fast-check-seed';

seedFastCheck('tests/calc/engine-incremental.test.ts', 20261204);

// Cell texts that define, use, redefine, move, cite and break names; edits swap one for another.
const TEXTS = [
  'x_a = 2 m',
  'x_a = 3 m',
  'x_a = 1 m ± 0.01 m',
  'y_b = x_a * 2',
  'y_b = x_a * 3 to cm',
  'z_c = y_b + x_a',
  'x_b = 5 s\nz_d = x_a / x_b',
  'f(t) = t * 2\nw_f = f(x_a)',
  'w_g = f(2 m)',
  'y_b < 10 m',
  'k_1 = 2 ± 0.1\nk_2 = 3 ± 0.2\ncorrelation(k_1, k_2, 0.5)\nk_3 = k_1 + k_2',
  'correlation(k_1, k_2, -0.25)',
  'q_1 = lorentzFactor(0.5)\nq_2 = q_1 * x_a',
  'sweep(x_a, [1 m, 2 m], y_b, z_c)',
  'plot(x_a, [1 m, 2 m], y_b)',
  'T_k = 200 MeV',
  'v_k = speedFromKinetic(T_k, m_p)',
  'x_a = 4 m\nx_a = 5 m',
  'b_1 = (',
  'h_1 = 2 h',
  'x_a = 1 T m',
  'c_1 = fromRevision("ZZ-CALC-0001", "A", "Brho")',
  '# a comment only',
  // Cells of two statements and cells reading one of them: a name's key is its statement's.
  'p_1 = 2 m\np_2 = 3 s',
  'p_1 = 4 m\np_2 = 3 s',
  'p_1 = 2 m\np_2 = 7 s',
  'p_0 = 1\np_1 = 2 m\np_2 = 3 s',
  'p_1 = 2 m\np_2 = p_1 / (2 m/s)',
  'p_2 = 5 s\np_1 = p_2 * 1 m/s',
  'p_1 = x_a * 2\np_2 = 1 s / (x_a - x_a)',
  'p_1 = x_a * 2\np_2 = k_1 * 3 s',
  'p_2 = 3 s\ng_p(t) = t * p_2\np_1 = g_p(2) * 1 m/s',
  'r_1 = p_2 * 2',
  'r_2 = p_1 + x_a',
  'r_3 = g_p(1 s) + p_2',
];

const options: EvaluateOptions = {
  significantFigures: 6,
  references: [
    {
      sheet: 'ZZ-CALC-0001',
      revision: 'A',
      name: 'Brho',
      value: { number: 2.5, unit: 'T m', uncertainty: 0.01 },
      error: null,
      status: 'current',
      supersededBy: null,
      title: 'Cited',
      versionSha256: 'a'.repeat(64),
    },
  ],
};

const sheetOf = (texts: string[]): CellInput[] =>
  texts.map((source, i) => ({ id: `c${i}`, kind: i === 2 ? ('text' as const) : ('calc' as const), source }));

/** The result as sent and stored (getters read), without the count of cells evaluated. */
const answer = (r: SheetResult) => JSON.stringify({ ...r, evaluatedCells: 0 });

describe('incremental evaluation equals evaluation from scratch', () => {
  it('after any sequence of edits', () => {
    const text = fc.constantFrom(...TEXTS);
    // One long-lived engine for every run (its caches see many sheets); the answer from scratch is
    // an engine whose caches are emptied first.
    const engine = createSheetEngine();
    const scratch = createSheetEngine();
    fc.assert(
      fc.property(
        fc.array(text, { minLength: 6, maxLength: 6 }),
        fc.array(fc.tuple(fc.nat(5), text), { minLength: 1, maxLength: 6 }),
        (initial, edits) => {
          let texts = initial;
          engine.evaluate(sheetOf(texts), options);
          for (const [at, replacement] of edits) {
            texts = texts.map((t, i) => (i === at ? replacement : t));
            const incremental = engine.evaluate(sheetOf(texts), options);
            scratch.clearCache();
            const fresh = scratch.evaluate(sheetOf(texts), options);
            expect(answer(incremental)).toBe(answer(fresh));
          }
        },
      ),
      { numRuns: 150 },
    );
  });

  it('re-evaluates only what an edit reaches, and again everything that a moved definition reaches', () => {
    const engine = createSheetEngine();
    const texts = ['x_a = 2 m', 'y_b = x_a * 2', '## note', 'z_c = y_b + x_a', 'T_k = 200 MeV', 'v_k = T_k * 2'];
    engine.evaluate(sheetOf(texts), options);
    const edited = texts.map((t, i) => (i === 4 ? 'T_k = 210 MeV' : t));
    expect(engine.evaluate(sheetOf(edited), options).evaluatedCells).toBe(2);
    // x_a now defined one cell lower: y_b reads it before its definition.
    const moved = edited.map((t, i) => (i === 0 ? '# moved' : i === 1 ? 'x_a = 2 m\ny_b = x_a * 2' : t));
    const r = engine.evaluate(sheetOf(moved), options);
    expect(answer(r)).toBe(answer(createSheetEngine().evaluate(sheetOf(moved), options)));
    expect(r.cells[3].ok).toBe(true);
  });

  it('follows an edit of a first definition past a later cell that defines the name again', () => {
    // Found by the property above: the cell that repeats a definition (an error) used to give the
    // name its own key, so the cells reading the name kept their cached value after the first
    // definition changed, and showed a value the sheet no longer gives.
    // The values are plain arithmetic on invented inputs (1 T·m × 3 = 3 T·m; 4 m × 3 = 12 m).
    const engine = createSheetEngine();
    const texts = ['x_a = 1 T m', '# nothing', '## note', 'x_a = 2 m', 'y_b = x_a * 3', '# nothing'];
    expect(engine.evaluate(sheetOf(texts), options).cells[4].statements[0].value?.text).toBe('3 T·m');
    const edited = texts.map((t, i) => (i === 0 ? 'x_a = 4 m' : t));
    const r = engine.evaluate(sheetOf(edited), options);
    expect(r.cells[4].statements[0].value?.text).toBe('12 m');
    expect(r.cells[3].error).toBe('`x_a` is already defined in cell 1, line 1; a name is defined once per sheet');
  });

  it('answers a reader of one statement from the cache after another statement of its cell is edited', () => {
    const engine = createSheetEngine();
    const texts = ['p_1 = 2 m\np_2 = 3 s', 'r_1 = p_2 * 2', '## note', 'r_2 = p_1 * 2', 'r_3 = r_1 / 2', '# nothing'];
    const before = engine.evaluate(sheetOf(texts), options);
    const edited = texts.map((t, i) => (i === 0 ? 'p_1 = 5 m\np_2 = 3 s' : t));
    const r = engine.evaluate(sheetOf(edited), options);
    // The edited cell and the reader of p_1; r_1 and r_3 (which reads r_1) come from the cache.
    expect(r.evaluatedCells).toBe(2);
    expect(r.cells[1]).toBe(before.cells[1]);
    expect(r.cells[4]).toBe(before.cells[4]);
    // Plain arithmetic: 5 m × 2 = 10 m, 3 s × 2 = 6 s.
    expect(r.cells[3].statements[0].value?.text).toBe('10 m');
    expect(r.cells[1].statements[0].value?.text).toBe('6 s');
    expect(answer(r)).toBe(answer(createSheetEngine().evaluate(sheetOf(edited), options)));
  });

  it('follows a failing statement to its new line and cell, and an edit that mends it', () => {
    const engine = createSheetEngine();
    const texts = ['p_1 = 2 m\np_2 = 1 s / (p_1 - 2 m)', 'r_1 = p_2 * 2', '## note', 'r_2 = p_1 * 2', '# a', '# b'];
    const failed = engine.evaluate(sheetOf(texts), options);
    expect(failed.cells[1].error).toBe('depends on `p_2`, which is not available: it has an error in cell 1, line 2');
    const steps = [
      // A line above it: the failure is now on line 3, and r_1 must say so.
      texts.map((t, i) => (i === 0 ? 'p_0 = 1\np_1 = 2 m\np_2 = 1 s / (p_1 - 2 m)' : t)),
      // A cell above it: cell 2 (the third stays a note: sheetOf).
      ['# above', 'p_0 = 1\np_1 = 2 m\np_2 = 1 s / (p_1 - 2 m)', '## note', 'r_1 = p_2 * 2', 'r_2 = p_1 * 2', '# a'],
      // p_1 edited: p_2 (which reads it) now has a value.
      ['# above', 'p_0 = 1\np_1 = 3 m\np_2 = 1 s / (p_1 - 2 m)', '## note', 'r_1 = p_2 * 2', 'r_2 = p_1 * 2', '# a'],
    ];
    const errors: Array<string | null> = [];
    for (const step of steps) {
      const r = engine.evaluate(sheetOf(step), options);
      expect(answer(r)).toBe(answer(createSheetEngine().evaluate(sheetOf(step), options)));
      errors.push(r.cells[step.indexOf('r_1 = p_2 * 2')].error);
    }
    expect(errors).toEqual([
      'depends on `p_2`, which is not available: it has an error in cell 1, line 3',
      'depends on `p_2`, which is not available: it has an error in cell 2, line 3',
      null,
    ]);
  });

  it('keys a definition below an uncertain input so that an edit of its cell reaches its readers', () => {
    // z cannot be evaluated on either side of x = 0.5 (β beyond 1 at the steps); y does not read it,
    // so y's propagation does not fail with it (tests/calc/propagation-unrelated.test.ts). Editing z
    // (another statement of y's cell) must give w, which reads only y, what a fresh evaluation gives.
    // (y's conditional keeps it off the numeric chain, and it is linear: no Monte Carlo run changes
    // w's key.)
    const engine = createSheetEngine();
    const texts = [
      'x_u = 0.5 ± 0.1',
      'z_u = lorentzFactor(0.5 + (x_u - 0.5)^2 * 1e20)\ny_u = (x_u > 0 ? 3 : 0) * x_u',
      '## note',
      'w_u = y_u * 2',
    ];
    const before = engine.evaluate(sheetOf(texts), options);
    expect(before.cells[1].statements[0].error).toMatch(/uncertainty cannot be propagated/);
    expect(before.cells[3].error).toBeNull();
    expect(answer(before)).toBe(answer(createSheetEngine().evaluate(sheetOf(texts), options)));
    const edited = texts.map((t, i) => (i === 1 ? 'z_u = 2 * x_u\ny_u = (x_u > 0 ? 3 : 0) * x_u' : t));
    const r = engine.evaluate(sheetOf(edited), options);
    expect(r.cells[3].error).toBeNull();
    expect(answer(r)).toBe(answer(createSheetEngine().evaluate(sheetOf(edited), options)));
  });

  it('keys the names of a cell the sandbox skipped apart from their evaluated keys', () => {
    const engine = createSheetEngine();
    const texts = ['p_1 = 2 m\np_2 = 3 s', 'r_1 = p_2 * 2', '## note', 'r_2 = p_1 * 2', '# a', '# b'];
    const skipped = engine.evaluate(sheetOf(texts), options, { skip: new Map([['c0', 'it took too long']]) });
    expect(skipped.cells[1].error).toBe('depends on `p_2`, which is not available: it has an error in cell 1, line 2');
    const r = engine.evaluate(sheetOf(texts), options);
    expect(r.cells[1].error).toBeNull();
    expect(answer(r)).toBe(answer(createSheetEngine().evaluate(sheetOf(texts), options)));
  });

  it('keys a name read before its definition by where and what that definition is', () => {
    // Both were stale cache hits before: the reader's key held the later definition's place but not
    // its kind, and a spaced unit name's definition only whether there was one.
    const pairs: Array<[string[], string[], string]> = [
      [
        ['w_1 = f_q(2)', 'f_q = 3'],
        ['w_1 = f_q(2)', 'f_q(t) = t'],
        '`f_q` is used before it is defined (cell 2, line 1); define names above where they are used',
      ],
      [
        ['q_1 = 1 T m', '# x', 'm = 2'],
        ['q_1 = 1 T m', 'm = 2', '# x'],
        '`T m` after a number reads `m` as a unit, but this sheet also defines a quantity `m` (cell 2, line 1): write `T*m` (no spaces) for the unit, or put `*` with spaces before the quantity (`… * m`)',
      ],
    ];
    for (const [first, then, message] of pairs) {
      const engine = createSheetEngine();
      const cells = (texts: string[]): CellInput[] => texts.map((source, i) => ({ id: `c${i}`, kind: 'calc', source }));
      engine.evaluate(cells(first), options);
      const r = engine.evaluate(cells(then), options);
      expect(r.cells[0].error).toBe(message);
      expect(answer(r)).toBe(answer(createSheetEngine().evaluate(cells(then), options)));
    }
  });

  it('presents the same statements whether at once or on first read', () => {
    const texts = [
      'x_a = 1 m ± 0.01 m',
      'y_b = x_a * 3 to cm',
      '## note',
      'y_b < 10 m',
      'h_1 = 2 h',
      'w = m_p c^2 to MeV',
    ];
    const eager = createSheetEngine().evaluate(sheetOf(texts), options, { presentEachCell: true });
    const lazy = createSheetEngine().evaluate(sheetOf(texts), options);
    expect(answer(lazy)).toBe(answer(eager));
    expect(lazy.cells[1].statements[0].substitutedTex).toContain('\\left(1\\ \\mathrm{m}\\right)');
    expect(lazy.cells[5].statements[0].value?.unit).toBe('MeV');
  });
});
