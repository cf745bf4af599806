// The sheet semantics of the product brief ("The calculation language"): order of definition,
// one definition per name, unit names kept for units, errors kept to their cells, incremental
// re-evaluation, design criteria, display.
// Expected numbers are the hand-checked arithmetic of the statements under test (common practice),
// with unit conversions by SI prefix definitions (SI Brochure, 9th ed., §3); a physical reference
// value names its source beside it.
import { describe, expect, it } from 'vitest';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import type { CellInput } from '../../lib/calc/types';

const engine = createSheetEngine();
const cells = (...sources: string[]): CellInput[] =>
  sources.map((source, i) => ({ id: `c${i + 1}`, kind: 'calc', source }));
const run = (list: CellInput[], significantFigures = 6) => engine.evaluate(list, { significantFigures });

describe('definitions', () => {
  it('evaluates cells top to bottom and carries names down', () => {
    const r = run(cells('L_0 = 2 m', 'A_1 = L_0^2', 'A_1 to cm^2'));
    expect(r.ok).toBe(true);
    expect(r.cells[2].statements[0].value).toMatchObject({ number: 40000, unit: 'cm^2' });
  });

  it('refuses a use before the definition, on the using cell, naming where it is defined', () => {
    const r = run(cells('y = x + 1', 'x = 2', 'z = 5'));
    expect(r.cells[0].ok).toBe(false);
    expect(r.cells[0].error).toBe(
      '`x` is used before it is defined (cell 2, line 1); define names above where they are used',
    );
    expect(r.cells[1].ok).toBe(true);
    expect(r.cells[2].ok).toBe(true);
  });

  it('refuses a second definition of a name', () => {
    const r = run(cells('x = 1', 'x = 2'));
    expect(r.cells[1].error).toBe('`x` is already defined in cell 1, line 1; a name is defined once per sheet');
    expect(r.cells[0].ok).toBe(true);
  });

  it('lets a quantity take a unit name while a number followed by that unit stays that unit', () => {
    // Product brief: "2 m stays two metres after m = 5 kg; the target of to is always units".
    const r = run(
      cells(
        'm = 5 kg',
        'd_1 = 2 m',
        'T = 250 MeV',
        'E_1 = T to J',
        'w_1 = m * 2',
        't = 2 s',
        'v_1 = 9.81 m/s^2 * t',
        'L = 3 m',
        'L_2 = L to m',
      ),
    );
    expect(r.ok).toBe(true);
    const value = (i: number) => r.cells[i].statements[0].value;
    expect(value(1)).toMatchObject({ number: 2, unit: 'm' });
    // SI Brochure table 8: 1 eV = 1.602 176 634e-19 J, so 250 MeV = 4.005 441 585e-11 J
    expect(value(3)?.number).toBeCloseTo(4.005441585e-11, 20);
    expect(value(4)).toMatchObject({ number: 10, unit: 'kg' });
    expect(value(6)).toMatchObject({ number: 19.62, unit: 'm / s' });
    expect(value(8)).toMatchObject({ number: 3, unit: 'm' });
    // The quantity m is italic, the unit m upright.
    expect(r.cells[4].statements[0].tex).toBe('w_{\\mathrm{1}} = m\\cdot2');
    expect(r.cells[1].statements[0].tex).toBe('d_{\\mathrm{1}} = 2~\\mathrm{m}');
  });

  it('reads a bare unit name as a quantity only where the sheet defines it, and above its use', () => {
    const r = run(cells('x_1 = 3 * s', 's = 4 m', 'y_1 = 10 m / s', 'z_1 = 5 * kg'));
    expect(r.cells[0].error).toBe(
      '`s` is used before it is defined (cell 2, line 1); define names above where they are used',
    );
    expect(r.cells[3].statements[0].value).toMatchObject({ number: 5, unit: 'kg' });
    // "10 m" is ten metres; the bare s after the spaced "/" is the quantity s = 4 m.
    expect(r.cells[2].statements[0].value).toMatchObject({ number: 2.5 });
  });

  it("refuses to redefine built-in constants; a built-in function's name may be the sheet's own (names.ts)", () => {
    const r = run(cells('c = 3e8 m/s', 'pi = 3', 'lorentzFactor = 2', 'sin(x) = x', 'y_s = sin(2)'));
    expect(r.cells[0].error).toBe('`c` is a built-in constant and cannot be redefined');
    expect(r.cells[1].error).toBe('`pi` is a built-in value and cannot be redefined');
    expect(r.cells[2].statements[0].value).toMatchObject({ number: 2 });
    expect(r.cells[3].ok).toBe(true);
    // The sheet's sin(x) = x, not the sine (0.909…).
    expect(r.cells[4].statements[0].value).toMatchObject({ number: 2 });
  });

  it('reports an undefined name and a line it cannot read', () => {
    const r = run(cells('y = q_1 + 1', 'z = (1 + ', 'w = 3 # fine'));
    expect(r.cells[0].error).toBe('`q_1` is not defined; did you mean `q_e`?');
    expect(r.cells[1].error).toMatch(/^cannot read this line: /);
    expect(r.cells[2].ok).toBe(true);
  });

  it('accepts functions defined in the sheet and comments after #', () => {
    const r = run(cells('f(x) = 2 x + 1   # a line', 'y = f(3)  # seven'));
    expect(r.ok).toBe(true);
    expect(r.cells[1].statements[0].value?.number).toBe(7);
  });
});

