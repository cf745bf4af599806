// The trade's units: MeV/c and MeV/c² (PDG RPP conventions: momentum in eV/c, mass in eV/c²), the
// unified atomic mass unit u (SI Brochure 9th ed., table 8: u = Da = m_u), ppm and ppb, rate units
// that keep their name, the radian as a ratio where it multiplies a length (SI Brochure 9th ed.,
// §2.3.3 and table 4: rad = m/m), and the Julian year yr / a (IAU: 365.25 d).
import { describe, expect, it } from 'vitest';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import { extractUnitLiterals, unitOfPlaceholder } from '../../lib/calc/unit-literals';
import type { StatementResult } from '../../lib/calc/types';

const engine = createSheetEngine();
const C = 299_792_458; // SI 2019, exact
const EV = 1.602176634e-19; // SI Brochure 9th ed., table 8, exact
const M_U = 1.66053906892e-27; // CODATA 2022, kg

function run(source: string): Map<string, StatementResult> {
  const r = engine.evaluate([{ id: 'c1', kind: 'calc', source }], { significantFigures: 6 });
  return new Map(r.cells[0].statements.map((s) => [s.name ?? s.source, s]));
}
const ok = (s: StatementResult | undefined) => {
  expect(s?.error ?? null, s?.source).toBeNull();
  return s!.value!;
};
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('momentum in eV/c and mass in eV/c² (PDG RPP conventions)', () => {
  it('reads 1.2 GeV/c after a number as a momentum, and converts it with to and number()', () => {
    const r = run(
      'p_1 = 1.2 GeV/c\np_2 = p_1 to MeV/c\np_3 = number(p_1, "MeV/c")\np_4 = p_1 to kg*m/s\np_5 = 250 keV/c + 1 eV/c\np_6 = 2 TeV/c',
    );
    expect(ok(r.get('p_1'))).toMatchObject({ unit: 'GeV / c', text: `1.200\u202f00 GeV/c` });
    expect(ok(r.get('p_2'))).toMatchObject({ unit: 'MeV / c', text: '1200 MeV/c' });
    expect(ok(r.get('p_2')).number).toBeCloseTo(1200, 9);
    expect(ok(r.get('p_3')).number).toBeCloseTo(1200, 9);
    // p = 1.2e9 eV × e / c in kg·m/s (definition of the eV/c; SI 2019 exact e and c).
    expect(rel(ok(r.get('p_4')).number!, (1.2e9 * EV) / C)).toBeLessThan(4e-16);
    expect(ok(r.get('p_5')).unit).toBe('keV / c');
    expect(ok(r.get('p_5')).number).toBeCloseTo(250.001, 9);
    expect(ok(r.get('p_6')).unit).toBe('TeV / c');
    // The TeX of a unit written in the sheet writes c as the quantity symbol: GeV/c (PDG RPP).
    expect(r.get('p_1')!.tex).toContain('\\mathrm{GeV}/c');
  });

  it('reads 938.272 MeV/c^2 as a mass and converts masses to MeV/c^2', () => {
    const r = run(
      'm_1 = 938.272 MeV/c^2\nm_2 = m_1 to kg\nm_3 = m_p to MeV/c^2\nm_4 = 0.511 MeV/c^2 + 1 keV/c^2\nm_5 = 1 GeV/c^2 to eV/c^2',
    );
    expect(ok(r.get('m_1'))).toMatchObject({ unit: 'MeV / c^2', text: '938.272 MeV/c²' });
    expect(rel(ok(r.get('m_2')).number!, (938.272e6 * EV) / (C * C))).toBeLessThan(4e-16);
    // CODATA 2022: m_p c² = 938.272 089 43(29) MeV.
    expect(ok(r.get('m_3')).number).toBeCloseTo(938.27208943, 6);
    expect(ok(r.get('m_4')).number).toBeCloseTo(0.512, 12);
    expect(ok(r.get('m_5')).number).toBeCloseTo(1e9, 3);
  });

  it('keeps c the speed-of-light constant everywhere but right after an electronvolt unit and a solidus', () => {
    const r = run('v_0 = 0.6 c\nx_c = 2 c\nE_0 = m_p * c^2\np_s = 5 MeV / c\np_u = 5 MeV/c\nq = p_s / p_u');
    expect(ok(r.get('v_0'))).toMatchObject({ unit: 'm / s' });
    expect(ok(r.get('v_0')).number).toBeCloseTo(0.6 * C, 6);
    expect(ok(r.get('x_c')).number).toBeCloseTo(2 * C, 6);
    // Written with spaces, 5 MeV / c is 5 MeV divided by the constant: the same momentum.
    expect(ok(r.get('q')).number).toBeCloseTo(1, 15);
    // `c` alone after a number or after `to` is not a unit.
    expect(extractUnitLiterals('v = 0.6 c', (n) => n === 'MeV').literals).toEqual([]);
  });

  it('reads MeV/c only in unit positions: after a number and after to, not after another name', () => {
    const UNITS = new Set(['MeV', 'GeV', 'keV', 'eV', 'm', 's', 'T']);
    const read = (line: string) =>
      extractUnitLiterals(line, (n) => UNITS.has(n)).text.replace(/__u_[0-9a-f]+/g, (p) => `[${unitOfPlaceholder(p)}]`);
    expect(read('p = 1.2 GeV/c')).toBe('p = 1.2 [GeV/c]');
    expect(read('m = 938.272 MeV/c^2')).toBe('m = 938.272 [MeV/c^2]');
    expect(read('x = p to MeV / c')).toBe('x = p to [MeV/c]');
    expect(read('x = p to GeV/c^2')).toBe('x = p to [GeV/c^2]');
    // After a unit that is not an electronvolt unit, c stays the constant.
    expect(read('y = 3 m/c')).toBe('y = 3 [m]/c');
    expect(read('y = E_1/c')).toBe('y = E_1/c');
  });
});

