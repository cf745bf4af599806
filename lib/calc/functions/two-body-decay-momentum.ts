import { finiteResult, requireNonNegative, requirePositive } from './support/domain';
import { add, dd, div, mul, mulNum, round, sqrt, sub } from './support/double-double';
import { C_DD } from './support/kinematics';
import { type CalcFunction, DomainError } from './types';

const FN = 'twoBodyDecayMomentum';

/**
 * twoBodyDecayMomentum(M, m1, m2) — the momentum p* of each product in the rest frame of a particle
 * of mass M decaying into two particles of masses m1 and m2 (or, with M = √s, of a two-body final
 * state).
 *
 * Formula: p* = c √((M² − (m1 + m2)²)(M² − (m1 − m2)²)) / (2M)
 *             = (c/(2M)) √((M − m1 − m2)(M + m1 + m2)(M − m1 + m2)(M + m1 − m2)).
 *
 * Domain: M > 0; m1, m2 ≥ 0 (masses, or rest energies); M ≥ m1 + m2 (the decay is allowed); NaN and
 * ±Infinity are refused.
 *
 * Example: `twoBodyDecayMomentum(139.57039 MeV, 105.6583755 MeV, 0 MeV) to MeV/c` → 29.792 MeV/c (π⁺ → μ⁺ν_μ).
 *
 * Source: PDG Review of Particle Physics, "Kinematics", §49.4.2 (two-body decays); the π⁺ → μ⁺ν
 * momentum 29.79 MeV/c in the PDG listings.
 *
 * Numerics: the four factors in double-double (M − m1 − m2 without cancellation near threshold),
 * their product's root and the division by 2M in double-double; rounded once.
 */
export const twoBodyDecayMomentum: CalcFunction = {
  name: FN,
  params: [
    { name: 'M', kind: 'mass', description: 'mass of the decaying particle (or √s of the initial state)' },
    { name: 'm1', kind: 'mass', description: 'mass of the first product' },
    { name: 'm2', kind: 'mass', description: 'mass of the second product' },
  ],
  returns: 'momentum',
  doc: {
    summary: 'Momentum p* of each product of a two-body decay M → m1 + m2, in the rest frame of M.',
    formula: 'p^{*} = \\frac{c\\,\\sqrt{\\left(M^2 - (m_1 + m_2)^2\\right)\\left(M^2 - (m_1 - m_2)^2\\right)}}{2M}',
    domain:
      'M > 0; m1, m2 ≥ 0 (masses, or rest energies); M ≥ m1 + m2. NaN and ±Infinity are refused; a result beyond the double range is refused.',
    example: 'twoBodyDecayMomentum(139.57039 MeV, 105.6583755 MeV, 0 MeV) to MeV/c',
    exampleResult: '29.792 MeV/c (π⁺ → μ⁺ν_μ)',
    source: 'PDG Review of Particle Physics, "Kinematics", §49.4.2 (two-body decays).',
    numerics:
      'The four factors (M ∓ m1 ∓ m2) in double-double, so a decay just above threshold keeps its digits; product, root and the division by 2M in double-double; rounded once.',
  },
  kernel: (M: number, m1: number, m2: number): number => {
    requirePositive(FN, 'M', M, 'kg', 'the mass of the decaying particle');
    requireNonNegative(FN, 'm1', m1, 'kg', 'a mass');
    requireNonNegative(FN, 'm2', m2, 'kg', 'a mass');
    const sum = add(dd(m1), dd(m2));
    const difference = sub(dd(m1), dd(m2));
    const below = sub(dd(M), sum);
    if (below[0] < 0)
      throw new DomainError(`${FN}: the decay is not allowed: M = ${M} kg is below m1 + m2 = ${m1 + m2} kg`);
    const product = mul(mul(below, add(dd(M), sum)), mul(sub(dd(M), difference), add(dd(M), difference)));
    const p = div(mul(sqrt(product), C_DD), mulNum(dd(M), 2));
    return finiteResult(FN, round(p));
  },
};
