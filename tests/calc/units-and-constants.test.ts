// Units and constants of the engine's mathjs instance, against the SI Brochure (9th edition, 2019)
// and CODATA 2022.
import { describe, expect, it } from 'vitest';
import { CONSTANTS } from '../../lib/calc/constants';
import { createSheetEngine } from '../../lib/calc/sheet-engine';

const { parse } = createSheetEngine().em;
const si = (expr: string, unit: string) => (parse(expr).compile().evaluate() as { toNumber(u: string): number }).toNumber(unit);

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
    expect(si('1 pc', 'm')).toBeCloseTo(3.0856775814913673e16, 0);
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
