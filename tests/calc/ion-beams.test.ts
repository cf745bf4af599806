// Ion beams against published values: the ion's mass from the atomic mass (AME 2020, CODATA 2022,
// Lunney, Pearson & Thibault 2003) and the kinematics from the kinetic energy per nucleon (the
// therapy trade's MeV/u), with both conventions (per nucleon, per atomic mass unit) where they differ.
// Each check names its source.
import { describe, expect, it } from 'vitest';
import {
  C,
  E_CHARGE,
  M_ALPHA,
  M_ATOM_C12,
  M_ATOM_H1,
  M_ATOM_HE4,
  M_ATOM_NE20,
  M_ATOM_O16,
  M_E,
  M_P,
  M_U,
} from '../../lib/calc/constants';
import * as lib from '../../lib/calc/functions';
import { electronBindingEnergyEV } from '../../lib/calc/functions/ion-mass';
import { createSheetEngine } from '../../lib/calc/sheet-engine';

const MeV = 1e6 * E_CHARGE; // SI Brochure, 9th ed.: 1 eV = 1.602 176 634e-19 J exactly
const eVc2 = E_CHARGE / (C * C); // 1 eV/c² in kg, exact e and c (SI 2019)
const e = E_CHARGE;

type K3 = (a: number, b: number, c: number) => number;
type K4 = (a: number, b: number, c: number, d: number) => number;
const ionMass = lib.ionMass.kernel as K3;
const gammaPerNucleon = lib.gammaFromKineticPerNucleon.kernel as K3;
const speedPerNucleon = lib.speedFromKineticPerNucleon.kernel as K3;
const momentumPerNucleon = lib.momentumFromKineticPerNucleon.kernel as K3;
const rigidityPerNucleon = lib.rigidityFromKineticPerNucleon.kernel as K4;
const perNucleonFromRigidity = lib.kineticPerNucleonFromRigidity.kernel as K4;
const perNucleonFromMomentum = lib.kineticPerNucleonFromMomentum.kernel as K3;
const momentumFromKinetic = lib.momentumFromKinetic.kernel as (T: number, m: number) => number;
const magneticRigidity = lib.magneticRigidity.kernel as (p: number, q: number) => number;

function expectRelative(actual: number, expected: number, tolerance: number) {
  expect(Math.abs(actual - expected) / Math.abs(expected), `${actual} against ${expected}`).toBeLessThanOrEqual(
    tolerance,
  );
}
/** A published value quoted to a given absolute precision. */
function expectQuoted(actual: number, quoted: number, halfWidth: number) {
  expect(Math.abs(actual - quoted), `${actual} against the quoted ${quoted} ± ${halfWidth}`).toBeLessThanOrEqual(
    halfWidth,
  );
}

const C12_6 = ionMass(M_ATOM_C12, 6, 6 * e);