describe('errors stay in their cells', () => {
  it('fails only the cells that depend on a failed name', () => {
    const r = run(cells('x_a = 1 m', 'x_b = x_a + 1 s', 'x_c = x_a * 2', 'x_d = x_b * 2', 'x_e = 5'));
    expect(r.cells.map((c) => c.ok)).toEqual([true, false, true, false, true]);
    expect(r.cells[1].error).toBe(
      'cannot add `x_a` (a length, 1 m) and `1 s` (a time): the terms of a sum must have the same dimension (a length and a time)',
    );
    expect(r.cells[3].error).toBe('depends on `x_b`, which is not available: it has an error in cell 2, line 1');
  });

  it('keeps evaluating the statements of a cell that do not depend on its error', () => {
    const r = run(cells('x_a = 1 m\nx_b = x_a + 1 s\nx_c = 3'));
    expect(r.cells[0].statements.map((s) => s.error === null)).toEqual([true, false, true]);
  });
});

describe('incremental re-evaluation', () => {
  it('re-evaluates only the edited cell and what depends on it', () => {
    const local = createSheetEngine();
    const sheet = cells('x_a = 1 m', 'x_b = x_a * 2', 'x_c = 7 s', 'x_d = x_b * 3', 'x_e = x_c * 2');
    expect(local.evaluate(sheet, { significantFigures: 6 }).evaluatedCells).toBe(5);
    expect(local.evaluate(sheet, { significantFigures: 6 }).evaluatedCells).toBe(0);

    const lastEdited = sheet.map((c, i) => (i === 4 ? { ...c, source: 'x_e = x_c * 3' } : c));
    const r1 = local.evaluate(lastEdited, { significantFigures: 6 });
    expect(r1.evaluatedCells).toBe(1);
    expect(r1.cells[4].statements[0].value?.number).toBe(21);

    const firstEdited = lastEdited.map((c, i) => (i === 0 ? { ...c, source: 'x_a = 2 m' } : c));
    const r2 = local.evaluate(firstEdited, { significantFigures: 6 });
    expect(r2.evaluatedCells).toBe(3); // x_a, then x_b and x_d that depend on it; x_c and x_e untouched
    expect(r2.cells[3].statements[0].value).toMatchObject({ number: 12, unit: 'm' });
  });

  it('updates messages that name another cell when that cell changes', () => {
    const local = createSheetEngine();
    const r1 = local.evaluate(cells('x = 1', 'x = 2'), { significantFigures: 6 });
    expect(r1.cells[1].ok).toBe(false);
    const r2 = local.evaluate(cells('w = 1', 'x = 2'), { significantFigures: 6 });
    expect(r2.cells[1].ok).toBe(true);
  });
});

