import { speedFromKineticDD, speedValue } from './support/kinematics';
import { requireIonMass, requireMassNumber, totalKinetic } from './support/per-nucleon';
import {
  A_PARAM,
  ION_MASS_PARAM,
  PER_NUCLEON_CONVENTION,
  PER_NUCLEON_SOURCE,
  TN_PARAM,
} from './support/per-nucleon-docs';
import type { CalcFunction, KernelArgument, PreciseSpeed } from './types';

const FN = 'speedFromKineticPerNucleon';

function precise(Tn: KernelArgument, A: KernelArgument, m: KernelArgument): PreciseSpeed | number {
  const a = requireMassNumber(FN, A as number);
  const T = totalKinetic(FN, Tn as number, a);
  return speedFromKineticDD(T, requireIonMass(FN, m as number, a));
}

/**
 * speedFromKineticPerNucleon(Tn, A, m) — the speed of an ion of mass m and mass number A whose
 * kinetic energy per nucleon is Tn (the trade's MeV/u).
 *
 * Formula: β = √(x(x + 2))/(x + 1), x = A·Tn/(mc²).
 *
 * Convention: per nucleon, T = A·Tn; 430 MeV/u is read as per nucleon; per atomic mass unit of the
 * ion's mass differs by m/(A u) (write T = Tu·m and use speedFromKinetic).
 *
 * Domain: Tn ≥ 0; A an integer 1 … 300; m > 0 and between 0.99 and 1.02 u per nucleon. NaN and
 * ±Infinity are refused.
 *
 * Example: `speedFromKineticPerNucleon(430 MeV/u, 12, ionMass(M_C12, 6, 6))` → 2.1866e8 m/s (β = 0.72938).
 *
 * Source: PDG, Review of Particle Physics (2024), "Kinematics" (β = pc/E).
 *
 * Numerics: A·Tn exact, then speedFromKinetic's double-double form without subtraction; the result
 * carries its precise companion (β and 1/γ in double-double) like speedFromKinetic.
 */
export const speedFromKineticPerNucleon: CalcFunction = {
  name: FN,
  params: [TN_PARAM, A_PARAM, ION_MASS_PARAM],
  returns: 'speed',
  doc: {
    summary: `Speed of an ion from its kinetic energy per nucleon. ${PER_NUCLEON_CONVENTION}`,
    formula: '\\beta = \\frac{\\sqrt{x\\,(x+2)}}{x+1},\\quad x = \\frac{A\\,T_n}{mc^2}',
    domain:
      'Tn ≥ 0 (per nucleon); A an integer 1 … 300 (mass number); m > 0, between 0.99 u and 1.02 u per nucleon (otherwise refused as swapped or mismatched). NaN and ±Infinity are refused.',
    example: 'speedFromKineticPerNucleon(430 MeV/u, 12, ionMass(M_C12, 6, 6))',
    exampleResult: '2.1866e8 m/s (β = 0.72938)',
    source: PER_NUCLEON_SOURCE,
    numerics:
      'A·Tn is an exact (Dekker) product; then the subtraction-free β of speedFromKinetic in double-double, rounded once, with its precise companion (β and 1/γ in double-double) for exact composition.',
  },
  kernel: (Tn: KernelArgument, A: KernelArgument, m: KernelArgument): number => speedValue(precise(Tn, A, m)),
  preciseKernel: precise,
};
