import { finiteResult, requireFinite } from './support/domain';
import { round } from './support/double-double';
import { kineticFromMomentumDD, momentumFromRigidityDD } from './support/kinematics';
import { perNucleon, requireIonMass, requireMassNumber } from './support/per-nucleon';
import {
  A_PARAM,
  CHARGE_STATE_PARAM,
  ION_MASS_PARAM,
  PER_NUCLEON_CONVENTION,
  PER_NUCLEON_SOURCE,
} from './support/per-nucleon-docs';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'kineticPerNucleonFromRigidity';

/**
 * kineticPerNucleonFromRigidity(Brho, A, m, q) — the kinetic energy PER NUCLEON of an ion of mass
 * m, mass number A and charge q whose magnetic rigidity is Bρ (the inverse of
 * rigidityFromKineticPerNucleon).
 *
 * Formula: p = qBρ, T = p²c²/(E + mc²) as in kineticFromMomentum, Tn = T/A.
 *
 * Convention: per nucleon (T/A, A the mass number), the therapy trade's MeV/u; per atomic mass unit
 * of the ion's mass it would be T/(m/u), which differs by the factor m/(A u): use
 * kineticFromRigidity for T and divide as the facility does.
 *
 * Domain: Bρ of the sign of q (0 allowed); A an integer 1 … 300; m > 0 and between 0.99 and 1.02 u
 * per nucleon; q ≠ 0. NaN and ±Infinity are refused.
 *
 * Example: `kineticPerNucleonFromRigidity(6.6 T*m, 12, ionMass(M_C12, 6, 6), 6)` → 427.42 MeV/u (per nucleon).
 *
 * Source: PDG, Review of Particle Physics (2024), "Kinematics" and "Passage of particles through matter".
 *
 * Numerics: qBρ exact; the cancellation-free T of kineticFromMomentum in double-double; divided by A; rounded once.
 */
export const kineticPerNucleonFromRigidity: CalcFunction = {
  name: FN,
  params: [
    { name: 'Brho', kind: 'rigidity', description: 'magnetic rigidity Bρ (field times bending radius)' },
    A_PARAM,
    ION_MASS_PARAM,
    CHARGE_STATE_PARAM,
  ],
  returns: 'energy-per-nucleon',
  doc: {
    summary: `Kinetic energy per nucleon (T/A) of an ion of mass m, mass number A and charge q with magnetic rigidity Bρ. ${PER_NUCLEON_CONVENTION}`,
    formula:
      'T_n = \\frac{T}{A},\\quad T = \\frac{p^2c^2}{E + mc^2},\\quad p = |q\\,B\\rho|,\\ E = \\sqrt{p^2c^2 + m^2c^4}',
    domain:
      'Bρ has the sign of q (Bρ = p/q with p ≥ 0) and may be 0; A an integer 1 … 300 (mass number); m > 0, between 0.99 u and 1.02 u per nucleon (otherwise refused as swapped or mismatched); q ≠ 0 (6 or 6 q_e for C⁶⁺). NaN and ±Infinity are refused.',
    example: 'kineticPerNucleonFromRigidity(6.6 T*m, 12, ionMass(M_C12, 6, 6), 6)',
    exampleResult: '427.42 MeV/u (per nucleon: the most a 6.6 T m beam line takes of ¹²C⁶⁺)',
    source: PER_NUCLEON_SOURCE,
    numerics:
      'qBρ is an exact (Dekker) product; T = p²c²/(E + mc²) without subtraction as in kineticFromMomentum, in double-double; divided by A; rounded once.',
  },
  kernel: (BrhoArg: KernelArgument, A: KernelArgument, m: KernelArgument, qArg: KernelArgument): number => {
    const Brho = requireFinite(FN, 'Brho', BrhoArg as number);
    const a = requireMassNumber(FN, A as number);
    const mass = requireIonMass(FN, m as number, a);
    const q = requireFinite(FN, 'q', qArg as number);
    return finiteResult(FN, round(perNucleon(kineticFromMomentumDD(momentumFromRigidityDD(FN, Brho, q), mass), a)));
  },
};
