// Units and constants of the engine's mathjs instance, against the SI Brochure (9th edition, 2019)
// and CODATA 2022.
import { describe, expect, it } from 'vitest';
import katex from 'katex';
import { CONSTANTS } from '../../lib/calc/constants';
import { createEngineMath } from '../../lib/calc/math-instance';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import { D, ulpError } from './reference-math';

const { parse } = createSheetEngine().em;
const si = (expr: string, unit: string) =>
  (parse(expr).compile().evaluate() as { toNumber(u: string): number }).toNumber(unit);

describe('exact units (SI Brochure, 9th edition, 2019)', () => {
  it('1 eV = 1.602 176 634e-19 J exactly (table 8), not the CODATA 2010 value mathjs ships', () => {
    expect(si('1 eV', 'J')).toBe(1.602176634e-19);
    expect(si('1 electronvolt', 'J')).toBe(1.602176634e-19);
    // SI Brochure table 8 with SI prefixes (§3): 1 MeV = 1.602 176 634e-13 J
    expect(si('1 MeV', 'J')).toBeCloseTo(1.602176634e-13, 25);
    expect(si('250 MeV', 'J') / 1.602176634e-19).toBeCloseTo(250e6, 6);
  });
  it('keeps the base and derived units at their definitions', () => {
    expect(si('1 km', 'm')).toBe(1000); // SI Brochure §3, prefix kilo = 1e3
    expect(si('1 h', 's')).toBe(3600); // SI Brochure table 8: 1 h = 3600 s
    expect(si('1 day', 's')).toBe(86400); // SI Brochure table 8: 1 d = 86 400 s
    expect(si('1 minute', 's')).toBe(60); // SI Brochure table 8
    expect(si('1 T', 'kg / (A s^2)')).toBeCloseTo(1, 15); // SI Brochure table 4: T = kg s^-2 A^-1
    expect(si('1 V', 'kg m^2 / (A s^3)')).toBeCloseTo(1, 15); // SI Brochure table 4
    expect(si('1 deg', 'rad')).toBe(Math.PI / 180); // SI Brochure table 8: 1° = (π/180) rad
    expect(si('1 L', 'm^3')).toBeCloseTo(1e-3, 18); // SI Brochure table 8: 1 L = 1e-3 m^3
    expect(si('1 t', 'kg')).toBe(1000); // SI Brochure table 8: 1 t = 1000 kg
  });
  it('adds the dalton, the astronomical unit, the light-year and the parsec', () => {
    // SI Brochure table 8: 1 Da = m_u; CODATA 2022: m_u = 1.660 539 068 92e-27 kg
    expect(si('1 Da', 'kg')).toBe(1.66053906892e-27);
    // IAU 2012 Resolution B2: 1 au = 149 597 870 700 m exactly
    expect(si('1 au', 'm')).toBe(149597870700);
    // IAU: 1 ly = c × 365.25 d = 9 460 730 472 580 800 m
    expect(si('1 ly', 'm')).toBe(9460730472580800);
    // IAU 2015 Resolution B2: 1 pc = 648 000/π au = 3.085 677 581 491 367e16 m
    expect(si('1 pc', 'm')).toBeCloseTo(3.085677581491367e16, 0);
  });
  it('defines the torr as 101 325/760 Pa (definition of the torr)', () => {
    expect(si('760 torr', 'Pa')).toBeCloseTo(101325, 8);
  });
});

