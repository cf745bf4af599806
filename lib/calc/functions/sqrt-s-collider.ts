import { finiteResult, requireNonNegative, ROUNDING_ALLOWANCE } from './support/domain';
import { add, type DD, dd, div, mul, round, sqrt, sub } from './support/double-double';
import { restEnergy } from './support/kinematics';
import { type CalcFunction, DomainError } from './types';

const FN = 'sqrtSCollider';

/** σ = E + pc and ε = E − pc = (mc²)²/σ of one beam, both without cancellation. */
function lightCone(name: string, E: number, m: number): [sigma: DD, epsilon: DD] {
  const M = restEnergy(m);
  let excess = sub(dd(E), M);
  if (excess[0] < 0) {
    if (-excess[0] > ROUNDING_ALLOWANCE * E) {
      throw new DomainError(
        `${FN}: the total energy ${name} must be at least the rest energy mc² (${round(M)} J); got ${name} = ${E} J`,
      );
    }
    // A beam at rest entered as m·c² may round an ulp below the exact product: read it as at rest.
    excess = [0, 0];
  }
  const pc = mul(sqrt(excess), sqrt(add(dd(E), M)));
  const sigma = add(dd(E), pc);
  const epsilon: DD = M[0] === 0 ? [0, 0] : mul(M, div(M, sigma));
  return [sigma, epsilon];
}

/**
 * sqrtSCollider(E1, E2, m1, m2) — the centre-of-mass energy √s of two beams colliding head-on, of
 * total energies E1 and E2 and particle masses m1 and m2. With m1 = m2 = 0 it is the
 * ultra-relativistic 2√(E1E2); the masses make it exact at any energy (E1 = m1c², E2 = m2c² gives
 * m1c² + m2c²).
 *
 * Formula: s = (E1 + E2)² − (p1c − p2c)², evaluated as s = (ε1 + σ2)(σ1 + ε2) with σi = Ei + pic and
 * εi = Ei − pic = (mic²)²/σi.
 *
 * Domain: Ei ≥ mic² (total energies, rest energy included; a shortfall below 2^-50·Ei, rounding in
 * the inputs, is read as a beam at rest), mi ≥ 0; NaN and ±Infinity are refused.
 *
 * Example: `sqrtSCollider(6.8 TeV, 6.8 TeV, m_p, m_p) to TeV` → 13.6 TeV (LHC Run 3).
 *
 * Source: Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (s for colliding
 * beams, s ≈ 4E1E2 for E ≫ mc²).
 *
 * Numerics: the light-cone form (ε1 + σ2)(σ1 + ε2) is an exact rearrangement with no subtraction,
 * where (E1 + E2)² − (p1c − p2c)² cancels almost completely for equal beams; double-double, the
 * product taken as √·√ to stay in range, rounded once.
 */
export const sqrtSCollider: CalcFunction = {
  name: FN,
  params: [
    { name: 'E1', kind: 'energy', description: 'total energy of a particle of beam 1 (rest energy included)' },
    { name: 'E2', kind: 'energy', description: 'total energy of a particle of beam 2, moving against beam 1' },
    {
      name: 'm1',
      kind: 'mass',
      description: 'rest mass of the beam-1 particle (a mass, or mc²); 0 for the ultra-relativistic limit',
    },
    {
      name: 'm2',
      kind: 'mass',
      description: 'rest mass of the beam-2 particle (a mass, or mc²); 0 for the ultra-relativistic limit',
    },
  ],
  returns: 'energy',
  doc: {
    summary:
      'Centre-of-mass energy √s of two head-on beams of total energies E1, E2 and masses m1, m2 (masses 0: 2√(E1E2)).',
    formula:
      '\\sqrt{s} = \\sqrt{(\\varepsilon_1 + \\sigma_2)(\\sigma_1 + \\varepsilon_2)},\\ \\sigma_i = E_i + p_ic,\\ \\varepsilon_i = \\frac{(m_ic^2)^2}{\\sigma_i} \\quad\\left(s = (E_1+E_2)^2 - (p_1c - p_2c)^2 \\approx 4E_1E_2\\right)',
    domain:
      'Ei ≥ mi c² (total energies, rest energy included; a shortfall below 2^-50·Ei, about four ulp of rounding in the inputs, is read as a beam at rest); mi ≥ 0 (0 gives the ultra-relativistic 2√(E1E2)). NaN and ±Infinity are refused.',
    example: 'sqrtSCollider(6.8 TeV, 6.8 TeV, m_p, m_p) to TeV',
    exampleResult: '13.6 TeV',
    source:
      'Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (colliding beams: s = (E1 + E2)² − (p1 − p2)²c², ≈ 4E1E2).',
    numerics:
      'With σ = E + pc and ε = E − pc = (mc²)²/σ the invariant is s = (ε1 + σ2)(σ1 + ε2): no subtraction anywhere, where the textbook (E1 + E2)² − (p1c − p2c)² cancels almost completely for two equal beams. Double-double, √·√ to stay in range, rounded once (within about half an ulp).',
  },
  kernel: (E1: number, E2: number, m1: number, m2: number): number => {
    requireNonNegative(FN, 'E1', E1, 'J', 'a total energy');
    requireNonNegative(FN, 'E2', E2, 'J', 'a total energy');
    requireNonNegative(FN, 'm1', m1, 'kg', 'a rest mass');
    requireNonNegative(FN, 'm2', m2, 'kg', 'a rest mass');
    const [sigma1, epsilon1] = lightCone('E1', E1, m1);
    const [sigma2, epsilon2] = lightCone('E2', E2, m2);
    return finiteResult(FN, round(mul(sqrt(add(epsilon1, sigma2)), sqrt(add(sigma1, epsilon2)))));
  },
};
