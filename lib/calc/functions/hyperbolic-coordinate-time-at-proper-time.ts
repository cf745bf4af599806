import { finiteResult } from './support/domain';
import { round } from './support/double-double';
import { coordinateTimeAtProperTime, properTimeMotion } from './support/hyperbolic-at-proper-time';
import type { CalcFunction } from './types';

const FN = 'hyperbolicCoordinateTimeAtProperTime';

/**
 * hyperbolicCoordinateTimeAtProperTime(a0, tau) — the coordinate (lab) time that has passed when the
 * clock of a body that started from rest with constant proper acceleration a0 shows τ; the inverse of
 * hyperbolicProperTime.
 *
 * Formula: t = (c/a0) sinh(a0τ/c), evaluated as τ·sinh(u)/u, u = a0τ/c; t = τ at a0 = 0.
 *
 * Domain: a0 finite (either sign; t depends on |a0|), τ ≥ 0; NaN and ±Infinity are refused; a time
 * beyond the double range (u above about 660 to 730, depending on a0) is refused.
 *
 * Example: `(hyperbolicCoordinateTimeAtProperTime(0.8 mm/s^2, 400 day) - 400 day) to ms` → 48.990 ms
 * (how much longer than the 400 days on the clock of an ion-engine probe thrusting at 0.8 mm/s² pass
 * in the lab).
 *
 * Source: W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3;
 * Misner, Thorne, Wheeler, Gravitation (1973), §6.2.
 *
 * Numerics: sinh(u)/u by its even series in double-double for u ≤ 1 (tends to 1, no division by a
 * small a0), e^u above, e^(u + ln(c/2a0)) above u = 700 so nothing overflows before the result; rounded once.
 */
export const hyperbolicCoordinateTimeAtProperTime: CalcFunction = {
  name: FN,
  params: [
    { name: 'a0', kind: 'acceleration', description: 'constant proper acceleration' },
    { name: 'tau', kind: 'time', description: 'proper time (the body’s own clock) since the start from rest' },
  ],
  returns: 'time',
  doc: {
    summary:
      'Coordinate (lab) time passed when the clock of a body starting from rest with constant proper acceleration a0 shows τ (the inverse of hyperbolicProperTime).',
    formula: 't = \\frac{c}{a_0}\\sinh\\frac{a_0 \\tau}{c} = \\tau\\,\\frac{\\sinh u}{u},\\ u = \\frac{a_0 \\tau}{c}',
    domain:
      'a0 finite, either sign (t depends on |a0|; a0 = 0 gives t = τ); τ ≥ 0. NaN and ±Infinity are refused, as is a time beyond the double range (u above about 660 to 730, depending on a0).',
    example: '(hyperbolicCoordinateTimeAtProperTime(0.8 mm/s^2, 400 day) - 400 day) to ms',
    exampleResult:
      '48.990 ms (how much longer than the 400 days on the clock of an ion-engine probe thrusting at 0.8 mm/s² pass in the lab)',
    source:
      'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 (hyperbolic motion); C. W. Misner, K. S. Thorne, J. A. Wheeler, Gravitation (1973), §6.2.',
    numerics:
      'u = a0τ/c from the exact product; τ·sinh(u)/u with sinh(u)/u summed as its even series in double-double for u ≤ 1 (tends to τ, no division by a small a0), (e^u − e^−u)/(2u) above, e^(u + ln(c/2a0)) above u = 700 so that nothing overflows before the result does; rounded once.',
  },
  kernel: (a0: number, tau: number): number =>
    finiteResult(FN, round(coordinateTimeAtProperTime(properTimeMotion(FN, a0, tau)))),
};