describe('constants (SI 2019 exact, CODATA 2022)', () => {
  const value = (name: string) => CONSTANTS.find((c) => c.name === name)!;
  it('carries the exact defining constants', () => {
    expect(value('c')).toMatchObject({ value: 299792458, uncertainty: 0 }); // SI Brochure table 1
    expect(value('q_e')).toMatchObject({ value: 1.602176634e-19, uncertainty: 0 }); // SI Brochure table 1
    expect(value('h_P')).toMatchObject({ value: 6.62607015e-34, uncertainty: 0 }); // SI Brochure table 1
    expect(value('g_n')).toMatchObject({ value: 9.80665, uncertainty: 0 }); // 3rd CGPM (1901), SI Brochure
  });
  it('carries the CODATA 2022 particle masses with their standard uncertainties', () => {
    expect(value('m_e')).toMatchObject({ value: 9.1093837139e-31, uncertainty: 2.8e-40 }); // CODATA 2022
    expect(value('m_p')).toMatchObject({ value: 1.67262192595e-27, uncertainty: 5.2e-37 }); // CODATA 2022
    expect(value('m_n')).toMatchObject({ value: 1.67492750056e-27, uncertainty: 8.5e-37 }); // CODATA 2022
    expect(value('m_u')).toMatchObject({ value: 1.66053906892e-27, uncertainty: 5.2e-37 }); // CODATA 2022
    expect(value('m_mu')).toMatchObject({ value: 1.883531627e-28, uncertainty: 4.2e-36 }); // CODATA 2022
  });
  it('agrees with the CODATA 2022 energy equivalents through the exact e and c', () => {
    const mev = (name: string) => (value(name).value * 299792458 ** 2) / 1.602176634e-19 / 1e6;
    expect(mev('m_p')).toBeCloseTo(938.27208943, 7); // CODATA 2022: m_p c^2 = 938.272 089 43(29) MeV
    expect(mev('m_e')).toBeCloseTo(0.51099895069, 10); // CODATA 2022: m_e c^2 = 0.510 998 950 69(16) MeV
    expect(mev('m_n')).toBeCloseTo(939.56542194, 7); // CODATA 2022: m_n c^2 = 939.565 421 94(48) MeV
    expect(mev('m_mu')).toBeCloseTo(105.6583755, 6); // CODATA 2022: m_mu c^2 = 105.658 3755(23) MeV
    expect(mev('m_u')).toBeCloseTo(931.49410372, 7); // CODATA 2022: m_u c^2 = 931.494 103 72(29) MeV
  });
  it('is consistent with the CODATA 2022 ratios', () => {
    // CODATA 2022: m_p/m_e = 1836.152 673 426(32)
    expect(value('m_p').value / value('m_e').value).toBeCloseTo(1836.152673426, 7);
    // CODATA 2022: proton relative atomic mass A_r(p) = 1.007 276 466 5789(83)
    expect(value('m_p').value / value('m_u').value).toBeCloseTo(1.0072764665789, 11);
  });
  it('corrects the mathjs physical constants it carries at CODATA 2018 values', () => {
    expect(si('electronMass', 'kg')).toBe(9.1093837139e-31); // CODATA 2022
    expect(si('protonMass', 'kg')).toBe(1.67262192595e-27); // CODATA 2022
    expect(si('neutronMass', 'kg')).toBe(1.67492750056e-27); // CODATA 2022
    expect(si('electricConstant', 'F/m')).toBe(8.8541878188e-12); // CODATA 2022, from memory
    expect(si('elementaryCharge', 'C')).toBe(1.602176634e-19); // SI Brochure table 1
    expect(si('speedOfLight', 'm/s')).toBe(299792458); // SI Brochure table 1
  });
});

