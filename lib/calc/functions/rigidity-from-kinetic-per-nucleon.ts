import { finiteResult, requireFinite } from './support/domain';
import { dd, div, round } from './support/double-double';
import { momentumFromKineticDD } from './support/kinematics';
import { requireIonMass, requireMassNumber, totalKinetic } from './support/per-nucleon';
import {
  A_PARAM,
  CHARGE_STATE_PARAM,
  ION_MASS_PARAM,
  PER_NUCLEON_CONVENTION,
  PER_NUCLEON_SOURCE,
  TN_PARAM,
} from './support/per-nucleon-docs';
import { type CalcFunction, DomainError, type KernelArgument } from './types';

const FN = 'rigidityFromKineticPerNucleon';

/**
 * rigidityFromKineticPerNucleon(Tn, A, m, q) — the magnetic rigidity Bρ of an ion of mass m, mass
 * number A and charge q whose kinetic energy per nucleon is Tn (the trade's MeV/u).
 *
 * Formula: Bρ = p/q, p = √T·√(T + 2mc²)/c, T = A·Tn.
 *
 * Convention: per nucleon, T = A·Tn; 430 MeV/u is read as per nucleon; per atomic mass unit of the
 * ion's mass differs by m/(A u) (write T = Tu·m and use magneticRigidity(momentumFromKinetic(T, m), q)).
 *
 * Domain: Tn ≥ 0; A an integer 1 … 300; m > 0 and between 0.99 and 1.02 u per nucleon; q ≠ 0 (the
 * sign of Bρ is the sign of q). NaN and ±Infinity are refused.
 *
 * Example: `rigidityFromKineticPerNucleon(430 MeV/u, 12, ionMass(M_C12, 6, 6), 6) to T*m` → 6.6236 T m.
 *
 * Source: PDG, Review of Particle Physics (2024), "Kinematics", and Bρ = p/q (Bρ [T m] = 3.3356 p
 * [GeV/c] per unit charge).
 *
 * Numerics: A·Tn exact; p as in momentumFromKinetic, divided by q in double-double, rounded once.
 */
export const rigidityFromKineticPerNucleon: CalcFunction = {
  name: FN,
  params: [TN_PARAM, A_PARAM, ION_MASS_PARAM, CHARGE_STATE_PARAM],
  returns: 'rigidity',
  doc: {
    summary: `Magnetic rigidity Bρ of an ion from its kinetic energy per nucleon and its charge. ${PER_NUCLEON_CONVENTION}`,
    formula: 'B\\rho = \\frac{p}{q},\\quad p = \\frac{\\sqrt{T}\\,\\sqrt{T + 2mc^2}}{c},\\quad T = A\\,T_n',
    domain:
      'Tn ≥ 0 (per nucleon); A an integer 1 … 300 (mass number); m > 0, between 0.99 u and 1.02 u per nucleon (otherwise refused as swapped or mismatched); q ≠ 0, the charge state (6 or 6 q_e for C⁶⁺), either sign (the sign of Bρ is the bending direction). NaN and ±Infinity are refused.',
    example: 'rigidityFromKineticPerNucleon(430 MeV/u, 12, ionMass(M_C12, 6, 6), 6) to T*m',
    exampleResult: '6.6236 T m (¹²C⁶⁺ at 430 MeV/u)',
    source: `${PER_NUCLEON_SOURCE} Bρ [T m] = 3.3356 p [GeV/c] per unit charge (PDG).`,
    numerics:
      'A·Tn is an exact (Dekker) product; the momentum as in momentumFromKinetic, divided by q in double-double, rounded once.',
  },
  kernel: (Tn: KernelArgument, A: KernelArgument, m: KernelArgument, qArg: KernelArgument): number => {
    const a = requireMassNumber(FN, A as number);
    const T = totalKinetic(FN, Tn as number, a);
    const mass = requireIonMass(FN, m as number, a);
    const q = requireFinite(FN, 'q', qArg as number);
    if (q === 0) throw new DomainError(`${FN}: q must not be zero (a neutral atom is not bent); got q = 0 C`);
    return finiteResult(FN, round(div(momentumFromKineticDD(T, mass), dd(q))));
  },
};