describe('design criteria', () => {
  it('compares exactly, where mathjs alone would apply a relative tolerance of 1e-12', () => {
    // mathjs documentation, configuration: relTol defaults to 1e-12, so 0.9999999999995 < 1 is false there.
    const r = run(cells('0.9999999999995 < 1', '1 < 1 + 1e-15', '1 <= 1'));
    expect(r.cells[0].statements[0].criterion).toMatchObject({ pass: true, comparison: 'exact' });
    expect(r.cells[1].statements[0].criterion?.pass).toBe(true);
    expect(r.cells[2].statements[0].criterion?.pass).toBe(true);
  });

  it('shows pass or fail with the margin to the limit, in any units of the same dimension', () => {
    const r = run(cells('B_1 = 1.62 T', 'B_1 < 1.8 T', 'B_1 > 1620.000001 mT', 'B_1 < 2 m'));
    expect(r.cells[1].statements[0].criterion).toMatchObject({ pass: true, margin: expect.closeTo(0.1, 12) });
    expect(r.cells[1].statements[0].criterion?.marginText).toBe(
      'margin 10 % of the limit, compared exactly (no tolerance)',
    );
    expect(r.cells[2].statements[0].criterion?.pass).toBe(false);
    expect(r.cells[3].error).toBe(
      'the two sides of the criterion have different dimensions: `B_1` (a magnetic flux density, 1.620\u202f00 T) and `2 m` (a length); compare quantities of one kind',
    );
  });

  it('treats chained comparisons as one criterion', () => {
    const r = run(cells('x_1 = 5 cm', '1 cm < x_1 < 10 cm', '1 cm < x_1 < 4 cm'));
    expect(r.cells[1].statements[0].criterion?.pass).toBe(true);
    expect(r.cells[2].statements[0].criterion?.pass).toBe(false);
  });
});

describe('what a statement shows', () => {
  it('typesets the formula, the substituted formula and the result with its unit', () => {
    const r = run(cells('T_kin = 250 MeV', 'E_tot = T_kin + m_p c^2 to MeV'));
    const st = r.cells[1].statements[0];
    expect(st.tex).toContain('E_{\\mathrm{tot}} = T_{\\mathrm{kin}}');
    expect(st.tex).toContain('m_{\\mathrm{p}}');
    expect(st.substitutedTex).toContain('\\left(250\\ \\mathrm{MeV}\\right)');
    // CODATA 2022: m_p c^2 = 938.272 089 43 MeV, so 250 MeV + m_p c^2 = 1188.272 089 43 MeV
    expect(st.value?.number).toBeCloseTo(1188.27208943, 6);
    expect(st.value?.text).toBe('1188.27 MeV');
    expect(st.value?.unit).toBe('MeV');
  });

  it('keeps full precision in the value while rounding the display to the sheet setting', () => {
    const r = run(cells('x = 1/3', 'y = 299792458 m/s', 'z = 12345.6789', 'w = -0.000123456 s'), 4);
    expect(r.cells[0].statements[0].value).toMatchObject({ number: 1 / 3, text: '0.3333' });
    // ISO 80000-1 §7.3.1: digits grouped in threes by a thin space; powers of ten as × 10ⁿ;
    // the minus sign U+2212. The sheet shows 4 significant figures.
    expect(r.cells[1].statements[0].value?.text).toBe('2.998 × 10⁸ m/s');
    expect(r.cells[1].statements[0].value?.number).toBe(299792458);
    expect(r.cells[2].statements[0].value?.text).toBe('12\u202f350');
    expect(r.cells[3].statements[0].value?.text).toBe('\u2212123.5 µs');
  });

  it('records the engine version and the constants edition', () => {
    const r = run(cells('x = 1'));
    expect(r.engineVersion).toMatch(/^worldsheet-calc \d+\.\d+\.\d+/);
    expect(r.constantsEdition).toBe('CODATA 2022; SI 2019 exact; PDG 2024; AME 2020; IERS 2010');
  });
});

