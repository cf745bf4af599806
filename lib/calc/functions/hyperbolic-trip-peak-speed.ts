import { distanceMotion, half, speedAfter } from './support/hyperbolic-from-distance';
import { speedValue } from './support/kinematics';
import type { CalcFunction, KernelArgument, PreciseSpeed } from './types';

const FN = 'hyperbolicTripPeakSpeed';

function precise(a0Arg: KernelArgument, dArg: KernelArgument): PreciseSpeed | number {
  const motion = distanceMotion(FN, a0Arg as number, dArg as number);
  return speedAfter(distanceMotion(FN, a0Arg as number, half(motion.d)));
}

/**
 * hyperbolicTripPeakSpeed(a0, d) — the highest speed of a trip over the lab distance d from rest to
 * rest, accelerating at a0 over the first half and braking at a0 over the second: the speed at the
 * midpoint.
 *
 * Formula: γ_m = 1 + a0 (d/2)/c², β_m = √(x(2 + x))/(1 + x), x = γ_m − 1; √(a0 d) at low speed.
 *
 * Domain: a0 finite (its sign is the direction of motion and of the speed returned; 0 only with
 * d = 0); d ≥ 0; NaN and ±Infinity are refused. When the speed rounds to c the largest double below
 * 1 is returned. The result keeps its precise companion, so lorentzFactor of it gives γ_m exactly.
 *
 * Example: `hyperbolicTripPeakSpeed(0.8 mm/s^2, 3 au) to km/s` → 18.948 km/s (an ion-engine probe
 * at 0.8 mm/s² to a target 3 au away, at the midpoint where it turns to brake).
 *
 * Source: W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3
 * (hyperbolic motion); P. Gibbs and D. Koks, "The Relativistic Rocket", Usenet Physics FAQ (the
 * accelerate-then-decelerate trip).
 *
 * Numerics: hyperbolicSpeedFromDistance(a0, d/2): β and 1/γ in double-double from x = a0 d/(2c²),
 * without cancellation at small x or overflow at large x; rounded once.
 */
export const hyperbolicTripPeakSpeed: CalcFunction = {
  name: FN,
  params: [
    {
      name: 'a0',
      kind: 'acceleration',
      description:
        'proper acceleration of the first half, and braking of the second (its sign is the direction of motion)',
    },
    { name: 'd', kind: 'length', description: 'coordinate (lab) distance of the whole trip, rest to rest' },
  ],
  returns: 'speed',
  doc: {
    summary:
      'Highest speed (at the midpoint) of a trip over the lab distance d from rest to rest, accelerating at a0 for the first half and braking at a0 for the second.',
    formula: '\\beta_m = \\frac{\\sqrt{x(2+x)}}{1+x},\\quad x = \\gamma_m - 1 = \\frac{a_0 d}{2c^2}',
    domain:
      'a0 finite, either sign (the direction of motion and of the speed returned; 0 only with d = 0); d ≥ 0. NaN and ±Infinity are refused. When the speed rounds to c the largest double below 1 is returned.',
    example: 'hyperbolicTripPeakSpeed(0.8 mm/s^2, 3 au) to km/s',
    exampleResult:
      '18.948 km/s (an ion-engine probe at 0.8 mm/s² to a target 3 au away, at the midpoint where it turns to brake)',
    source:
      'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 (hyperbolic motion); P. Gibbs and D. Koks, "The Relativistic Rocket", Usenet Physics FAQ (the accelerate-then-decelerate trip).',
    numerics:
      'The speed after d/2 from rest: β = √(x(2 + x))/(1 + x) and 1/γ = 1/(1 + x), x = a0 d/(2c²) from the exact product, in double-double without cancellation at small x or overflow at large x; rounded once. The precise companion makes lorentzFactor of the result exact.',
  },
  kernel: (a0: KernelArgument, d: KernelArgument): number => speedValue(precise(a0, d)),
  preciseKernel: precise,
};
