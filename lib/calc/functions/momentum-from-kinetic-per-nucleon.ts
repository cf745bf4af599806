import { finiteResult } from './support/domain';
import { round } from './support/double-double';
import { momentumFromKineticDD } from './support/kinematics';
import { requireIonMass, requireMassNumber, totalKinetic } from './support/per-nucleon';
import {
  A_PARAM,
  ION_MASS_PARAM,
  PER_NUCLEON_CONVENTION,
  PER_NUCLEON_SOURCE,
  TN_PARAM,
} from './support/per-nucleon-docs';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'momentumFromKineticPerNucleon';

/**
 * momentumFromKineticPerNucleon(Tn, A, m) — the momentum of an ion of mass m and mass number A whose
 * kinetic energy per nucleon is Tn (the trade's MeV/u).
 *
 * Formula: p = √T·√(T + 2mc²)/c with T = A·Tn.
 *
 * Convention: per nucleon, T = A·Tn; 430 MeV/u is read as per nucleon; per atomic mass unit of the
 * ion's mass differs by m/(A u) (write T = Tu·m and use momentumFromKinetic).
 *
 * Domain: Tn ≥ 0; A an integer 1 … 300; m > 0 and between 0.99 and 1.02 u per nucleon. NaN and
 * ±Infinity are refused.
 *
 * Example: `momentumFromKineticPerNucleon(430 MeV/u, 12, ionMass(M_C12, 6, 6)) to GeV/c` → 11.914 GeV/c.
 *
 * Source: PDG, Review of Particle Physics (2024), "Kinematics" (p²c² = T(T + 2mc²)).
 *
 * Numerics: A·Tn exact, then momentumFromKinetic's double-double product form, rounded once.
 */
export const momentumFromKineticPerNucleon: CalcFunction = {
  name: FN,
  params: [TN_PARAM, A_PARAM, ION_MASS_PARAM],
  returns: 'momentum',
  doc: {
    summary: `Momentum of an ion from its kinetic energy per nucleon. ${PER_NUCLEON_CONVENTION}`,
    formula: 'p = \\frac{\\sqrt{T}\\,\\sqrt{T + 2mc^2}}{c},\\quad T = A\\,T_n',
    domain:
      'Tn ≥ 0 (per nucleon); A an integer 1 … 300 (mass number); m > 0, between 0.99 u and 1.02 u per nucleon (otherwise refused as swapped or mismatched). NaN and ±Infinity are refused.',
    example: 'momentumFromKineticPerNucleon(430 MeV/u, 12, ionMass(M_C12, 6, 6)) to GeV/c',
    exampleResult: '11.914 GeV/c (¹²C⁶⁺ at 430 MeV/u)',
    source: PER_NUCLEON_SOURCE,
    numerics:
      'A·Tn is an exact (Dekker) product; then √T·√(T + 2mc²)/c in double-double as in momentumFromKinetic (no E² − m²c⁴ cancellation), rounded once.',
  },
  kernel: (Tn: KernelArgument, A: KernelArgument, m: KernelArgument): number => {
    const a = requireMassNumber(FN, A as number);
    const T = totalKinetic(FN, Tn as number, a);
    return finiteResult(FN, round(momentumFromKineticDD(T, requireIonMass(FN, m as number, a))));
  },
};