describe('input tables (CSV attachments)', () => {
  const table = (values: number[], sha = 'a'.repeat(64)) => ({
    name: 'scan',
    sha256: sha,
    fileName: 'scan.csv',
    columns: [
      { name: 'energy', unit: 'MeV', values },
      { name: 'turns', unit: null, values: values.map((_, i) => i + 1) },
      { name: 'temp', unit: 'degC', values: values.map(() => 20) },
    ],
  });
  const withTable = (list: CellInput[], values = [70, 150, 250], sha?: string) =>
    engine.evaluate(list, { significantFigures: 6, tables: [table(values, sha)] });

  it('gives each column as a list with its unit; an element by index; list functions work', () => {
    const r = withTable(
      cells(
        'E_all = scan.energy',
        'E_3 = scan.energy[3] to J',
        'n_mean = mean(scan.turns)',
        'T_room = scan.temp[1] to K',
      ),
    );
    expect(r.ok).toBe(true);
    expect(r.cells[0].statements[0].value).toMatchObject({ kind: 'matrix', text: '[70, 150, 250] MeV', unit: 'MeV' });
    // 1 eV = 1.602 176 634 × 10⁻¹⁹ J exactly (SI Brochure, 9th ed., Table 8): 250 MeV = 4.005 441 585 × 10⁻¹¹ J.
    expect(r.cells[1].statements[0].value!.number).toBeCloseTo(4.005441585e-11, 20);
    expect(r.cells[2].statements[0].value!.number).toBe(2);
    // 20 °C = 293.15 K (SI Brochure, 9th ed., §2.3.1: t/°C = T/K − 273.15): offset units stay correct.
    expect(r.cells[3].statements[0].value!.number).toBeCloseTo(293.15, 10);
  });

  it('applies library functions element by element to a column', () => {
    const r = withTable(cells('g = lorentzFactor(speedFromKinetic(scan.energy, m_p))'));
    // γ = 1 + T/(m_p c²), m_p c² = 938.272 089 43 MeV (CODATA 2022): 1.074 605, 1.159 868, 1.266 447.
    const text = r.cells[0].statements[0].value!.text;
    expect(text).toBe('[1.074\u202f61, 1.159\u202f87, 1.266\u202f45]');
  });

  it('names a missing column and its columns, refuses a property of anything else, and keeps the table name', () => {
    const r = withTable(cells('x = scan.energi', 'L_1 = 2 m\ny_1 = L_1.value', 'scan = 3'));
    expect(r.cells[0].error).toBe(
      'the input table `scan` has no column `energi`; its columns are energy [MeV], turns, temp [degC]',
    );
    expect(r.cells[1].statements[1].error).toBe('`L_1` is not an input table; `.` reads a column of an input table');
    expect(r.cells[2].error).toBe(
      '`scan` is the input table read from the attachment scan.csv; a name is defined once per sheet',
    );
  });

  it('re-evaluates the cells that use a table when its content (SHA-256) changes, and only those', () => {
    const list = cells('a_1 = 1 m', 'E_max = max(scan.energy)');
    withTable(list, [70, 250], '1'.repeat(64));
    const again = withTable(list, [70, 250], '1'.repeat(64));
    expect(again.evaluatedCells).toBe(0);
    const changed = withTable(list, [70, 230], '2'.repeat(64));
    expect(changed.evaluatedCells).toBe(1);
    expect(changed.cells[1].statements[0].value!.text).toBe('230 MeV');
  });

  it('refuses lists of different lengths in one function call, naming the element on a domain error', () => {
    const r = withTable(
      cells('v_1 = addVelocities(scan.turns / 10, [0.1, 0.2])', 'g_1 = lorentzFactor(scan.turns / 2)'),
    );
    expect(r.cells[0].error).toBe('addVelocities: the lists given have different lengths (3 and 2)');
    expect(r.cells[1].error).toMatch(/\(element 2\)$/);
  });
});
