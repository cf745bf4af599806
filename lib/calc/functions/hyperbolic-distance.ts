import { finiteResult, requireFinite, requireNonNegative } from './support/domain';
import { add, div, mul, round, twoProd } from './support/double-double';
import { hypotOne } from './support/elementary';
import { C } from '../constants';
import { hyperbolicParameter, ONE } from './support/kinematics';
import type { CalcFunction } from './types';

const FN = 'hyperbolicDistance';

/**
 * hyperbolicDistance(a0, t) — the distance covered by coordinate time t by a body that starts from
 * rest and keeps a constant proper acceleration a0; ½a0t² at small t, approaching ct at large t.
 *
 * Formula: x = ct · w/(√(1 + w²) + 1), w = a0 t/c; textbook x = (c²/a0)(√(1 + (a0t/c)²) − 1).
 *
 * Domain: a0 finite (a negative a0 gives a displacement in the negative direction; a0 = 0 gives 0),
 * t ≥ 0; NaN and ±Infinity are refused.
 *
 * Example: `hyperbolicDistance(0.8 mm/s^2, 400 day) to au` → 3.1936 au (an ion-engine probe thrusting at
 * 0.8 mm/s² from rest for 400 days; ½at² to about 1e-9).
 *
 * Source: W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3;
 * Misner, Thorne, Wheeler, Gravitation (1973), §6.2.
 *
 * Numerics: √(1 + w²) − 1 = w²/(√(1 + w²) + 1) removes the cancellation at small w (at w = 1e-12 the
 * textbook form gives 0); the factor c²/a0 · w = ct avoids dividing by a0; double-double, rounded once.
 */
export const hyperbolicDistance: CalcFunction = {
  name: FN,
  params: [
    { name: 'a0', kind: 'acceleration', description: 'constant proper acceleration' },
    { name: 't', kind: 'time', description: 'coordinate (lab) time since the start from rest' },
  ],
  returns: 'length',
  doc: {
    summary: 'Distance covered by coordinate time t by a body starting from rest with constant proper acceleration a0.',
    formula:
      'x = ct\\,\\frac{w}{\\sqrt{1+w^2} + 1},\\ w = \\frac{a_0 t}{c} \\quad\\left(= \\frac{c^2}{a_0}\\Big(\\sqrt{1 + (a_0t/c)^2} - 1\\Big)\\right)',
    domain:
      'a0 finite, either sign (negative: displacement in the negative direction; 0: no motion); t ≥ 0. NaN and ±Infinity are refused.',
    example: 'hyperbolicDistance(0.8 mm/s^2, 400 day) to au',
    exampleResult: '3.1936 au (an ion-engine probe thrusting at 0.8 mm/s² from rest for 400 days)',
    source:
      'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 (hyperbolic motion); C. W. Misner, K. S. Thorne, J. A. Wheeler, Gravitation (1973), §6.2.',
    numerics:
      '√(1 + w²) − 1 is rewritten w²/(√(1 + w²) + 1), which does not cancel at small w (the textbook form gives 0 at w = 1e-12, this gives ½a0t²), and c²/a0 · w = ct avoids dividing by a0. Double-double, √(1 + w²) without overflow, rounded once (within about half an ulp).',
  },
  kernel: (a0: number, t: number): number => {
    requireFinite(FN, 'a0', a0);
    requireNonNegative(FN, 't', t, 's', 'time since the start from rest');
    if (Math.abs(a0 * t) > 1e290) {
      // Beyond the range of the exact products; w/(√(1 + w²) + 1) = 1 − 1/|w| + … is 1 to far below an ulp.
      return finiteResult(FN, Math.sign(a0) * round(twoProd(C, t)));
    }
    const w = hyperbolicParameter(a0, t);
    return finiteResult(FN, round(mul(twoProd(C, t), div(w, add(hypotOne(w), ONE)))));
  },
};