describe('the unified atomic mass unit u (SI Brochure 9th ed., table 8: 1 u = 1 Da = m_u)', () => {
  it('makes 430 MeV/u × 12 u equal 5160 MeV (energy per nucleon times mass in u)', () => {
    const r = run(
      'E_n = 430 MeV/u\nE_t = E_n * 12 u\nE_m = number(E_t, "MeV")\nm_c = 12 u to kg\nm_uc = 1 u to MeV/c^2',
    );
    expect(ok(r.get('E_n'))).toMatchObject({ unit: 'MeV / u', text: '430 MeV/u' });
    expect(ok(r.get('E_m')).number).toBeCloseTo(5160, 9);
    // CODATA 2022: m_u = 1.660 539 068 92(52) × 10⁻²⁷ kg.
    expect(rel(ok(r.get('m_c')).number!, 12 * M_U)).toBeLessThan(4e-16);
    // CODATA 2022: m_u c² = 931.494 103 72(29) MeV.
    expect(ok(r.get('m_uc')).number).toBeCloseTo(931.49410372, 7);
  });

  it('leaves a sheet its own u and a, after a number too', () => {
    const r = run('u = 3 m/s\nx_u = 2 u\na = 2 m/s^2\ns_a = 0.5 a * (2 s)^2');
    expect(ok(r.get('x_u'))).toMatchObject({ unit: 'm / s', number: 6 });
    expect(ok(r.get('s_a'))).toMatchObject({ unit: 'm', number: 4 });
  });
});

describe('the Julian year (IAU: 365.25 d of 86 400 s)', () => {
  it('defines yr and a as 31 557 600 s', () => {
    const r = run('y_1 = 1 yr to s\ny_2 = 2 to a\ny_3 = 1 yr to day\nt_a = 3.5 yr');
    expect(ok(r.get('y_1')).number).toBe(31_557_600);
    expect(ok(r.get('y_3')).number).toBe(365.25);
    expect(ok(r.get('t_a'))).toMatchObject({ unit: 'yr', number: 3.5 });
    // The light-year is c × 1 Julian year (IAU).
    expect(ok(run('d = 1 ly / (c * 1 yr)').get('d')).number).toBeCloseTo(1, 15);
  });
});