describe('ionMass: electrons removed from the atomic mass, their binding added back when fully stripped', () => {
  it('evaluates the total electron binding energy of Lunney, Pearson & Thibault (2003), eq. A4', () => {
    // Lunney et al., Rev. Mod. Phys. 75 (2003) 1021, eq. A4: B_el = 14.4381 Z^2.39 + 1.55468e-6 Z^5.35 eV (values of the formula, computed at 30 digits).
    expectRelative(electronBindingEnergyEV(1), 14.43810155468, 1e-14);
    expectRelative(electronBindingEnergyEV(6), 1045.44438950468, 1e-14);
    expectRelative(electronBindingEnergyEV(10), 3544.48132905317, 1e-14);
    expectRelative((C12_6 - (M_ATOM_C12 - 6 * M_E)) / eVc2, 1045.444, 1e-5);
  });

  it('¹²C⁶⁺ agrees with 12 u − 6 m_e + the measured binding 1030.1 eV to within the fit (15 eV, 1.4e-9)', () => {
    // NIST ASD ionization energies of carbon, from memory: 11.260 + 24.383 + 47.888 + 64.494 + 392.09 + 489.99 = 1030.1 eV.
    const measured = 12 * M_U - 6 * M_E + 1030.1 * eVc2; // AME/SI: M(¹²C) = 12 u exactly; CODATA 2022 m_u, m_e
    expect(Math.abs(C12_6 - measured) / eVc2).toBeLessThan(20);
    expect(Math.abs(C12_6 - measured) / measured).toBeLessThan(2e-9);
    expectQuoted(C12_6 / M_U, 11.99671, 1e-5); // common practice: ¹²C⁶⁺ nucleus 11.996 71 u
  });

  it('α and p from ⁴He and ¹H atoms agree with CODATA 2022 m_alpha and m_p to the fit (3.3 eV and 0.84 eV)', () => {
    // CODATA 2022 m_alpha; AME 2020 M(⁴He). The fit gives 75.68 eV for He against the measured 79.005 eV
    // (NIST ASD: 24.587 + 54.418 eV, from memory), so the result is low by 3.3 eV/c², 9e-10 relative.
    expectQuoted((ionMass(M_ATOM_HE4, 2, 2 * e) - M_ALPHA) / eVc2, -3.33, 0.05);
    // CODATA 2022 m_p; AME 2020 M(¹H). The fit gives 14.44 eV against 13.598 eV (NIST ASD, from memory): high by 0.84 eV/c².
    expectQuoted((ionMass(M_ATOM_H1, 1, e) - M_P) / eVc2, 0.84, 0.05);
    expect(Math.abs(ionMass(M_ATOM_HE4, 2, 2 * e) - M_ALPHA) / M_ALPHA).toBeLessThan(1e-9);
  });

  it('neglects the binding of the removed electrons when partially stripped, within the stated bound B_el(Z)/c²', () => {
    // C⁴⁺: M − 4 m_e (documented); the neglected energy is the first four ionization energies of C,
    // 148.0 eV (NIST ASD, from memory), below the bound B_el(6) = 1045 eV.
    expectRelative(ionMass(M_ATOM_C12, 6, 4 * e), M_ATOM_C12 - 4 * M_E, 2 ** -53);
    expect(148.0).toBeLessThan(electronBindingEnergyEV(6));
    // Neutral atom: itself; H⁻ (q = −1): one electron added, the affinity (0.754 eV, from memory) neglected.
    expect(ionMass(M_ATOM_O16, 8, 0)).toBe(M_ATOM_O16);
    expectRelative(ionMass(M_ATOM_H1, 1, -e), M_ATOM_H1 + M_E, 2 ** -53);
    // The bound, relative: 9e-8 for carbon, 1.9e-7 for neon (documented).
    expectQuoted((electronBindingEnergyEV(6) * eVc2) / C12_6, 9.4e-8, 0.1e-8);
    expectQuoted((electronBindingEnergyEV(10) * eVc2) / ionMass(M_ATOM_NE20, 10, 10 * e), 1.9e-7, 0.1e-7);
  });

  it('refuses a nuclear mass, an atomic number that is not one, a charge state beyond Z, and swapped arguments', () => {
    expect(() => ionMass(M_ALPHA, 2, 2 * e)).toThrow(/neutral atom.*m_alpha is the ⁴He nucleus/);
    expect(() => ionMass(M_P, 1, e)).toThrow(/m_p is the proton/);
    expect(() => ionMass(M_ATOM_C12, 6.5, 6 * e)).toThrow(/Z is the atomic number/);
    expect(() => ionMass(M_ATOM_C12, 0, 0)).toThrow(/Z is the atomic number/);
    expect(() => ionMass(M_ATOM_C12, 6, 7 * e)).toThrow(/between −1 and Z = 6; got q = 7/);
    expect(() => ionMass(M_ATOM_C12, 6, -2 * e)).toThrow(/got q = -2/);
    expect(() => ionMass(M_ATOM_C12, 6, 2.5 * e)).toThrow(/whole number of elementary charges/);
    expect(() => ionMass(M_ATOM_H1, 6, 6 * e)).toThrow(/too light for an atom of atomic number Z = 6/);
  });
});

