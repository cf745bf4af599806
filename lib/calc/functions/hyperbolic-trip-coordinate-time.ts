import { finiteResult } from './support/domain';
import { coordinateTimeAfter, distanceMotion, half, twiceRounded } from './support/hyperbolic-from-distance';
import type { CalcFunction } from './types';

const FN = 'hyperbolicTripCoordinateTime';

/**
 * hyperbolicTripCoordinateTime(a0, d) — the coordinate (lab) time of a trip over the lab distance d
 * from rest to rest: constant proper acceleration a0 over the first half, a0 braking over the second.
 *
 * Formula: t = 2 (c/a0) √(γ_m² − 1), γ_m = 1 + a0 (d/2)/c² (the γ at the midpoint, where the
 * thrust reverses); 2√(d/a0) at small d.
 *
 * Domain: a0 finite (either sign: only |a0| matters; 0 only with d = 0); d ≥ 0; NaN and ±Infinity
 * are refused.
 *
 * Example: `hyperbolicTripCoordinateTime(0.8 mm/s^2, 3 au) to day` → 548.27 day (an ion-engine probe
 * thrusting at 0.8 mm/s² towards a target 3 au away and braking from the midpoint).
 *
 * Source: W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3
 * (hyperbolic motion); P. Gibbs and D. Koks, "The Relativistic Rocket", Usenet Physics FAQ (the
 * accelerate-then-decelerate trip).
 *
 * Numerics: twice hyperbolicCoordinateTimeFromDistance(a0, d/2): γ_m² − 1 = x(2 + x) with
 * x = a0 d/(2c²) from the exact product, no cancellation at small x, no overflow at large x;
 * double-double, rounded once (the halving and doubling are exact).
 */
export const hyperbolicTripCoordinateTime: CalcFunction = {
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
      'Coordinate (lab) time of a trip over the lab distance d from rest to rest, accelerating at a0 for the first half and braking at a0 for the second.',
    formula: 't = 2\\,\\frac{c}{a_0}\\sqrt{\\gamma_m^2 - 1},\\quad \\gamma_m = 1 + \\frac{a_0 d}{2c^2}',
    domain: 'a0 finite, either sign (only |a0| matters; 0 only with d = 0); d ≥ 0. NaN and ±Infinity are refused.',
    example: 'hyperbolicTripCoordinateTime(0.8 mm/s^2, 3 au) to day',
    exampleResult: '548.27 day (an ion-engine probe at 0.8 mm/s² to a target 3 au away, braking from the midpoint)',
    source:
      'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 (hyperbolic motion); P. Gibbs and D. Koks, "The Relativistic Rocket", Usenet Physics FAQ (the accelerate-then-decelerate trip).',
    numerics:
      'Twice the coordinate time to cover d/2 from rest: γ_m² − 1 = x(2 + x), x = a0 d/(2c²) from the exact product, without cancellation at small x or overflow at large x; double-double, rounded once (halving and doubling are exact).',
  },
  kernel: (a0: number, d: number): number => {
    const motion = distanceMotion(FN, a0, d);
    return finiteResult(FN, twiceRounded(coordinateTimeAfter(distanceMotion(FN, a0, half(motion.d)))));
  },
};
