import { finiteResult, requireNonNegative } from './support/domain';
import { dd, round } from './support/double-double';
import { momentumFromKineticDD } from './support/kinematics';
import type { CalcFunction } from './types';

const FN = 'momentumFromKinetic';

/**
 * momentumFromKinetic(T, m) — the momentum of a body of mass m with kinetic energy T.
 *
 * Formula: p = √T · √(T + 2mc²) / c; textbook p = √(T(T + 2mc²))/c = √(E² − m²c⁴)/c.
 *
 * Domain: T ≥ 0, m ≥ 0 (m = 0: a massless particle, p = T/c); NaN and ±Infinity are refused.
 *
 * Example: `p = momentumFromKinetic(250 MeV, m_p)` → 3.8967e-19 kg m/s (729.13 MeV/c).
 *
 * Source: Particle Data Group, Review of Particle Physics (2024), review "Kinematics"
 * (E² = p²c² + m²c⁴, E = T + mc²).
 *
 * Numerics: the product form avoids E² − m²c⁴, which cancels at small T; the two square roots keep
 * every intermediate within the double range; double-double throughout, rounded once.
 */
export const momentumFromKinetic: CalcFunction = {
  name: FN,
  params: [
    { name: 'T', kind: 'energy', description: 'kinetic energy of the body' },
    { name: 'm', kind: 'mass', description: 'rest mass (a mass, or the rest energy mc²); 0 for a massless particle' },
  ],
  returns: 'momentum',
  doc: {
    summary: 'Momentum of a body of mass m with kinetic energy T.',
    formula:
      'p = \\frac{\\sqrt{T}\\,\\sqrt{T + 2mc^2}}{c} \\quad\\left(= \\frac{\\sqrt{E^2 - m^2c^4}}{c},\\ E = T + mc^2\\right)',
    domain: 'T ≥ 0 and m ≥ 0 (m = 0 is a massless particle: p = T/c). NaN and ±Infinity are refused.',
    example: 'p = momentumFromKinetic(250 MeV, m_p)',
    exampleResult: '3.8967e-19 kg m/s (729.13 MeV/c)',
    source:
      'Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (E² = p²c² + m²c⁴, E = T + mc²).',
    numerics:
      'The product T(T + 2mc²) replaces E² − m²c⁴, which cancels at small T; taking √T·√(T + 2mc²) keeps every intermediate inside the double range. Double-double throughout (mc² with c² exact), rounded once: within about half an ulp.',
  },
  kernel: (T: number, m: number): number => {
    requireNonNegative(FN, 'T', T, 'J', 'a kinetic energy');
    requireNonNegative(FN, 'm', m, 'kg', 'a rest mass');
    return finiteResult(FN, round(momentumFromKineticDD(dd(T), m)));
  },
};
