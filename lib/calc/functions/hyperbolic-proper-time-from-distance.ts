import { finiteResult } from './support/domain';
import { round } from './support/double-double';
import { distanceMotion, properTimeAfter } from './support/hyperbolic-from-distance';
import type { CalcFunction } from './types';

const FN = 'hyperbolicProperTimeFromDistance';

/**
 * hyperbolicProperTimeFromDistance(a0, d) — the proper time shown by the clock of a body that starts
 * from rest with constant proper acceleration a0 when it has covered the lab distance d.
 *
 * Formula: τ = (c/a0) acosh(1 + a0 d/c²) = (c/a0) asinh(w), w = √(x(2 + x)) = βγ, x = a0 d/c²;
 * evaluated as t·asinh(w)/w for w ≤ 1 (t the coordinate time) and (c/a0) ln(1 + x + w) above.
 *
 * Domain: a0 finite (either sign; τ depends on |a0|; a0 = 0 only with d = 0); d ≥ 0; NaN and
 * ±Infinity are refused.
 *
 * Example: `hyperbolicProperTimeFromDistance(q_e * 1 MV/m / m_e, 60 mm) to ns` → 0.81812 ns
 * (the electron's own time across a 60 mm gap at 1 MV/m; 0.84990 ns pass in the lab).
 *
 * Source: W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3
 * (hyperbolic motion); C. W. Misner, K. S. Thorne, J. A. Wheeler, Gravitation (1973), §6.2.
 *
 * Numerics: acosh(γ) at γ = 1 + x loses half the digits of x in the textbook form (and all of them
 * below x ≈ 1e-16); asinh(w) with w = √(x(2 + x)) in double-double keeps them, and t·asinh(w)/w
 * tends to t without dividing by a small a0; rounded once.
 */
export const hyperbolicProperTimeFromDistance: CalcFunction = {
  name: FN,
  params: [
    { name: 'a0', kind: 'acceleration', description: 'constant proper acceleration' },
    { name: 'd', kind: 'length', description: 'coordinate (lab) distance covered from rest' },
  ],
  returns: 'time',
  doc: {
    summary:
      'Proper time elapsed on a body starting from rest with constant proper acceleration a0 by the time it has covered the lab distance d.',
    formula:
      '\\tau = \\frac{c}{a_0}\\operatorname{arcosh}\\!\\Big(1 + \\frac{a_0 d}{c^2}\\Big) = \\frac{c}{a_0}\\operatorname{arsinh} w,\\ w = \\sqrt{x(2+x)},\\ x = \\frac{a_0 d}{c^2}',
    domain: 'a0 finite, either sign (τ depends on |a0|; 0 only with d = 0); d ≥ 0. NaN and ±Infinity are refused.',
    example: 'hyperbolicProperTimeFromDistance(q_e * 1 MV/m / m_e, 60 mm) to ns',
    exampleResult: '0.81812 ns (the electron’s own time across a 60 mm gap at 1 MV/m; 0.84990 ns pass in the lab)',
    source:
      'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 (hyperbolic motion); C. W. Misner, K. S. Thorne, J. A. Wheeler, Gravitation (1973), §6.2.',
    numerics:
      'The textbook acosh(1 + x) loses half the digits of x (all below x ≈ 1e-16); asinh(w), w = √(x(2 + x)), in double-double keeps them. t·asinh(w)/w for w ≤ 1 tends to t with no division by a small a0; (c/a0) ln(1 + x + w) above; rounded once.',
  },
  kernel: (a0: number, d: number): number => finiteResult(FN, round(properTimeAfter(distanceMotion(FN, a0, d)))),
};
