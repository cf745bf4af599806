import { finiteResult, requireNonNegative } from './support/domain';
import { add, dd, div, mul, round, sqrt } from './support/double-double';
import { C_DD, ONE, restEnergy } from './support/kinematics';
import { type CalcFunction, DomainError } from './types';

const FN = 'timeOfFlight';

/**
 * timeOfFlight(L, T, m) — the time a body of mass m and kinetic energy T takes to travel the
 * distance L.
 *
 * Formula: t = L/(βc) = (L/c)·(x + 1)/(√x·√(x + 2)), x = T/(mc²).
 *
 * Domain: L ≥ 0, T ≥ 0, m ≥ 0; m = 0 gives L/c; a body at rest (T = 0, m > 0) never arrives and is
 * refused, as are T = m = 0, negative values, NaN and ±Infinity.
 *
 * Example: `timeOfFlight(10 m, 250 MeV, m_p) to ns` → 54.361 ns.
 *
 * Source: definition t = L/v with β from the kinetic energy (Particle Data Group, Review of Particle
 * Physics (2024), review "Kinematics").
 *
 * Numerics: 1/β = (x + 1)/(√x·√(x + 2)) in double-double: no cancellation at small x, and at large x
 * the small excess 1/β − 1 ≈ 1/(2x²) is kept, where L/(βc) with a rounded β would lose it; rounded
 * once.
 */
export const timeOfFlight: CalcFunction = {
  name: FN,
  params: [
    { name: 'L', kind: 'length', description: 'flight path length' },
    { name: 'T', kind: 'energy', description: 'kinetic energy of the body' },
    { name: 'm', kind: 'mass', description: 'rest mass (a mass, or mc²); 0 for a massless particle' },
  ],
  returns: 'time',
  doc: {
    summary: 'Time taken by a body of mass m and kinetic energy T to travel the distance L.',
    formula: 't = \\frac{L}{\\beta c} = \\frac{L}{c}\\,\\frac{x+1}{\\sqrt{x}\\,\\sqrt{x+2}},\\quad x = \\frac{T}{mc^2}',
    domain:
      'L ≥ 0, T ≥ 0, m ≥ 0; m = 0 gives L/c. A body at rest (T = 0, m > 0) never arrives and is refused, as are T = m = 0, NaN and ±Infinity.',
    example: 'timeOfFlight(10 m, 250 MeV, m_p) to ns',
    exampleResult: '54.361 ns',
    source:
      'Definition t = L/v with β from the kinetic energy: Particle Data Group, Review of Particle Physics (2024), review "Kinematics".',
    numerics:
      '1/β = (x + 1)/(√x·√(x + 2)) in double-double, with x = T/(mc²): no cancellation at low energy, and no loss at high energy, where L/(βc) with a rounded β would keep none of the digits of 1/β − 1; rounded once (within about half an ulp).',
  },
  kernel: (L: number, T: number, m: number): number => {
    requireNonNegative(FN, 'L', L, 'm', 'a path length');
    requireNonNegative(FN, 'T', T, 'J', 'a kinetic energy');
    requireNonNegative(FN, 'm', m, 'kg', 'a rest mass');
    if (T === 0) {
      throw new DomainError(
        m === 0
          ? `${FN}: a massless particle with no energy is undefined; got T = 0 J, m = 0 kg`
          : `${FN}: a body at rest (T = 0) never covers the distance; got T = 0 J`,
      );
    }
    const lightTime = div(dd(L), C_DD);
    if (m === 0) return round(lightTime);
    const x = div(dd(T), restEnergy(m));
    if (!(x[0] < 2 ** 500)) return round(lightTime);
    const inverseBeta = div(add(x, ONE), mul(sqrt(x), sqrt(add(x, dd(2)))));
    return finiteResult(FN, round(mul(lightTime, inverseBeta)));
  },
};