describe('the particle and ion table (CODATA 2022, PDG 2024, AME 2020)', () => {
  const value = (name: string) => CONSTANTS.find((c) => c.name === name)!;
  const M_U = 1.66053906892e-27; // CODATA 2022: atomic mass constant, kg
  const MEV = 1.602176634e-13; // SI Brochure table 8: 1 MeV = 1.602 176 634e-13 J exactly
  const mev = (name: string) => (value(name).value * 299792458 ** 2) / MEV;
  const inU = (name: string) => value(name).value / M_U;
  const eVinU = 1.07354410083e-9; // CODATA 2022: 1 eV/c² = 1.073 544 100 83(33)e-9 u

  it('carries the CODATA 2022 light nuclei and τ with their uncertainties', () => {
    // CODATA 2022, recalled from memory; every value agrees with the CODATA 2022 table of scipy.constants 1.17.
    expect(value('m_d')).toMatchObject({ value: 3.3435837768e-27, uncertainty: 1.0e-36, unit: 'kg' });
    expect(value('m_triton')).toMatchObject({ value: 5.0073567512e-27, uncertainty: 1.6e-36 });
    expect(value('m_helion')).toMatchObject({ value: 5.0064127862e-27, uncertainty: 1.6e-36 });
    expect(value('m_alpha')).toMatchObject({ value: 6.644657345e-27, uncertainty: 2.1e-36 });
    expect(value('m_tau')).toMatchObject({ value: 3.16754e-27, uncertainty: 2.1e-31 });
    // CODATA 2022 relative atomic masses A_r = m/m_u (the kg values are A_r·m_u rounded to 11 digits).
    expect(inU('m_d')).toBeCloseTo(2.013553212544, 9); // CODATA 2022: 2.013 553 212 544(15)
    expect(inU('m_triton')).toBeCloseTo(3.01550071597, 9); // CODATA 2022: 3.015 500 715 97(10)
    expect(inU('m_helion')).toBeCloseTo(3.014932246932, 9); // CODATA 2022: 3.014 932 246 932(74)
    expect(inU('m_alpha')).toBeCloseTo(4.001506179129, 9); // CODATA 2022: 4.001 506 179 129(62)
    // CODATA 2022 energy equivalents (from memory, as in scipy.constants 1.17).
    expect(mev('m_d')).toBeCloseTo(1875.612945, 5); // CODATA 2022: m_d c² = 1875.612 945 00(58) MeV
    expect(mev('m_triton')).toBeCloseTo(2808.92113668, 5); // CODATA 2022: 2808.921 136 68(88) MeV
    expect(mev('m_helion')).toBeCloseTo(2808.39161112, 5); // CODATA 2022: 2808.391 611 12(88) MeV
    expect(mev('m_alpha')).toBeCloseTo(3727.3794118, 5); // CODATA 2022: 3727.379 4118(12) MeV
    // τ: CODATA 2022 3.167 54(21)e-27 kg is 1776.86 MeV/c²; PDG 2024 gives 1776.93(9) MeV (from memory): within both uncertainties.
    expect(Math.abs(mev('m_tau') - 1776.93)).toBeLessThan(Math.hypot(0.12, 0.09));
  });

  it('converts the PDG 2024 masses from MeV/c² to kg exactly (the double nearest 10⁶ e/c² × the MeV value)', () => {
    // PDG 2024 (from memory): π± 139.570 39(18), π⁰ 134.9768(5), K± 493.677(15), K⁰ 497.611(13), Λ 1115.683(6) MeV.
    const pdg: Array<[string, string, number]> = [
      ['m_pi', '139.57039', 0.00018],
      ['m_pi0', '134.9768', 0.0005],
      ['m_K', '493.677', 0.015],
      ['m_K0', '497.611', 0.013],
      ['m_Lambda', '1115.683', 0.006],
    ];
    const perMeV = new D('1e6').mul('1.602176634e-19').div(new D(299792458).pow(2)); // SI 2019: exact e and c
    for (const [name, mevValue, u] of pdg) {
      const k = value(name);
      expect(ulpError(k.value, new D(mevValue).mul(perMeV)), name).toBeLessThanOrEqual(0.5);
      expect(k.uncertainty / (u * perMeV.toNumber()), name).toBeCloseTo(1, 1); // two significant digits
      expect(k.provenance).toContain('PDG');
      expect(k.provenance).toContain('converted to kg exactly');
    }
    // PDG 2024 mass differences (from memory): m(π±) − m(π⁰) = 4.5936(5) MeV; m(K⁰) − m(K±) = 3.934(20) MeV.
    expect(mev('m_pi') - mev('m_pi0')).toBeCloseTo(4.5936, 3);
    expect(mev('m_K0') - mev('m_K')).toBeCloseTo(3.934, 2);
  });

  it('carries the AME 2020 atomic masses of the therapy ions, converted with the CODATA 2022 m_u', () => {
    // AME 2020, from memory: ¹H 1.007 825 031 898(14) u, ⁴He 4.002 603 254 13(16) u, ¹²C 12 u exactly,
    // ¹⁶O 15.994 914 619 26(32) u, ²⁰Ne 19.992 440 1762(17) u.
    const ame: Array<[string, string]> = [
      ['M_H1', '1.007825031898'],
      ['M_He4', '4.00260325413'],
      ['M_C12', '12'],
      ['M_O16', '15.99491461926'],
      ['M_Ne20', '19.9924401762'],
    ];
    for (const [name, ar] of ame) {
      const k = value(name);
      expect(ulpError(k.value, new D(ar).mul('1.66053906892e-27')), name).toBeLessThanOrEqual(0.5);
      expect(k.description, name).toContain('neutral atom, electrons included');
      expect(k.provenance, name).toMatch(/AME 2020|exactly 12 u/);
    }
    expect(inU('M_C12')).toBe(12); // SI Brochure (2019), definition of the dalton: m(¹²C) = 12 u exactly
  });

  it('agrees across the tables: nuclei from atoms minus electrons plus their binding energy', () => {
    const me = 5.485799090441e-4; // CODATA 2022: A_r(e) = 5.485 799 090 441(97)e-4
    // α = M(⁴He) − 2m_e + 79.005 15 eV/c² (He ionization energies 24.587 387 + 54.417 765 eV, NIST ASD, from memory).
    expect(inU('M_He4') - 2 * me + 79.00515 * eVinU).toBeCloseTo(inU('m_alpha'), 10);
    // p = M(¹H) − m_e + 13.598 434 eV/c² (H ionization energy, NIST ASD, from memory); A_r(p) = 1.007 276 466 5789 (CODATA 2022).
    expect(inU('M_H1') - me + 13.598434 * eVinU).toBeCloseTo(1.0072764665789, 10);
    // d = M(²H) − m_e + 13.602 eV/c² with M(²H) = 2.014 101 777 844(15) u (AME 2020, from memory).
    expect(2.014101777844 - me + 13.602 * eVinU).toBeCloseTo(inU('m_d'), 10);
    // t = M(³H) − m_e + 13.603 eV/c² with M(³H) = 3.016 049 281 32(8) u (AME 2020, from memory).
    expect(3.01604928132 - me + 13.603 * eVinU).toBeCloseTo(inU('m_triton'), 9);
    // h = M(³He) − 2m_e + 78.98 eV/c² with M(³He) = 3.016 029 321 967(60) u (AME 2020, from memory).
    expect(3.016029321967 - 2 * me + 78.98 * eVinU).toBeCloseTo(inU('m_helion'), 10);
  });

  it('names nothing a sheet might mean otherwise, and no name can be redefined', () => {
    const engine = createSheetEngine();
    const names = [
      'm_d',
      'm_triton',
      'm_helion',
      'm_alpha',
      'm_tau',
      'm_pi',
      'm_pi0',
      'm_K',
      'm_K0',
      'm_Lambda',
      'M_H1',
      'M_He4',
      'M_C12',
      'M_O16',
      'M_Ne20',
    ];
    for (const name of names) {
      expect(engine.em.isUnitName(name), name).toBe(false);
      expect(engine.em.isFunctionName(name), name).toBe(false);
      expect(
        CONSTANTS.filter((k) => k.name === name),
        name,
      ).toHaveLength(1);
      const r = engine.evaluate([{ id: 'c1', kind: 'calc', source: `${name} = 2 kg` }], { significantFigures: 6 });
      expect(r.cells[0].statements[0].error, name).toContain('built-in constant');
    }
    // m_t is the top-quark mass and m_h the Higgs mass in PDG notation: the table uses m_triton and m_helion.
    expect(CONSTANTS.some((k) => k.name === 'm_t' || k.name === 'm_h')).toBe(false);
    const r = engine.evaluate([{ id: 'c1', kind: 'calc', source: 'x = m_pi to MeV/c^2\ny = M_C12 to u' }], {
      significantFigures: 8,
    });
    expect(r.cells[0].statements[0].value?.text).toBe('139.570\u202f39 MeV/c²'); // PDG 2024
    expect(r.cells[0].statements[1].value?.text).toBe('12 u'); // 12 u exactly (definition of u)
  });
});

