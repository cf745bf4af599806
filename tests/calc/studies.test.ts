// Engineering studies in the engine: parameter sweeps, plots and space-time diagrams, inputs with a
// standard uncertainty and its propagation, and citations of other sheets' issued results.
import { describe, expect, it } from 'vitest';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import type { CellInput, ResolvedReference, SheetResult, StatementResult } from '../../lib/calc/types';
import { combinedText } from '../../lib/calc/uncertainty-text';

const C = 299_792_458; // m/s, exact (SI Brochure, 9th ed.)
const E = 1.602_176_634e-19; // C, exact (SI Brochure, 9th ed.)
const MP_MEV = 938.272_089_43; // proton rest energy, MeV (CODATA 2022)
const A0 = 25; // m/s², a test value of the proper acceleration (common practice, no published source)
const LY = C * 365.25 * 86_400; // light-year, m (IAU: c × Julian year)

const engine = createSheetEngine();
const calc = (...sources: string[]): CellInput[] =>
  sources.map((source, i) => ({ id: `c${i + 1}`, kind: 'calc', source }));
const run = (cells: CellInput[], options: Partial<Parameters<typeof engine.evaluate>[1]> = {}): SheetResult =>
  engine.evaluate(cells, { significantFigures: 6, ...options });
const statement = (r: SheetResult, name: string): StatementResult => {
  const st = r.cells.flatMap((c) => c.statements).find((s) => s.name === name);
  if (!st) throw new Error(`no statement defines ${name}`);
  return st;
};
const studies = (r: SheetResult) =>
  r.cells.flatMap((c) => c.statements).filter((s) => s.kind === 'sweep' || s.kind === 'plot');

const BEAM =
  'T_kin = 250 MeV\nbeta = speedFromKinetic(T_kin, m_p) / c\ngamma_L = lorentzFactor(beta)\np = momentumFromKinetic(T_kin, m_p)\nBrho = magneticRigidity(p, q_e) to T*m';

