import { finiteResult } from './support/domain';
import { round } from './support/double-double';
import { distanceAtProperTime, properTimeMotion } from './support/hyperbolic-at-proper-time';
import type { CalcFunction } from './types';

const FN = 'hyperbolicDistanceAtProperTime';

/**
 * hyperbolicDistanceAtProperTime(a0, tau) — the coordinate (lab) distance covered when the clock of a
 * body that started from rest with constant proper acceleration a0 shows τ; ½a0τ² at small τ.
 *
 * Formula: x = (c²/a0)(cosh(a0τ/c) − 1) = 2(c²/a0) sinh²(a0τ/2c); evaluated as ½a0τ²·2(cosh u − 1)/u²,
 * u = a0τ/c.
 *
 * Domain: a0 finite (a negative a0 gives a displacement in the negative direction; a0 = 0 gives 0),
 * τ ≥ 0; NaN and ±Infinity are refused; a distance beyond the double range (u above about 660 to
 * 720, depending on a0) is refused.
 *
 * Example: `hyperbolicDistanceAtProperTime(0.8 mm/s^2, 400 day) to au` → 3.1936 au (an ion-engine
 * probe thrusting at 0.8 mm/s² from rest, 400 days on its own clock).
 *
 * Source: W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3;
 * Misner, Thorne, Wheeler, Gravitation (1973), §6.2.
 *
 * Numerics: the textbook cosh u − 1 keeps nothing at u = 1e-9; 2(cosh u − 1)/u² by its even series in
 * double-double for u ≤ 1 (tends to 1; no division by a small a0), (e^u − 1)²/(2e^u) above,
 * e^(u + ln(c²/2a0)) above u = 700 so nothing overflows before the result; rounded once.
 */
export const hyperbolicDistanceAtProperTime: CalcFunction = {
  name: FN,
  params: [
    {
      name: 'a0',
      kind: 'acceleration',
      description: 'constant proper acceleration (its sign is the direction of motion)',
    },
    { name: 'tau', kind: 'time', description: 'proper time (the body’s own clock) since the start from rest' },
  ],
  returns: 'length',
  doc: {
    summary:
      'Lab distance covered when the clock of a body starting from rest with constant proper acceleration a0 shows τ.',
    formula:
      'x = \\frac{c^2}{a_0}\\Big(\\cosh\\frac{a_0\\tau}{c} - 1\\Big) = \\frac{2c^2}{a_0}\\sinh^2\\frac{a_0\\tau}{2c}',
    domain:
      'a0 finite, either sign (negative: displacement in the negative direction; 0: no motion); τ ≥ 0. NaN and ±Infinity are refused, as is a distance beyond the double range (a0τ/c above about 660 to 720, depending on a0).',
    example: 'hyperbolicDistanceAtProperTime(0.8 mm/s^2, 400 day) to au',
    exampleResult: '3.1936 au (an ion-engine probe thrusting at 0.8 mm/s² from rest, 400 days on its own clock)',
    source:
      'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 (hyperbolic motion); C. W. Misner, K. S. Thorne, J. A. Wheeler, Gravitation (1973), §6.2.',
    numerics:
      'The textbook cosh u − 1 (u = a0τ/c) keeps nothing at u = 1e-9. Here ½a0τ²·2(cosh u − 1)/u² with the second factor summed as its even series in double-double for u ≤ 1 (tends to ½a0τ², no division by a small a0), cτ(e^u − 1)²/(2e^u u) above, e^(u + ln(c²/2a0)) above u = 700 so that nothing overflows before the result does; rounded once.',
  },
  kernel: (a0: number, tau: number): number => {
    const m = properTimeMotion(FN, a0, tau);
    return finiteResult(FN, m.sign * round(distanceAtProperTime(m)));
  },
};
