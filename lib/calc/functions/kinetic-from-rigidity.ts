import { finiteResult, requireFinite, requireNonNegative } from './support/domain';
import { round } from './support/double-double';
import { kineticFromMomentumDD, momentumFromRigidityDD } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'kineticFromRigidity';

/**
 * kineticFromRigidity(Brho, m, q) — the kinetic energy of a particle of mass m and charge q whose
 * magnetic rigidity is Bρ (the inverse of magneticRigidity followed by momentum → energy).
 *
 * Formula: p = qBρ, then T = p²c²/(E + mc²) as in kineticFromMomentum.
 *
 * Domain: q ≠ 0, a charge or an integer charge number (1, 6 for C⁶⁺, −1 for an electron); Bρ of the
 * sign of q (Bρ = p/q with p ≥ 0), 0 allowed; m ≥ 0. NaN and ±Infinity are refused, as is a result
 * outside the double range.
 *
 * Example: `kineticFromRigidity(3.3356 T m, m_p, q_e) to MeV` → 432.98 MeV (a proton of 1 GeV/c).
 *
 * Source: Particle Data Group, Review of Particle Physics (2024), reviews "Kinematics" and
 * "Passage of particles through matter" (Bρ [T m] = 3.3356 p [GeV/c] for unit charge); H. Wiedemann,
 * Particle Accelerator Physics, 4th ed. (2015), ch. 1.
 *
 * Numerics: qBρ is an exact (Dekker) product; then the cancellation-free T of kineticFromMomentum,
 * double-double, rounded once.
 */
export const kineticFromRigidity: CalcFunction = {
  name: FN,
  params: [
    { name: 'Brho', kind: 'rigidity', description: 'magnetic rigidity Bρ (field times bending radius)' },
    { name: 'm', kind: 'mass', description: 'rest mass (a mass, or the rest energy mc²)' },
    {
      name: 'q',
      kind: 'charge',
      description: 'charge of the particle (a charge such as q_e or 6 q_e, or an integer charge number)',
    },
  ],
  returns: 'energy',
  doc: {
    summary: 'Kinetic energy of a particle of mass m and charge q with magnetic rigidity Bρ.',
    formula: 'p = q\\,B\\rho,\\quad T = \\frac{p^2c^2}{E + mc^2},\\ E = \\sqrt{p^2c^2 + m^2c^4}',
    domain:
      'q ≠ 0: a charge, or an integer charge number (1, 6 for C⁶⁺, −1 for an electron); Bρ has the sign of q (Bρ = p/q with p ≥ 0) and may be 0; m ≥ 0. NaN and ±Infinity are refused, as is a result outside the double range.',
    example: 'kineticFromRigidity(3.3356 T m, m_p, q_e) to MeV',
    exampleResult: '432.98 MeV (a proton of 1 GeV/c)',
    source:
      'Particle Data Group, Review of Particle Physics (2024), reviews "Kinematics" and "Passage of particles through matter" (Bρ [T m] = 3.3356 p [GeV/c] for unit charge); H. Wiedemann, Particle Accelerator Physics, 4th ed. (2015), ch. 1.',
    numerics:
      'qBρ is an exact (Dekker) product; T = p²c²/(E + mc²) in the cancellation-free form of kineticFromMomentum, double-double, rounded once (within about half an ulp).',
  },
  kernel: (BrhoArg: KernelArgument, mArg: KernelArgument, qArg: KernelArgument): number => {
    const Brho = requireFinite(FN, 'Brho', BrhoArg as number);
    const m = requireNonNegative(FN, 'm', mArg as number, 'kg', 'a rest mass');
    const q = requireFinite(FN, 'q', qArg as number);
    return finiteResult(FN, round(kineticFromMomentumDD(momentumFromRigidityDD(FN, Brho, q), m)));
  },
};
