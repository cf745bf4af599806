import { finiteResult, requireNonNegative, requirePositive } from './support/domain';
import { add, binade, mul, mulNum, round, scale, sqrt } from './support/double-double';
import { restEnergy } from './support/kinematics';
import type { CalcFunction } from './types';

const FN = 'sqrtSFixedTarget';

/**
 * sqrtSFixedTarget(T, mBeam, mTarget) — the centre-of-mass energy √s of a beam particle of kinetic
 * energy T hitting a target particle at rest.
 *
 * Formula: √s = √((m_a c² + m_b c²)² + 2 m_b c² T); equivalently s = m_a²c⁴ + m_b²c⁴ + 2 E_a m_b c²
 * with E_a = T + m_a c².
 *
 * Domain: T ≥ 0, mBeam ≥ 0 (0 for a photon beam), mTarget > 0 (a target at rest has mass); NaN and
 * ±Infinity are refused.
 *
 * Example: `sqrtSFixedTarget(450 GeV, m_p, m_p) to GeV` → 29.1199 GeV (the SPS proton beam on a
 * hydrogen target).
 *
 * Source: Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (s for a
 * fixed target); R. Hagedorn, Relativistic Kinematics (1963), ch. 7.
 *
 * Numerics: written with the kinetic energy, all terms are positive (no cancellation at low T); the
 * operands are scaled by a power of two before squaring so nothing overflows; double-double,
 * rounded once.
 */
export const sqrtSFixedTarget: CalcFunction = {
  name: FN,
  params: [
    { name: 'T', kind: 'energy', description: 'kinetic energy of the beam particle' },
    { name: 'mBeam', kind: 'mass', description: 'rest mass of the beam particle (a mass, or mc²); 0 for a photon' },
    { name: 'mTarget', kind: 'mass', description: 'rest mass of the target particle at rest (a mass, or mc²)' },
  ],
  returns: 'energy',
  doc: {
    summary: 'Centre-of-mass energy √s of a beam of kinetic energy T on a target particle at rest.',
    formula:
      '\\sqrt{s} = \\sqrt{(m_a c^2 + m_b c^2)^2 + 2\\,m_b c^2\\,T} \\quad\\left(s = m_a^2c^4 + m_b^2c^4 + 2E_a m_b c^2\\right)',
    domain:
      'T ≥ 0; mBeam ≥ 0 (0 for a photon beam); mTarget > 0 (a target at rest has mass). NaN and ±Infinity are refused.',
    example: 'sqrtSFixedTarget(450 GeV, m_p, m_p) to GeV',
    exampleResult: '29.1199 GeV',
    source:
      'Particle Data Group, Review of Particle Physics (2024), review "Kinematics"; R. Hagedorn, Relativistic Kinematics (1963), ch. 7.',
    numerics:
      'In terms of the kinetic energy every term is positive, so there is no cancellation at low T; the energies are scaled by a power of two before squaring so no intermediate overflows; double-double, rounded once (within about half an ulp).',
  },
  kernel: (T: number, mBeam: number, mTarget: number): number => {
    requireNonNegative(FN, 'T', T, 'J', 'a kinetic energy');
    requireNonNegative(FN, 'mBeam', mBeam, 'kg', 'a rest mass');
    requirePositive(FN, 'mTarget', mTarget, 'kg', 'a target at rest has mass');
    const Ma = restEnergy(mBeam);
    const Mb = restEnergy(mTarget);
    const sum = add(Ma, Mb);
    const k = binade(Math.max(sum[0], T));
    const sumScaled = scale(sum, 1 / k);
    const s = add(mul(sumScaled, sumScaled), mulNum(scale(Mb, 2 / k), T / k));
    return finiteResult(FN, round(sqrt(s)) * k);
  },
};
