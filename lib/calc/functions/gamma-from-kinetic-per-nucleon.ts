import { finiteResult } from './support/domain';
import { round } from './support/double-double';
import { gammaFromKineticDD } from './support/kinematics';
import { requireIonMass, requireMassNumber, totalKinetic } from './support/per-nucleon';
import {
  A_PARAM,
  ION_MASS_PARAM,
  PER_NUCLEON_CONVENTION,
  PER_NUCLEON_SOURCE,
  TN_PARAM,
} from './support/per-nucleon-docs';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'gammaFromKineticPerNucleon';

/**
 * gammaFromKineticPerNucleon(Tn, A, m) — the Lorentz factor of an ion of mass m and mass number A
 * whose kinetic energy per nucleon is Tn (the trade's MeV/u).
 *
 * Formula: γ = 1 + A·Tn/(mc²).
 *
 * Convention: per nucleon, T = A·Tn with A the mass number; 430 MeV/u is read as per nucleon. Per
 * atomic mass unit of the ion's mass (T/(m/u), quoted by some facilities) differs by m/(A u): write
 * T = Tu·m and use gammaFromKinetic.
 *
 * Domain: Tn ≥ 0; A an integer 1 … 300; m > 0 and between 0.99 and 1.02 u per nucleon (a mass that
 * does not fit A is refused as swapped arguments). NaN and ±Infinity are refused.
 *
 * Example: `gammaFromKineticPerNucleon(430 MeV/u, 12, ionMass(M_C12, 6, 6))` → 1.4618.
 *
 * Source: PDG, Review of Particle Physics (2024), "Kinematics" (γ = E/mc², E = T + mc²).
 *
 * Numerics: A·Tn is an exact product; then gammaFromKinetic's double-double T/(mc²) + 1, rounded once.
 */
export const gammaFromKineticPerNucleon: CalcFunction = {
  name: FN,
  params: [TN_PARAM, A_PARAM, ION_MASS_PARAM],
  returns: 'number',
  doc: {
    summary: `Lorentz factor γ of an ion from its kinetic energy per nucleon. ${PER_NUCLEON_CONVENTION}`,
    formula: '\\gamma = 1 + \\frac{A\\,T_n}{mc^2}',
    domain:
      'Tn ≥ 0 (per nucleon); A an integer 1 … 300 (mass number); m > 0, between 0.99 u and 1.02 u per nucleon (otherwise A and m are taken to be swapped or mismatched, and refused). NaN and ±Infinity are refused.',
    example: 'gammaFromKineticPerNucleon(430 MeV/u, 12, ionMass(M_C12, 6, 6))',
    exampleResult: '1.4618 (¹²C⁶⁺ at 430 MeV/u)',
    source: PER_NUCLEON_SOURCE,
    numerics:
      'A·Tn is an exact (Dekker) product, so the per-nucleon form adds no rounding: then T/(mc²) + 1 in double-double as in gammaFromKinetic, rounded once (within about half an ulp).',
  },
  kernel: (Tn: KernelArgument, A: KernelArgument, m: KernelArgument): number => {
    const a = requireMassNumber(FN, A as number);
    const T = totalKinetic(FN, Tn as number, a);
    return finiteResult(FN, round(gammaFromKineticDD(T, requireIonMass(FN, m as number, a))));
  },
};
