import { finiteResult, requireFinite, requireNonNegative } from './support/domain';
import { type CalcFunction, DomainError } from './types';

const FN = 'magneticRigidity';

/**
 * magneticRigidity(p, q) — the magnetic rigidity Bρ = p/q of a particle of momentum p and charge q:
 * the product of field and bending radius that bends it on a circle.
 *
 * Formula: Bρ = p/q; in practical units Bρ [T m] = 3.3356 p [GeV/c] / (q/e).
 *
 * Domain: p ≥ 0 (a momentum magnitude), q ≠ 0 (either sign; the sign of the result is the sign of
 * the charge, i.e. the bending direction); NaN and ±Infinity are refused.
 *
 * Example: `magneticRigidity(momentumFromKinetic(250 MeV, m_p), q_e)` → 2.4321 T m.
 *
 * Source: Lorentz force on a circular orbit, qvB = γmv²/ρ; H. Wiedemann, Particle Accelerator
 * Physics, 4th ed. (2015), ch. 1; Particle Data Group, Review of Particle Physics (2024).
 *
 * Numerics: a single division, correctly rounded.
 */
export const magneticRigidity: CalcFunction = {
  name: FN,
  params: [
    { name: 'p', kind: 'momentum', description: 'momentum of the particle (a momentum, or pc as an energy)' },
    {
      name: 'q',
      kind: 'charge',
      description:
        'charge of the particle (a charge such as q_e or 6 q_e, or an integer charge number: 1, 6 for C⁶⁺, −1 for an electron)',
    },
  ],
  returns: 'rigidity',
  doc: {
    summary: 'Magnetic rigidity Bρ = p/q: the field times bending radius that keeps the particle on a circle.',
    formula: 'B\\rho = \\frac{p}{q}',
    domain:
      'p ≥ 0 (a momentum magnitude); q ≠ 0, either sign (the sign of Bρ is the bending direction). NaN and ±Infinity are refused.',
    example: 'Brho = magneticRigidity(momentumFromKinetic(250 MeV, m_p), q_e) to T*m',
    exampleResult: '2.4321 T m',
    source:
      'Lorentz force on a circular orbit, qvB = γmv²/ρ; H. Wiedemann, Particle Accelerator Physics, 4th ed. (2015), ch. 1; Particle Data Group, Review of Particle Physics (2024): Bρ [T m] = 3.3356 p [GeV/c] for unit charge.',
    numerics: 'One division, correctly rounded.',
  },
  kernel: (p: number, q: number): number => {
    requireNonNegative(FN, 'p', p, 'kg m/s', 'a momentum magnitude');
    requireFinite(FN, 'q', q);
    if (q === 0) throw new DomainError(`${FN}: q must not be zero (a neutral particle is not bent); got q = 0 C`);
    return finiteResult(FN, p / q);
  },
};