describe('parameter sweeps', () => {
  it('gives at each step exactly what a single evaluation with that value gives', () => {
    const r = run(calc(BEAM, 'sweep(T_kin, steps(70 MeV, 250 MeV, 20 MeV), beta, gamma_L, p, Brho)'));
    const [sweep] = studies(r);
    expect(sweep.error).toBeNull();
    const table = sweep.table!;
    expect(table.columns.map((c) => c.name)).toEqual(['T_kin', 'beta', 'gamma_L', 'p', 'Brho']);
    expect(table.columns[0].unit).toBe('MeV');
    expect(table.columns[4].unit).toBe('T m');
    const written = [70, 90, 110, 130, 150, 170, 190, 210, 230, 250];
    expect(table.rows).toHaveLength(written.length);
    for (const [k, row] of table.rows.entries()) {
      const single = run(calc(BEAM.replace('T_kin = 250 MeV', `T_kin = ${written[k]} MeV`)));
      // The input column shows the value as written (15 significant digits), the rest exactly what a single evaluation gives.
      expect(row[0]).toBe(written[k]);
      expect(row[0]).toBeCloseTo(statement(single, 'T_kin').value!.number!, 12);
      expect(row[1]).toBe(statement(single, 'beta').value!.number);
      expect(row[2]).toBe(statement(single, 'gamma_L').value!.number);
      expect(row[4]).toBe(statement(single, 'Brho').value!.number);
    }
    expect(table.errors.every((e) => e === null)).toBe(true);
  });

  it('agrees with the magnetic rigidity from the PDG kinematics relations at 250 MeV', () => {
    // PDG Review of Particle Physics, Kinematics: E² = (pc)² + (mc²)²; pc = √(T² + 2T·mc²); Bρ = p/e.
    const pc = Math.sqrt(250 ** 2 + 2 * 250 * MP_MEV); // MeV
    const brho = (pc * 1e6 * E) / C / E; // T·m
    const r = run(calc(BEAM, 'sweep(T_kin, [70, 250] MeV, Brho)'));
    const row = studies(r)[0].table!.rows[1];
    // To 10 decimals: the proton rest energy above is CODATA's rounded MeV value (u = 2.9 × 10⁻⁷ MeV).
    expect(row[1]!).toBeCloseTo(brho, 10);
    expect(brho).toBeCloseTo(2.432_13, 5);
  });

  it('keeps a failed step to its row and names why', () => {
    const r = run(calc('v = 0.5\ng_v = lorentzFactor(v)', 'sweep(v, [0.2, 1.5, 0.6], g_v)'));
    const table = studies(r)[0].table!;
    expect(table.rows[0][1]).toBeCloseTo(1 / Math.sqrt(1 - 0.04), 15);
    expect(table.rows[1][1]).toBeNull();
    expect(table.errors[1]).toMatch(/lorentzFactor/);
    expect(table.rows[2][1]).toBeCloseTo(1.25, 15);
  });

  it('refuses what is not a sweep', () => {
    const bad = run(
      calc(
        'x_a = 2 m\ny_a = 3 * x_a',
        'sweep(x_a, [1, 2] s, y_a)',
        'sweep(x_a, 2 m)',
        'sweep(x_a, [1, 2] m, z_a)',
        'k_a = 2 * sweep(x_a, [1] m, y_a)',
      ),
    );
    const [dimension, tooFew, undefinedName] = studies(bad);
    expect(dimension.error).toMatch(/dimension of `x_a`/);
    expect(tooFew.error).toMatch(/sweep\(input, values, result1/);
    expect(undefinedName.error).toMatch(/`z_a` is not defined/);
    expect(statement(bad, 'k_a').error).toMatch(/statement of its own line/);
  });

  it('steps includes the end when it falls on a step, and points spaces n values evenly', () => {
    const r = run(calc('x_s = steps(0 m, 1 m, 0.25 m)\ny_s = steps(0 m, 1 m, 0.3 m)\nz_s = points(1 s, 2 s, 5)'));
    // Six significant figures with their trailing zeros; whole numbers without a fraction (lib/calc/format.ts).
    expect(statement(r, 'x_s').value!.text).toBe('[0, 0.250\u202f000, 0.500\u202f000, 0.750\u202f000, 1] m');
    expect(statement(r, 'y_s').value!.text).toBe('[0, 0.300\u202f000, 0.600\u202f000, 0.900\u202f000] m');
    expect(statement(r, 'z_s').value!.text).toBe('[1, 1.250\u202f00, 1.500\u202f00, 1.750\u202f00, 2] s');
  });
});

describe('plots', () => {
  it('draws curves of results against the swept input, in their display units', () => {
    const r = run(calc(BEAM, 'plot(T_kin, points(70 MeV, 250 MeV, 10), Brho)'));
    const plot = studies(r)[0].plot!;
    expect(plot.kind).toBe('curve');
    expect(plot.x).toEqual({ label: 'T_kin', unit: 'MeV' });
    expect(plot.y.unit).toBe('T m');
    expect(plot.series[0].points).toHaveLength(10);
    expect(plot.series[0].points[9][1]).toBe(statement(r, 'Brho').value!.number);
  });

  it('refuses series of different dimensions on one axis', () => {
    const r = run(calc(BEAM, 'plot(T_kin, [100, 200] MeV, Brho, beta)'));
    expect(studies(r)[0].error).toMatch(/share an axis/);
  });

  it('draws the worldline of constant proper acceleration and its horizon on a space-time diagram', () => {
    // Hyperbolic motion from rest: x(t) = (c²/a)(√(1 + (at/c)²) − 1) (W. Rindler, Relativity:
    // Special, General, and Cosmological, 2nd ed., §3.7); horizon distance c²/a.
    const r = run(
      calc(
        'a0 = 25 m/s^2\nt = 1 year\nx_w = hyperbolicDistance(a0, t)\nd_h = rindlerHorizonDistance(a0)',
        'spacetime(t, points(0 year, 3 year, 13), x_w, d_h)',
      ),
    );
    const plot = studies(r)[0].plot!;
    expect(plot.kind).toBe('spacetime');
    expect(plot.x).toEqual({ label: 'x', unit: 'ly' });
    expect(plot.y).toEqual({ label: 'ct', unit: 'ly' });
    expect(plot.horizons).toEqual([{ name: 'd_h', distance: expect.closeTo((C * C) / A0 / LY, 12) }]);
    expect(plot.horizons![0].distance).toBeCloseTo(0.380_0, 4); // c²/a0 in light-years
    const points = plot.series[0].points;
    expect(points).toHaveLength(13);
    for (const [x, ct] of points) {
      const t = (ct * LY) / C;
      const expected = ((C * C) / A0) * (Math.sqrt(1 + ((A0 * t) / C) ** 2) - 1);
      expect(x).toBeCloseTo(expected / LY, 12);
      // A massive body stays inside the light cone of its start, and outside its horizon's light line.
      expect(x).toBeLessThanOrEqual(ct);
      expect(x).toBeGreaterThan(ct - plot.horizons![0].distance);
    }
  });

  it('asks for a time to sweep and for distances on a space-time diagram', () => {
    const r = run(
      calc(
        'a0 = 25 m/s^2\nt = 1 year\nx_w = hyperbolicDistance(a0, t)\nv_s = hyperbolicSpeed(a0, t)',
        'spacetime(a0, [1, 2] m/s^2, x_w)',
        'spacetime(t, [1, 2] year, v_s)',
      ),
    );
    const [notTime, notLength] = studies(r);
    expect(notTime.error).toMatch(/sweeps a time/);
    expect(notLength.error).toMatch(/not a length/);
  });
});

describe('uncertainty (JCGM 100:2008, law of propagation of uncertainty)', () => {
  it('propagates to the Lorentz factor with the textbook sensitivity βγ³', () => {
    // dγ/dβ = βγ³ (any special relativity text); u_c(γ) = βγ³·u(β) to first order.
    const r = run(calc('b_0 = 0.6 ± 0.001\ng_0 = lorentzFactor(b_0)'));
    const input = statement(r, 'b_0').uncertainty!;
    expect(input.kind).toBe('input');
    expect(input.u).toBe(0.001);
    const u = statement(r, 'g_0').uncertainty!;
    expect(u.kind).toBe('propagated');
    expect(u.u).toBeCloseTo(0.6 * 1.25 ** 3 * 0.001, 9);
    expect(u.budget).toHaveLength(1);
    expect(u.budget[0].name).toBe('b_0');
    expect(u.budget[0].sensitivity).toBeCloseTo(0.6 * 1.25 ** 3, 6);
    expect(u.budget[0].share).toBeCloseTo(1, 12);
    // y ± U (k = 2), U to two significant digits (JCGM 100, 7.2.6): U = 0.002 34… → 0.0023.
    expect(u.U).toBe(0.0023);
    expect(u.text).toBe('1.2500 ± 0.0023 (k = 2)');
    expect(u.warning).toBeNull();
  });

  it('propagates a beam energy uncertainty to magnetic rigidity, with units, as the PDG relations give', () => {
    // Bρ = p/e with pc = √(T² + 2T·mc²) (PDG, Kinematics): d(pc)/dT = (T + mc²)/(pc).
    const r = run(calc(BEAM.replace('T_kin = 250 MeV', 'T_kin = 250 MeV ± 0.5 MeV')));
    const u = statement(r, 'Brho').uncertainty!;
    const pc = Math.sqrt(250 ** 2 + 2 * 250 * MP_MEV);
    const dBrhoPerMeV = ((250 + MP_MEV) / pc) * (1e6 / C); // T·m per MeV
    expect(u.unit).toBe('T m');
    expect(u.u).toBeCloseTo(dBrhoPerMeV * 0.5, 10);
    expect(u.budget[0].sensitivityText).toMatch(/T·m\/MeV$/);
    expect(u.text).toBe('(2.4321 ± 0.0054) T·m (k = 2)');
  });

  it('adds independent contributions in quadrature and gives each its share', () => {
    const r = run(calc('L_1 = 2.000 m ± 0.003 m\nL_2 = 1.000 m +/- 0.004 m\nL_t = L_1 + L_2'));
    const u = statement(r, 'L_t').uncertainty!;
    expect(u.u).toBeCloseTo(0.005, 12);
    expect(u.budget.map((b) => b.name)).toEqual(['L_1', 'L_2']);
    expect(u.budget[0].share).toBeCloseTo(0.36, 9);
    expect(u.budget[1].share).toBeCloseTo(0.64, 9);
    expect(u.nonLinear).toBe(false);
    expect(u.monteCarlo).toBeNull();
  });

  it('gives the same result by Monte Carlo for a linear model, within the Monte Carlo’s own uncertainty', () => {
    const r = run(calc('L_1 = 2.000 m ± 0.003 m\nL_2 = 1.000 m ± 0.004 m\nL_t = 2 * L_1 - L_2'), {
      monteCarlo: 'always',
    });
    const u = statement(r, 'L_t').uncertainty!;
    const mc = u.monteCarlo!;
    expect(mc.trials).toBe(10_000);
    // u(L_t)² = 4·0.003² + 0.004² → u = 0.007 211 m; the Monte Carlo u within 3 of its standard errors (≈ u/√(2M)).
    expect(u.u).toBeCloseTo(Math.sqrt(4 * 0.003 ** 2 + 0.004 ** 2), 9);
    expect(Math.abs(mc.u - u.u)).toBeLessThan((3 * u.u) / Math.sqrt(2 * mc.trials));
    expect(Math.abs(mc.mean - 3)).toBeLessThan((4 * u.u) / Math.sqrt(mc.trials));
    expect(mc.agrees).toBe(true);
    expect(u.warning).toBeNull();
  });

  it('runs a Monte Carlo where the model is strongly non-linear, and warns when draws leave the domain', () => {
    const r = run(calc('b_1 = 0.9999 ± 0.00005\ng_1 = lorentzFactor(b_1)'));
    const u = statement(r, 'g_1').uncertainty!;
    expect(u.nonLinear).toBe(true);
    expect(u.monteCarlo).not.toBeNull();
    expect(u.monteCarlo!.outOfDomain).toBeGreaterThan(0);
    expect(u.monteCarlo!.agrees).toBe(false);
    expect(u.warning).toMatch(/outside the model's domain/);
  });

  it('runs at most eight Monte Carlo propagations per sheet, the same ones whatever the cache holds', () => {
    const lines = [
      'b_m = 0.9999 ± 0.00005',
      ...Array.from({ length: 10 }, (_, k) => `g_${k} = lorentzFactor(b_m) * ${k + 1}`),
    ];
    const cells = lines.map((source, i) => ({ id: `m${i}`, kind: 'calc' as const, source }));
    const fresh = createSheetEngine();
    const first = fresh.evaluate(cells, { significantFigures: 6 });
    const ran = (r: SheetResult) =>
      Array.from({ length: 10 }, (_, k) => (statement(r, `g_${k}`).uncertainty?.monteCarlo ?? null) !== null);
    expect(ran(first)).toEqual([true, true, true, true, true, true, true, true, false, false]);
    expect(statement(first, 'g_9').uncertainty!.warning).toMatch(/not run \(at most 8 per sheet/);
    // Editing the last cell re-evaluates it alone: the cached cells still count.
    const edited = cells.map((c, i) => (i === 10 ? { ...c, source: 'g_9 = lorentzFactor(b_m) * 11' } : c));
    const again = fresh.evaluate(edited, { significantFigures: 6 });
    expect(again.evaluatedCells).toBe(1);
    expect(ran(again)).toEqual(ran(first));
    // Taking the uncertainty off one early result frees a slot: the later cells see it, cached or not.
    const freed = edited.map((c, i) => (i === 1 ? { ...c, source: 'g_0 = lorentzFactor(0.9999) * 1' } : c));
    expect(ran(fresh.evaluate(freed, { significantFigures: 6 }))).toEqual(
      ran(createSheetEngine().evaluate(freed, { significantFigures: 6 })),
    );
    expect(ran(fresh.evaluate(freed, { significantFigures: 6 }))[8]).toBe(true);
  });

  it('reproduces the GUM resistance and reactance example with correlated inputs (JCGM 100:2008, H.2)', () => {
    // JCGM 100:2008 H.2 (from memory): V = 4.9990 V, u 0.0032 V; I = 19.6610 mA, u 0.0095 mA; φ = 1.04446 rad,
    // u 0.00075 rad; r(V,I) = −0.36, r(V,φ) = 0.86, r(I,φ) = −0.65. Published: R = 127.732 Ω, u 0.071 Ω;
    // X = 219.847 Ω, u 0.296 Ω; Z = 254.260 Ω, u 0.236 Ω. With these rounded inputs the law of propagation
    // gives u(R) = 0.0700 Ω (the published 0.071 comes from the unrounded observations; see uncertainty.test.ts).
    const r = run(
      calc(
        'V_m = 4.9990 V ± 0.0032 V\nI_m = 19.6610 mA ± 0.0095 mA\nphi_m = 1.04446 rad ± 0.00075 rad',
        'correlation(V_m, I_m, -0.36)\ncorrelation(V_m, phi_m, 0.86)\ncorrelation(I_m, phi_m, -0.65)',
        'R_m = V_m / I_m * cos(phi_m) to ohm\nX_m = V_m / I_m * sin(phi_m) to ohm\nZ_m = V_m / I_m to ohm',
      ),
    );
    expect(r.cells[1].ok).toBe(true);
    expect(statement(r, 'R_m').value!.number).toBeCloseTo(127.732, 3);
    expect(statement(r, 'X_m').value!.number).toBeCloseTo(219.847, 3);
    expect(statement(r, 'Z_m').value!.number).toBeCloseTo(254.26, 3);
    expect(statement(r, 'R_m').uncertainty!.u).toBeCloseTo(0.07, 3);
    expect(statement(r, 'X_m').uncertainty!.u).toBeCloseTo(0.296, 3);
    // 0.2366 from the rounded inputs against the published 0.236 (the same as uncertainty.test.ts finds).
    expect(Math.abs(statement(r, 'Z_m').uncertainty!.u - 0.236)).toBeLessThan(0.001);
    expect(statement(r, 'R_m').uncertainty!.correlations).toEqual([
      { a: 'V_m', b: 'I_m', r: -0.36 },
      { a: 'V_m', b: 'phi_m', r: 0.86 },
      { a: 'I_m', b: 'phi_m', r: -0.65 },
    ]);
    expect(combinedText(statement(r, 'R_m').uncertainty!)).toMatch(
      /with the correlations r\(V_m, I_m\) = −0\.36, r\(V_m, phi_m\) = 0\.86, r\(I_m, phi_m\) = −0\.65/,
    );
    // Without the correlations the same inputs give a different u(R): the statements are what changes it.
    const uncorrelated = run(
      calc(
        'V_m = 4.9990 V ± 0.0032 V\nI_m = 19.6610 mA ± 0.0095 mA\nphi_m = 1.04446 rad ± 0.00075 rad',
        'R_m = V_m / I_m * cos(phi_m) to ohm',
      ),
    );
    expect(Math.abs(statement(uncorrelated, 'R_m').uncertainty!.u - 0.07)).toBeGreaterThan(0.01);
  });

  it('refuses a correlation of a value without uncertainty, out of range, or given twice', () => {
    const r = run(
      calc(
        'a_c = 1 m ± 0.1 m\nb_c = 2 m ± 0.1 m\nk_c = 3 m',
        'correlation(a_c, k_c, 0.5)\ncorrelation(a_c, b_c, 1.5)\ncorrelation(a_c, b_c, 0.5)\ncorrelation(b_c, a_c, 0.2)',
      ),
    );
    const [noU, range, ok, twice] = r.cells[1].statements;
    expect(noU.error).toMatch(/`k_c` carries no standard uncertainty/);
    expect(range.error).toMatch(/between −1 and 1/);
    expect(ok.error).toBeNull();
    expect(twice.error).toMatch(/already given in cell 2, line 3/);
  });

  it('leaves an input with zero uncertainty out of the budget without breaking it', () => {
    const r = run(calc('L_1 = 2 m ± 0.003 m\nL_2 = 1 m ± 0 m\nL_t = L_1 * L_2'));
    const u = statement(r, 'L_t').uncertainty!;
    expect(u.u).toBeCloseTo(0.003, 12);
    expect(u.budget[1]).toMatchObject({
      name: 'L_2',
      sensitivity: 0,
      contribution: 0,
      sensitivityText: 'not evaluated (u = 0)',
    });
    expect(JSON.parse(JSON.stringify(u))).toEqual(u);
  });

  it('refuses an uncertainty of another dimension, a negative one, and ± outside a definition', () => {
    const r = run(calc('x_1 = 2 m ± 1 s', 'x_2 = 2 m ± -1 m', 'x_3 = 2 m\nx_3 + 1 m ± 1 m'));
    expect(statement(r, 'x_1').error).toMatch(/dimension of the value/);
    expect(statement(r, 'x_2').error).toMatch(/≥ 0/);
    expect(r.cells[2].statements[1].error).toMatch(/± gives an input its standard uncertainty/);
  });

  it('gives the same uncertainty figures and words whether a cell is presented as it is evaluated or when it is read', () => {
    // The figures in the display unit (u, U, unit), the budget, the Monte Carlo summary and the words
    // are made when a statement is presented (studies.ts, presentLater): the sandbox presents each cell
    // at once, the editor's evaluation when it is read; both must give the same JSON.
    const cells = calc(
      'T_w = 250 MeV ± 0.4 MeV\nm_w = 938.272 MeV ± 0.5 MeV',
      'p_w = momentumFromKinetic(T_w, m_w) to MeV/c',
    );
    for (const displayUnits of ['si', 'trade'] as const) {
      const options = { significantFigures: 6, displayUnits, monteCarlo: 'always' as const };
      const atOnce = JSON.stringify(createSheetEngine().evaluate(cells, options, { presentEachCell: true }));
      const onRead = JSON.stringify(createSheetEngine().evaluate(cells, options));
      expect(onRead).toBe(atOnce);
      const r = JSON.parse(onRead) as SheetResult;
      const u = statement(r, 'p_w').uncertainty!;
      expect(u.unit).toBe('MeV / c');
      expect(u.U).toBe(Number((2 * u.u).toExponential(1)));
      expect(u.text).toMatch(/^\(\d+\.\d+ ± \d+\.\d+\) MeV\/c \(k = 2\)$/);
      expect(u.budget.map((b) => b.name)).toEqual(['T_w', 'm_w']);
      expect(u.monteCarlo!.text).toMatch(/^Monte Carlo \(JCGM 101, 10\u202f000 draws\): mean /);
      expect(statement(r, 'T_w').uncertainty).toMatchObject({ kind: 'input', u: 0.4, U: 0.8, unit: 'MeV' });
    }
  });

  it('refuses, as it is evaluated, an uncertainty whose expanded figure is not finite in its display unit', () => {
    // u = 1e290 m in qm is 1e320: not a number. Above 1e100 (SI) the figures are worked out as the
    // statement is evaluated, so the statement fails and its dependents say so. Below, in a display
    // unit under 1e-208 of the SI unit, they are worked out when presented: the statement keeps its
    // value and says its uncertainty cannot be shown.
    const r = run(
      calc('L_o = 1 m ± 1e290 m\nV_o = L_o to qm\nW_o = V_o * 2', 'A_o = 1 m^7 ± 1e99 m^7\nB_o = A_o to qm^7'),
    );
    expect(statement(r, 'V_o').error).toMatch(
      /^the uncertainty cannot be propagated: an expanded uncertainty must be a finite number/,
    );
    expect(statement(r, 'W_o').error).toMatch(/depends on `V_o`/);
    const b = statement(r, 'B_o');
    expect(b.error).toMatch(/^the uncertainty cannot be shown: an expanded uncertainty must be a finite number/);
    expect(b.uncertainty).toBeNull();
    expect(b.value?.unit).toBe('qm^7');
  });

  it('keeps uncertainties through the cache when only a dependent cell changes', () => {
    const cells = calc('T_u = 100 MeV ± 1 MeV', 'p_u = momentumFromKinetic(T_u, m_p)');
    const first = statement(run(cells), 'p_u').uncertainty!.u;
    const edited = [cells[0], { ...cells[1], source: 'p_u = momentumFromKinetic(T_u, m_p)\nq_u = 2 * p_u' }];
    const r = run(edited);
    expect(statement(r, 'p_u').uncertainty!.u).toBe(first);
    expect(statement(r, 'q_u').uncertainty!.u).toBeCloseTo(2 * first, 30);
  });
});

describe('citations of issued revisions', () => {
  const ref = (over: Partial<ResolvedReference> = {}): ResolvedReference => ({
    sheet: 'TPT2-CALC-0003',
    revision: 'B',
    name: 'Brho',
    value: { number: 2.432_13, unit: 'T m', uncertainty: null },
    error: null,
    status: 'current',
    supersededBy: null,
    title: 'Gantry rigidity',
    versionSha256: 'a'.repeat(64),
    ...over,
  });
  const CITING = 'B_max = fromRevision("TPT2-CALC-0003", "B", "Brho")\nI_coil = B_max / (2 m) * 1000 A/T to A';

  it('uses the issued value, pinned, with its source', () => {
    const r = run(calc(CITING), { references: [ref()] });
    const st = statement(r, 'B_max');
    expect(st.error).toBeNull();
    expect(st.value!.number).toBe(2.432_13);
    expect(st.value!.unit).toBe('T m');
    expect(st.references).toEqual([ref()]);
    expect(st.tex).toContain('TPT2-CALC-0003 rev. B');
    expect(statement(r, 'I_coil').value!.number).toBeCloseTo(1216.065, 9);
  });

  it('carries the cited standard uncertainty into results', () => {
    const r = run(calc(CITING), {
      references: [ref({ value: { number: 2.432_13, unit: 'T m', uncertainty: 0.002 } })],
    });
    expect(statement(r, 'B_max').uncertainty!.u).toBeCloseTo(0.002, 15);
    expect(statement(r, 'I_coil').uncertainty!.u).toBeCloseTo(1, 9);
  });

  it('shows why a citation cannot be used, and re-evaluates when its resolution changes', () => {
    const withdrawn = run(calc(CITING), {
      references: [
        ref({ value: null, status: 'withdrawn', error: 'TPT2-CALC-0003 rev. B was withdrawn: wrong field map' }),
      ],
    });
    expect(statement(withdrawn, 'B_max').error).toBe('TPT2-CALC-0003 rev. B was withdrawn: wrong field map');
    expect(statement(withdrawn, 'I_coil').error).toMatch(/depends on `B_max`/);
    const unresolved = run(calc(CITING));
    expect(statement(unresolved, 'B_max').error).toMatch(/resolved within the sheet's project/);
    const malformed = run(
      calc('B_y = fromRevision("TPT2-CALC-0003", "B")', 'B_z = 2 * fromRevision("TPT2-CALC-0003", "B", "Brho")'),
    );
    expect(statement(malformed, 'B_y').error).toMatch(/three quoted texts/);
    expect(statement(malformed, 'B_z').error).toMatch(/whole definition/);
  });
});
