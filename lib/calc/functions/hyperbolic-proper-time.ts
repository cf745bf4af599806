import { C } from '../constants';
import { finiteResult, requireFinite, requireNonNegative } from './support/domain';
import { div, dd, mul, round } from './support/double-double';
import { asinh } from './support/elementary';
import { C_DD, hyperbolicParameter } from './support/kinematics';
import type { CalcFunction } from './types';

const FN = 'hyperbolicProperTime';

/**
 * hyperbolicProperTime(a0, t) — the proper time shown, at coordinate time t, by the clock of a body
 * that starts from rest and keeps a constant proper acceleration a0.
 *
 * Formula: τ = (c/a0) asinh(a0 t/c), evaluated as t·asinh(w)/w for |w| ≤ 1 (w = a0t/c); τ = t at a0 = 0.
 *
 * Domain: a0 finite (either sign; τ depends on |a0|), t ≥ 0; NaN and ±Infinity are refused.
 *
 * Example: `(400 day - hyperbolicProperTime(0.8 mm/s^2, 400 day)) to ms` → 48.990 ms (how far the
 * clock of an ion-engine probe thrusting at 0.8 mm/s² for 400 days falls behind, from its motion alone).
 *
 * Source: W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3;
 * Misner, Thorne, Wheeler, Gravitation (1973), §6.2.
 *
 * Numerics: asinh in double-double (series near 0, logarithm by a Newton step otherwise); the form
 * t·asinh(w)/w avoids the division by a small a0 and gives exactly t at a0 = 0; rounded once.
 */
export const hyperbolicProperTime: CalcFunction = {
  name: FN,
  params: [
    { name: 'a0', kind: 'acceleration', description: 'constant proper acceleration' },
    { name: 't', kind: 'time', description: 'coordinate (lab) time since the start from rest' },
  ],
  returns: 'time',
  doc: {
    summary:
      'Proper time elapsed by coordinate time t on a body starting from rest with constant proper acceleration a0.',
    formula:
      '\\tau = \\frac{c}{a_0}\\operatorname{asinh}\\frac{a_0 t}{c} = t\\,\\frac{\\operatorname{asinh} w}{w},\\ w = \\frac{a_0 t}{c}',
    domain: 'a0 finite, either sign (τ depends on |a0|; a0 = 0 gives τ = t); t ≥ 0. NaN and ±Infinity are refused.',
    example: '(400 day - hyperbolicProperTime(0.8 mm/s^2, 400 day)) to ms',
    exampleResult:
      '48.990 ms (how far the clock of an ion-engine probe thrusting at 0.8 mm/s² for 400 days falls behind, from its motion alone)',
    source:
      'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 (hyperbolic motion); C. W. Misner, K. S. Thorne, J. A. Wheeler, Gravitation (1973), §6.2.',
    numerics:
      'asinh is evaluated in double-double (odd series below 0.01, otherwise ln(w + √(1 + w²)) by a Newton step on a double-double exponential). For |w| ≤ 1 the form t·asinh(w)/w is used, which needs no division by a small a0 and tends to t; above, (c/a0)·asinh(w). Rounded once (within about half an ulp).',
  },
  kernel: (a0: number, t: number): number => {
    requireFinite(FN, 'a0', a0);
    requireNonNegative(FN, 't', t, 's', 'time since the start from rest');
    if (a0 === 0 || t === 0) return t;
    if (Math.abs(a0 * t) > 1e290) {
      // Beyond the range of the exact products; asinh(w) = ln(2|w|) to far better than an ulp here.
      return finiteResult(FN, (C / Math.abs(a0)) * (Math.log((2 * Math.abs(a0)) / C) + Math.log(t)));
    }
    const w = hyperbolicParameter(a0, t);
    const ratio = Math.abs(w[0]) <= 1 ? div(mul(dd(t), asinh(w)), w) : div(mul(C_DD, asinh(w)), dd(a0));
    return finiteResult(FN, round(ratio));
  },
};