describe('ppm, ppb and rate units keep their names', () => {
  it('keeps ppm and ppb as dimensionless units (10⁻⁶, 10⁻⁹; common practice)', () => {
    const r = run('w = 5 ppm\nd = 2 m * w\nf = 250 ppb * 4\nq = number(w, "ppb")');
    expect(ok(r.get('w'))).toMatchObject({ unit: 'ppm', text: '5 ppm' });
    expect(ok(r.get('d')).number).toBeCloseTo(10, 12); // 1e-5 m shown as 10 µm
    expect(ok(r.get('d')).unit).toBe('um');
    expect(ok(r.get('f')).unit).toBe('ppb');
    expect(ok(r.get('f')).number).toBeCloseTo(1000, 9);
    expect(ok(r.get('q')).number).toBeCloseTo(5000, 9);
  });

  it('shows a result written in µs/day in µs/day, not as a bare 4.5 × 10⁻¹⁰', () => {
    // 4.5e-10 × 86 400 s/day = 38.88 µs/day (arithmetic).
    const r = run('r_0 = 4.5e-10 to us/day\nr_1 = 38 us/day\nr_2 = r_1 * 2\nr_3 = r_1 + 7 ns/day\nr_4 = r_1 / 2');
    expect(ok(r.get('r_0'))).toMatchObject({ unit: 'us / day', text: '38.8800 µs/day' });
    expect(ok(r.get('r_0')).number).toBeCloseTo(38.88, 10);
    expect(ok(r.get('r_2'))).toMatchObject({ unit: 'us / day', text: '76 µs/day' });
    expect(ok(r.get('r_3')).number).toBeCloseTo(38.007, 10);
    expect(ok(r.get('r_4')).number).toBeCloseTo(19, 12);
  });
});

describe('the radian where it multiplies a length (SI Brochure 9th ed., §2.3.3: rad = m/m)', () => {
  it('makes ω·r a speed in m/s and θ·r a length, and passes ω·r to library speed parameters', () => {
    const r = run(
      'omega = 2 rad/s\nr_w = 3 m\nv_w = omega * r_w\nv_s = v_w to m/s\ns_a = 30 deg * 2 m\na_c = omega^2 * r_w\ng_w = lorentzFactor(omega * 3e7 m)\nphi_t = omega * 2 s\ns_30 = sin(30 deg)',
    );
    expect(ok(r.get('v_w'))).toMatchObject({ unit: 'm / s', number: 6 });
    expect(ok(r.get('v_s')).number).toBe(6);
    expect(ok(r.get('s_a')).number).toBeCloseTo(Math.PI / 3, 15);
    expect(ok(r.get('a_c'))).toMatchObject({ unit: 'm / s^2', number: 12 });
    // γ = 1/√(1 − β²) with β = 6e7/c (textbook definition).
    const beta = 6e7 / C;
    expect(rel(ok(r.get('g_w')).number!, 1 / Math.sqrt(1 - beta * beta))).toBeLessThan(1e-15);
    // Without a length the angle stays an angle: ω·t is 4 rad, and sin takes angles as before.
    expect(ok(r.get('phi_t'))).toMatchObject({ unit: 'rad', number: 4 });
    expect(ok(r.get('s_30')).number).toBeCloseTo(0.5, 15);
  });
});

describe('the examples of the function reference (lib/calc/display-units.ts, UNIT_EXAMPLES)', () => {
  it('each evaluates to the result the reference shows', async () => {
    const { UNIT_EXAMPLES } = await import('../../lib/calc/display-units');
    expect(UNIT_EXAMPLES.length).toBeGreaterThan(8);
    for (const x of UNIT_EXAMPLES) {
      const r = engine.evaluate([{ id: 'c1', kind: 'calc', source: x.source }], {
        significantFigures: 6,
        displayUnits: x.displayUnits,
      });
      const st = r.cells[0].statements[0];
      expect(st.error, x.source).toBeNull();
      expect(st.value!.text.replace(/\u202f/g, ' '), `${x.source} (${x.displayUnits})`).toBe(x.result);
    }
  });
});
