import { finiteResult, requireNonNegative, requirePositive } from './support/domain';
import { div, dd, round, twoProd } from './support/double-double';
import type { CalcFunction } from './types';

const FN = 'decayLength';

/**
 * decayLength(p, m, tau) — the mean distance βγcτ an unstable particle of momentum p, mass m and
 * mean life τ travels before it decays.
 *
 * Formula: L = βγcτ = pτ/m (βγ = p/(mc)).
 *
 * Domain: p ≥ 0, m > 0 (a particle with a rest frame), τ ≥ 0; NaN and ±Infinity are refused.
 *
 * Example: `decayLength(1 GeV, m_mu, 2.1969811 us)` (a 1 GeV/c muon) → 6233.7 m.
 *
 * Source: Particle Data Group, Review of Particle Physics (2024), review "Kinematics" and the
 * particle listings (cτ); βγ = p/(mc).
 *
 * Numerics: pτ by Dekker's exact product, one double-double division, rounded once.
 */
export const decayLength: CalcFunction = {
  name: FN,
  params: [
    { name: 'p', kind: 'momentum', description: 'momentum of the particle (a momentum, or pc as an energy)' },
    { name: 'm', kind: 'mass', description: 'rest mass of the particle (a mass, or mc²)' },
    { name: 'tau', kind: 'time', description: 'mean life τ in the particle’s rest frame' },
  ],
  returns: 'length',
  doc: {
    summary: 'Mean decay length βγcτ of an unstable particle of momentum p, mass m and mean life τ.',
    formula: 'L = \\beta\\gamma\\,c\\tau = \\frac{p\\,\\tau}{m}',
    domain: 'p ≥ 0; m > 0 (a particle with a rest frame); τ ≥ 0. NaN and ±Infinity are refused.',
    example: 'decayLength(1 GeV, m_mu, 2.1969811 us)',
    exampleResult: '6233.7 m (a muon of 1 GeV/c)',
    source:
      'Particle Data Group, Review of Particle Physics (2024), review "Kinematics" and the particle listings (cτ); βγ = p/(mc).',
    numerics: 'pτ is an exact (Dekker) product; one double-double division, rounded once.',
  },
  kernel: (p: number, m: number, tau: number): number => {
    requireNonNegative(FN, 'p', p, 'kg m/s', 'a momentum magnitude');
    requirePositive(FN, 'm', m, 'kg', 'a particle that decays has a rest frame');
    requireNonNegative(FN, 'tau', tau, 's', 'a mean life');
    return finiteResult(FN, round(div(twoProd(p, tau), dd(m))));
  },
};