describe('kinematics from the kinetic energy per nucleon', () => {
  it('¹²C⁶⁺ at 430 MeV/u has Bρ ≈ 6.6 T m, the rigidity of the Heidelberg carbon gantry', () => {
    // From memory: HIT (Heidelberg Ion-Beam Therapy Center) delivers carbon up to 430 MeV/u; its gantry is built for 6.6 T m
    // (Haberer et al., Radiother. Oncol. 73 Suppl. 2 (2004) S186).
    expectQuoted(rigidityPerNucleon(430 * MeV, 12, C12_6, 6 * e), 6.6, 0.05);
    // The same from the textbook formulas in plain doubles (PDG "Kinematics": p²c² = T(T + 2mc²); Bρ = p/q), CODATA/AME masses.
    const T = 12 * 430 * MeV;
    const mc2 = C12_6 * C * C;
    const p = Math.sqrt(T * (T + 2 * mc2)) / C;
    expectRelative(rigidityPerNucleon(430 * MeV, 12, C12_6, 6 * e), p / (6 * e), 1e-13);
    expectRelative(momentumPerNucleon(430 * MeV, 12, C12_6), p, 1e-13);
    expectRelative(gammaPerNucleon(430 * MeV, 12, C12_6), 1 + T / mc2, 1e-15);
    expectRelative(speedPerNucleon(430 * MeV, 12, C12_6), (p * C) / (T + mc2), 1e-13); // β = pc/E
    // Computed here from CODATA 2022/AME 2020 (no published digits): 6.6236 T m, 11.914 GeV/c, γ = 1.4618, β = 0.72938.
    expectQuoted(rigidityPerNucleon(430 * MeV, 12, C12_6, 6 * e), 6.6236, 1e-4);
  });

  it('a 250 MeV proton: PDG kinematics, the same numbers as the total-energy functions with A = 1', () => {
    // PDG RPP 2024 "Kinematics" with CODATA 2022 m_p: γ = 1 + 250/938.272 = 1.266 447, p = 729.13 MeV/c, β = 0.613 61, Bρ = 2.4321 T m.
    expectQuoted(gammaPerNucleon(250 * MeV, 1, M_P), 1.266447, 1e-6);
    expectQuoted((momentumPerNucleon(250 * MeV, 1, M_P) * C) / MeV, 729.13, 0.01);
    expectQuoted(speedPerNucleon(250 * MeV, 1, M_P), 0.61361, 1e-5);
    expectQuoted(rigidityPerNucleon(250 * MeV, 1, M_P, e), 2.4321, 1e-4);
    // Shared numerics (common practice: one implementation): identical to momentumFromKinetic and magneticRigidity.
    expect(momentumPerNucleon(250 * MeV, 1, M_P)).toBe(momentumFromKinetic(250 * MeV, M_P));
    expect(rigidityPerNucleon(250 * MeV, 1, M_P, e)).toBe(magneticRigidity(momentumFromKinetic(250 * MeV, M_P), e));
    // PDG: a proton of 1 GeV/c has Bρ = 3.3356 T m and T = 432.98 MeV (the kineticFromRigidity check).
    expectQuoted(perNucleonFromRigidity(3.3356, 1, M_P, e) / MeV, 432.98, 0.01);
  });

  it('the inverses give back the energy per nucleon', () => {
    for (const [Tn, A, m, z] of [
      [430, 12, C12_6, 6],
      [220, 4, ionMass(M_ATOM_HE4, 2, 2 * e), 2],
      [250, 1, M_P, 1],
      [0.001, 16, ionMass(M_ATOM_O16, 8, 8 * e), 8],
      [7, 12, ionMass(M_ATOM_C12, 6, 4 * e), 4],
    ] as const) {
      const Brho = rigidityPerNucleon(Tn * MeV, A, m, z * e);
      expectRelative(perNucleonFromRigidity(Brho, A, m, z * e), Tn * MeV, 4e-16); // round trip (common practice)
      expectRelative(perNucleonFromMomentum(momentumPerNucleon(Tn * MeV, A, m), A, m), Tn * MeV, 4e-16);
      expectRelative(perNucleonFromRigidity(-Brho, A, m, -z * e), Tn * MeV, 4e-16); // the sign of Bρ follows the charge
    }
  });

  it('per nucleon and per atomic mass unit differ by m/(A u): 2.7e-4 for ¹²C⁶⁺, 0.7 % for protons', () => {
    // Common practice: per nucleon T = A·Tn; per atomic mass unit T = Tu·m/u.
    const ratio = C12_6 / (12 * M_U);
    expectQuoted(1 - ratio, 2.742e-4, 0.001e-4); // ¹²C⁶⁺ is 11.996 71 u
    const perU = magneticRigidity(momentumFromKinetic(430 * MeV * (C12_6 / M_U), C12_6), 6 * e);
    const perNucleon = rigidityPerNucleon(430 * MeV, 12, C12_6, 6 * e);
    expect(perU).toBeLessThan(perNucleon);
    // dp/p = (γ/(γ + 1)) dT/T (PDG kinematics): the rigidities differ by γ/(γ + 1) of the energy difference.
    const gamma = gammaPerNucleon(430 * MeV, 12, C12_6);
    expectRelative(1 - perU / perNucleon, (1 - ratio) * (gamma / (gamma + 1)), 1e-3);
    // Protons: 1 u per nucleon is 0.7 % less than m_p.
    expectQuoted(M_P / M_U - 1, 0.007276, 1e-6); // CODATA 2022: A_r(p) = 1.007 276 466 5789
  });

  it('refuses swapped mass number and mass, a charge of zero, a negative energy', () => {
    expect(() => rigidityPerNucleon(430 * MeV, 6, C12_6, 12 * e)).toThrow(/not the mass of an ion of A = 6 nucleons/);
    expect(() => gammaPerNucleon(430 * MeV, 12.5, C12_6)).toThrow(/A is the mass number/);
    expect(() => rigidityPerNucleon(430 * MeV, 12, C12_6, 0)).toThrow(/q must not be zero/);
    expect(() => momentumPerNucleon(-1, 12, C12_6)).toThrow(/Tn must be ≥ 0/);
    expect(() => perNucleonFromRigidity(6.6, 12, C12_6, -6 * e)).toThrow(/sign of q/);
  });
});

