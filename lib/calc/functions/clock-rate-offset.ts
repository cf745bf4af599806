import { add, div, mul, neg, round } from './support/double-double';
import { massiveSpeed, ONE } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

/**
 * clockRateOffset(v) — the fractional rate offset 1/γ − 1 of a clock moving at v, as seen from the
 * frame in which it moves (negative: the moving clock runs slow). It is the velocity term of a
 * satellite clock's relativistic correction; the gravitational term is added separately.
 *
 * Formula: 1/γ − 1 = −β²/(1 + √((1 − β)(1 + β))) ≈ −β²/2 at low speed.
 *
 * Domain: |β| < 1; NaN and ±Infinity are refused.
 *
 * Example: `clockRateOffset(3874 m/s)` (a GPS satellite) → −8.3493e-11.
 *
 * Source: IS-GPS-200, §3.3.1.1; N. Ashby, "Relativity in the Global Positioning
 * System", Living Reviews in Relativity 6 (2003) 1.
 *
 * Numerics: √(1 − β²) − 1 cancels completely at satellite speeds; −β²/(1 + s) does not; evaluated in
 * double-double with 1 − β² exact, rounded once.
 */
export const clockRateOffset: CalcFunction = {
  name: 'clockRateOffset',
  params: [{ name: 'v', kind: 'speed', description: 'speed of the clock (a velocity, or β)' }],
  returns: 'number',
  doc: {
    summary: 'Fractional rate offset 1/γ − 1 of a clock moving at v (negative: it runs slow); accurate at tiny speeds.',
    formula:
      '\\frac{1}{\\gamma} - 1 = -\\frac{\\beta^2}{1 + \\sqrt{(1-\\beta)(1+\\beta)}} \\quad\\left(\\approx -\\tfrac{1}{2}\\beta^2\\right)',
    domain: '|β| < 1 (a massive clock). NaN and ±Infinity are refused.',
    example: 'clockRateOffset(3874 m/s)',
    exampleResult: '-8.3493e-11 (the velocity term of a GPS satellite clock)',
    source:
      'IS-GPS-200 (Navstar GPS space segment / navigation user interfaces), §3.3.1.1; N. Ashby, "Relativity in the Global Positioning System", Living Reviews in Relativity 6 (2003) 1.',
    numerics:
      '√(1 − β²) − 1 loses every digit at satellite speeds (β ≈ 1e-5 leaves about 6 correct digits, β = 1e-12 none). −β²/(1 + s) has no subtraction; it is evaluated in double-double with 1 − β² exact and rounded once (within about half an ulp).',
  },
  kernel: (v: KernelArgument): number => {
    const speed = massiveSpeed('clockRateOffset', 'v', v);
    return round(neg(div(mul(speed.beta, speed.beta), add(ONE, speed.inverseGamma))));
  },
};
