import { round } from './support/double-double';
import { gammaMinusOneOf, massiveSpeed } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

/**
 * gammaMinusOne(v) — γ − 1, with full relative accuracy also for tiny speeds (at β = 1e-12 it is
 * 5e-25, where lorentzFactor(v) − 1 gives 0).
 *
 * Formula: γ − 1 = β² / (s(1 + s)) with s = √((1 − β)(1 + β)) = 1/γ.
 *
 * Domain: |β| < 1; NaN and ±Infinity are refused.
 *
 * Example: `gammaMinusOne(3874 m/s)` (a GPS satellite's orbital speed) → 8.3493e-11.
 *
 * Source: algebraic identity γ − 1 = (1 − s)/s = β²/(s(1 + s)); Jackson, Classical Electrodynamics,
 * 3rd ed. (1999), §11.3 for γ.
 *
 * Numerics: the identity removes the subtraction of two nearly equal numbers; evaluated in
 * double-double and rounded once.
 */
export const gammaMinusOne: CalcFunction = {
  name: 'gammaMinusOne',
  params: [{ name: 'v', kind: 'speed', description: 'speed of the body (a velocity, or β = v/c)' }],
  returns: 'number',
  doc: {
    summary: 'γ − 1, accurate to the last digit also at tiny speeds, where γ itself rounds to 1.',
    formula: '\\gamma - 1 = \\frac{\\beta^2}{s\\,(1 + s)},\\quad s = \\sqrt{(1-\\beta)(1+\\beta)} = 1/\\gamma',
    domain: '|β| < 1 (a massive body). NaN and ±Infinity are refused.',
    example: 'gammaMinusOne(3874 m/s)',
    exampleResult: '8.3493e-11 (a GPS satellite in orbit)',
    source:
      'Algebraic identity γ − 1 = (1 − s)/s = β²/(s(1 + s)); γ as in J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.3.',
    numerics:
      'γ − 1 computed as γ minus 1 cancels: at β = 1e-12 every digit is lost. The form β²/(s(1 + s)) has no subtraction; it is evaluated in double-double with 1 − β² formed exactly and rounded once, so it is within about half an ulp from β = 1e-12 up to 1 − β = 1e-16.',
  },
  kernel: (v: KernelArgument): number => round(gammaMinusOneOf(massiveSpeed('gammaMinusOne', 'v', v))),
};