describe('in a sheet: 430 MeV/u is read as per nucleon', () => {
  const engine = createSheetEngine();
  const run = (source: string) =>
    engine.evaluate([{ id: 'c1', kind: 'calc', source }], { significantFigures: 6 }).cells[0].statements;

  it('accepts the energy per nucleon as an energy or written in MeV/u, and gives the same result', () => {
    const [a, b, c] = run(
      'm_C = ionMass(M_C12, 6, 6)\nBrho_1 = rigidityFromKineticPerNucleon(430 MeV, 12, m_C, 6) to T*m\nBrho_2 = rigidityFromKineticPerNucleon(430 MeV/u, 12, m_C, 6 q_e) to T*m',
    );
    expect(a.error).toBeNull();
    expect(b.value?.text).toBe('6.623\u202f63 T·m'); // computed from CODATA 2022 and AME 2020 (HIT quotes 6.6 T m, from memory)
    expectRelative(c.value!.number!, b.value!.number!, 2 ** -51); // MeV/u times u: one rounding
  });

  it('the speed carries its precise companion: γ from it is the direct γ', () => {
    const [, v, g1, g2] = run(
      'm_C = ionMass(M_C12, 6, 6)\nv = speedFromKineticPerNucleon(430 MeV/u, 12, m_C)\ng_1 = lorentzFactor(v)\ng_2 = gammaFromKineticPerNucleon(430 MeV/u, 12, m_C)',
    );
    expect(v.value?.unit).toBe('m / s');
    // common practice: γ = 1/√(1 − β²) = 1 + T/mc² (PDG kinematics), the same to the last bit through the companion
    expectRelative(g1.value!.number!, g2.value!.number!, 2 ** -52);
  });

  it('refuses an energy per mass not written per u, and an energy per u where a total energy is meant', () => {
    const [bad] = run('rigidityFromKineticPerNucleon(430 MeV/kg, 12, ionMass(M_C12, 6, 6), 6)');
    expect(bad.error).toContain(
      'must be a kinetic energy per nucleon (an energy, e.g. 430 MeV) or an energy per nucleon written as MeV/u',
    );
    const [total] = run('momentumFromKinetic(430 MeV/u, ionMass(M_C12, 6, 6))');
    expect(total.error).toContain('must be an energy');
  });

  it('a per-nucleon result is shown in MeV/u and can never be taken for the total kinetic energy', () => {
    const [, top, asEnergy, total, back, lower] = run(
      'm_C = ionMass(M_C12, 6, 6)\nT_n = kineticPerNucleonFromRigidity(6.6 T*m, 12, m_C, 6)\nT_bad = kineticPerNucleonFromRigidity(6.6 T*m, 12, m_C, 6) to MeV\nT = T_n * 12 u to MeV\nB = rigidityFromKineticPerNucleon(T_n, 12, m_C, 6) to T*m\nT_n < 430 MeV/u',
    );
    // HIT's carbon gantry, 6.6 T m, takes ¹²C⁶⁺ up to about 430 MeV/u (from memory); computed 427.419 MeV/u
    expect(top.value?.text?.replace(/\s/g, ' ')).toBe('427.419 MeV/u');
    expect(asEnergy.error).toContain('cannot convert');
    // common practice: T = A·Tn (per nucleon), so 12 × 427.419 MeV = 5129.02 MeV
    expect(total.value?.text?.replace(/\s/g, ' ')).toBe('5129.02 MeV');
    expectRelative(back.value!.number!, 6.6, 4 * 2 ** -52);
    expect(lower.value?.text).toBe('true');
  });

  it('the per-u convention is written as an energy per u times the ion mass, with the total-energy functions', () => {
    const [, perU, perNucleon] = run(
      'm_C = ionMass(M_C12, 6, 6)\nT_u = 430 MeV/u * m_C to MeV\nT_n = 12 * 430 MeV to MeV',
    );
    // common practice: per u, T = 430 MeV × 11.996 71 = 5158.59 MeV; per nucleon 5160 MeV.
    expectQuoted(perU.value!.number!, 5158.586, 0.001);
    expect(perNucleon.value!.number).toBe(5160);
  });
});