describe('a dimensionless constant: L_G (IAU 2000 Resolution B1.9)', () => {
  const engine = createSheetEngine();
  const run = (source: string, displayUnits: 'si' | 'trade' = 'si') =>
    engine.evaluate([{ id: 'c1', kind: 'calc', source }], { significantFigures: 10, displayUnits }).cells[0].statements;
  it('is a plain number in sheets, 6.969 290 134e-10 exactly, and gives the geoid potential W₀ = L_G c²', () => {
    const [lg, w] = run('x_lg = L_G\nW_geoid = L_G * c^2 to m^2/s^2');
    // IAU 2000 Resolution B1.9: L_G = 6.969 290 134 × 10⁻¹⁰ (defining).
    expect(lg.value).toMatchObject({ kind: 'number', number: 6.969290134e-10, unit: null });
    // IERS Conventions (2010) §1.1: W₀ = 62 636 856.0 m²/s².
    expect(w.value?.number).toBeCloseTo(62636856.0, 0);
    expect(w.value?.number).toBe(CONSTANTS.find((k) => k.name === 'W_0')!.value);
    // Substituted into the formula as a bare number, in either display setting.
    for (const setting of ['si', 'trade'] as const) {
      const [st] = run('y_lg = 2 * L_G', setting);
      expect(st.substitutedTex, setting).toBe(
        'y_{\\mathrm{lg}} = 2\\cdot\\left(6.969\\,290\\,134 \\times 10^{-10}\\right)',
      );
    }
  });

  it('typesets every constant, and a formula using the new ones with their values substituted, in KaTeX', () => {
    // common practice: a formula the checker cannot see is a formula the checker cannot check.
    for (const k of CONSTANTS) expect(() => katex.renderToString(k.tex, { throwOnError: true }), k.name).not.toThrow();
    const engine = createSheetEngine();
    const source =
      'x = (m_pi + m_pi0 + m_K + m_K0 + m_Lambda + m_tau + m_d + m_triton + m_helion + m_alpha) / (M_H1 + M_He4 + M_C12 + M_O16 + M_Ne20)';
    const [st] = engine.evaluate([{ id: 'c1', kind: 'calc', source }], { significantFigures: 6 }).cells[0].statements;
    expect(st.error).toBeNull();
    for (const tex of [st.tex, st.substitutedTex ?? ''])
      expect(() => katex.renderToString(tex, { throwOnError: true }), tex).not.toThrow();
    expect(st.tex).toContain('M(^{12}\\mathrm{C})');
  });
});

