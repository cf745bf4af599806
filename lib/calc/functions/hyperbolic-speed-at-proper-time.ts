import { properTimeMotion, speedAtProperTime } from './support/hyperbolic-at-proper-time';
import { speedValue } from './support/kinematics';
import type { CalcFunction, KernelArgument, PreciseSpeed } from './types';

const FN = 'hyperbolicSpeedAtProperTime';

function precise(a0: KernelArgument, tau: KernelArgument): PreciseSpeed | number {
  return speedAtProperTime(properTimeMotion(FN, a0 as number, tau as number));
}

/**
 * hyperbolicSpeedAtProperTime(a0, tau) — the speed of a body that starts from rest and keeps a
 * constant proper acceleration a0, when its own clock shows the proper time τ since the start.
 *
 * Formula: β = tanh(a0τ/c) (the rapidity grows as a0τ/c).
 *
 * Domain: a0 finite (its sign is the direction of the motion and of the speed returned), τ ≥ 0; NaN
 * and ±Infinity are refused. When the speed rounds to c (a0τ/c above about 19) the largest double
 * below 1 is returned; above a0τ/c = 690 (γ above 1e299) without its precise companion.
 *
 * Example: `hyperbolicSpeedAtProperTime(0.8 mm/s^2, 400 day)` → 27.648 km/s: an ion-engine probe
 * thrusting at 0.8 mm/s² from rest, after 400 days on its own clock (a0τ to about 1e-8).
 *
 * Source: W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3
 * (hyperbolic motion: rapidity a τ/c); C. W. Misner, K. S. Thorne, J. A. Wheeler, Gravitation (1973), §6.2.
 *
 * Numerics: u = a0τ/c from the exact product; β = sinh u/cosh u from the even series of sinh(u)/u and
 * 2(cosh u − 1)/u² in double-double for u ≤ 1, (1 − e^−2u)/(1 + e^−2u) above; 1/γ = 1/cosh u carried
 * as the companion, so lorentzFactor of the result is cosh(a0τ/c) to within an ulp; rounded once.
 */
export const hyperbolicSpeedAtProperTime: CalcFunction = {
  name: FN,
  params: [
    {
      name: 'a0',
      kind: 'acceleration',
      description: 'constant proper acceleration (its sign is the direction of motion)',
    },
    { name: 'tau', kind: 'time', description: 'proper time (the body’s own clock) since the start from rest' },
  ],
  returns: 'speed',
  doc: {
    summary: 'Speed of a body starting from rest with constant proper acceleration a0 when its own clock shows τ.',
    formula: '\\beta = \\tanh\\frac{a_0 \\tau}{c},\\quad \\gamma = \\cosh\\frac{a_0 \\tau}{c}',
    domain:
      'a0 finite, either sign (the direction of motion and of the speed returned); τ ≥ 0. NaN and ±Infinity are refused. When the speed rounds to c (a0τ/c above about 19) the largest double below 1 is returned; above a0τ/c = 690 (γ above 1e299) without its precise companion.',
    example: 'hyperbolicSpeedAtProperTime(0.8 mm/s^2, 400 day) to km/s',
    exampleResult:
      '27.648 km/s (an ion-engine probe thrusting at 0.8 mm/s² from rest, after 400 days on its own clock)',
    source:
      'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 (hyperbolic motion: the rapidity grows as a τ/c); C. W. Misner, K. S. Thorne, J. A. Wheeler, Gravitation (1973), §6.2.',
    numerics:
      'u = a0τ/c from the exact product; for u ≤ 1, sinh u and cosh u from the even series of sinh(u)/u and 2(cosh u − 1)/u² in double-double (nothing cancels, nothing is lost at tiny u), above it (1 − e^−2u)/(1 + e^−2u) and 1/γ = 2e^−u/(1 + e^−2u); rounded once. The precise companion 1/γ = 1/cosh u makes lorentzFactor and gammaMinusOne of the result exact to an ulp.',
  },
  kernel: (a0: KernelArgument, tau: KernelArgument): number => speedValue(precise(a0, tau)),
  preciseKernel: precise,
};
