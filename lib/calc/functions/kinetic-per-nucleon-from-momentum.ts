import { finiteResult, requireNonNegative } from './support/domain';
import { dd, round } from './support/double-double';
import { kineticFromMomentumDD } from './support/kinematics';
import { perNucleon, requireIonMass, requireMassNumber } from './support/per-nucleon';
import { A_PARAM, ION_MASS_PARAM, PER_NUCLEON_CONVENTION, PER_NUCLEON_SOURCE } from './support/per-nucleon-docs';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'kineticPerNucleonFromMomentum';

/**
 * kineticPerNucleonFromMomentum(p, A, m) — the kinetic energy PER NUCLEON of an ion of mass m and
 * mass number A with momentum p (the inverse of momentumFromKineticPerNucleon).
 *
 * Formula: T = pc·y/(√(1 + y²) + 1), y = p/(mc) (= p²c²/(E + mc²)), Tn = T/A.
 *
 * Convention: per nucleon (T/A, A the mass number); per atomic mass unit of the ion's mass differs
 * by m/(A u): use kineticFromMomentum for T and divide as the facility does.
 *
 * Domain: p ≥ 0; A an integer 1 … 300; m > 0 and between 0.99 and 1.02 u per nucleon. NaN and
 * ±Infinity are refused.
 *
 * Example: `kineticPerNucleonFromMomentum(12 GeV/c, 12, ionMass(M_C12, 6, 6))` → 435.22 MeV/u (per nucleon).
 *
 * Source: PDG, Review of Particle Physics (2024), "Kinematics".
 *
 * Numerics: kineticFromMomentum's subtraction-free double-double T, divided by A, rounded once.
 */
export const kineticPerNucleonFromMomentum: CalcFunction = {
  name: FN,
  params: [
    { name: 'p', kind: 'momentum', description: 'momentum of the ion (a momentum, or pc as an energy)' },
    A_PARAM,
    ION_MASS_PARAM,
  ],
  returns: 'energy-per-nucleon',
  doc: {
    summary: `Kinetic energy per nucleon (T/A) of an ion of mass m and mass number A with momentum p. ${PER_NUCLEON_CONVENTION}`,
    formula:
      'T_n = \\frac{T}{A},\\quad T = \\frac{p^2c^2}{E + mc^2} = pc\\,\\frac{y}{\\sqrt{1+y^2} + 1},\\ y = \\frac{p}{mc}',
    domain:
      'p ≥ 0; A an integer 1 … 300 (mass number); m > 0, between 0.99 u and 1.02 u per nucleon (otherwise refused as swapped or mismatched). NaN and ±Infinity are refused.',
    example: 'kineticPerNucleonFromMomentum(12 GeV/c, 12, ionMass(M_C12, 6, 6))',
    exampleResult: '435.22 MeV/u (per nucleon: ¹²C⁶⁺ of 12 GeV/c)',
    source: PER_NUCLEON_SOURCE,
    numerics:
      'T = p²c²/(E + mc²) without subtraction as in kineticFromMomentum, in double-double; divided by A; rounded once.',
  },
  kernel: (pArg: KernelArgument, A: KernelArgument, m: KernelArgument): number => {
    const p = requireNonNegative(FN, 'p', pArg as number, 'kg m/s', 'a momentum magnitude');
    const a = requireMassNumber(FN, A as number);
    return finiteResult(FN, round(perNucleon(kineticFromMomentumDD(dd(p), requireIonMass(FN, m as number, a)), a)));
  },
};