describe("the engine's remembered answers of Unit.isValuelessUnit (math-instance.ts)", () => {
  // The engine keeps mathjs's answers per name; they must stay right for units, prefixed
  // units, the units the engine adds, and names that are no unit (more than mathjs's memo of 100).
  const names = ['m', 'cm', 'MeV', 'kMeV', 'GeV', 'u', 'Da', 'yr', 'ppm', 'c', 'T', 'foo', 'T_kin', 'x', 'in', 'mm'];
  for (let i = 1; i <= 300; i++) names.push(`T_${i}`, `v${i}`, `L_${i}`, `μs${i}`);
  names.push('μs', 'ms', 'Å', 'angstrom', 'γ', 'Δp', 'θ_1', 'km2');

  it('answers as mathjs reads the name (Unit.parse), the first time and again', () => {
    const em = createSheetEngine().em;
    const unit = em.math.Unit as unknown as { isValuelessUnit(n: string): boolean };
    // The reference: whether mathjs reads the name as a unit (Unit.parse, which does not ask
    // isValuelessUnit).
    const own = (name: string) => {
      try {
        em.math.unit(name);
        return true;
      } catch {
        return false;
      }
    };
    for (let round = 0; round < 2; round++)
      for (const name of names) expect(unit.isValuelessUnit(name), name).toBe(own(name));
  });

  it('forgets its answers when a unit is created or deleted', () => {
    const { math } = createEngineMath([]);
    const unit = math.Unit as unknown as {
      isValuelessUnit(n: string): boolean;
      createUnitSingle(n: string, d: string): unknown;
      deleteUnit(n: string): void;
    };
    expect(unit.isValuelessUnit('furlongish')).toBe(false);
    unit.createUnitSingle('furlongish', '201.168 m');
    expect(unit.isValuelessUnit('furlongish')).toBe(true);
    unit.deleteUnit('furlongish');
    expect(unit.isValuelessUnit('furlongish')).toBe(false);
    // A name with a character no unit had (X) is answered at once, until a unit has it.
    expect(unit.isValuelessUnit('chainX')).toBe(false);
    unit.createUnitSingle('chainX', '20.1168 m');
    expect(unit.isValuelessUnit('chainX')).toBe(true);
    expect(unit.isValuelessUnit('kchainX')).toBe(false); // created without prefixes
    unit.deleteUnit('chainX');
    expect(unit.isValuelessUnit('chainX')).toBe(false);
  });
});
