import { finiteResult } from './support/domain';
import { distanceMotion, half, properTimeAfter, twiceRounded } from './support/hyperbolic-from-distance';
import type { CalcFunction } from './types';

const FN = 'hyperbolicTripProperTime';

/**
 * hyperbolicTripProperTime(a0, d) — the proper time on board for a trip over the lab distance d from
 * rest to rest: constant proper acceleration a0 over the first half, a0 braking over the second.
 *
 * Formula: τ = 2 (c/a0) acosh(γ_m), γ_m = 1 + a0 (d/2)/c² (the γ at the midpoint).
 *
 * Domain: a0 finite (either sign: only |a0| matters; 0 only with d = 0); d ≥ 0; NaN and ±Infinity
 * are refused.
 *
 * Example: `(hyperbolicTripCoordinateTime(0.8 mm/s^2, 3 au) - hyperbolicTripProperTime(0.8 mm/s^2, 3 au)) to ms`
 * → 31.539 ms (how far the on-board clock of an ion-engine probe falls behind over a 3 au trip at
 * 0.8 mm/s², from its motion alone).
 *
 * Source: W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3
 * (hyperbolic motion); P. Gibbs and D. Koks, "The Relativistic Rocket", Usenet Physics FAQ (the
 * accelerate-then-decelerate trip).
 *
 * Numerics: twice hyperbolicProperTimeFromDistance(a0, d/2): acosh(γ_m) as asinh(√(x(2 + x))) in
 * double-double (the textbook acosh loses half the digits of x = γ_m − 1, all below 1e-16); rounded
 * once (the halving and doubling are exact).
 */
export const hyperbolicTripProperTime: CalcFunction = {
  name: FN,
  params: [
    {
      name: 'a0',
      kind: 'acceleration',
      description: 'proper acceleration of the first half, and braking of the second',
    },
    { name: 'd', kind: 'length', description: 'coordinate (lab) distance of the whole trip, rest to rest' },
  ],
  returns: 'time',
  doc: {
    summary:
      'Proper time on board for a trip over the lab distance d from rest to rest, accelerating at a0 for the first half and braking at a0 for the second.',
    formula: '\\tau = 2\\,\\frac{c}{a_0}\\operatorname{arcosh}\\gamma_m,\\quad \\gamma_m = 1 + \\frac{a_0 d}{2c^2}',
    domain: 'a0 finite, either sign (only |a0| matters; 0 only with d = 0); d ≥ 0. NaN and ±Infinity are refused.',
    example: '(hyperbolicTripCoordinateTime(0.8 mm/s^2, 3 au) - hyperbolicTripProperTime(0.8 mm/s^2, 3 au)) to ms',
    exampleResult:
      '31.539 ms (how far the on-board clock of an ion-engine probe falls behind over a 3 au trip at 0.8 mm/s², from its motion alone)',
    source:
      'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 (hyperbolic motion); P. Gibbs and D. Koks, "The Relativistic Rocket", Usenet Physics FAQ (the accelerate-then-decelerate trip).',
    numerics:
      'Twice the proper time to cover d/2 from rest: acosh(γ_m) as asinh(√(x(2 + x))), x = γ_m − 1 = a0 d/(2c²) from the exact product, in double-double (the textbook acosh loses half the digits of x, all below 1e-16); rounded once (halving and doubling are exact).',
  },
  kernel: (a0: number, d: number): number => {
    const motion = distanceMotion(FN, a0, d);
    return finiteResult(FN, twiceRounded(properTimeAfter(distanceMotion(FN, a0, half(motion.d)))));
  },
};
