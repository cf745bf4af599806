import { round } from './support/double-double';
import { massiveSpeed, rapidityOf } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

/**
 * rapidity(v) — the rapidity η = atanh β of a body moving at speed v; rapidities of collinear
 * motions add.
 *
 * Formula: η = atanh β = ½ ln((1 + β)/(1 − β)).
 *
 * Domain: |β| < 1; NaN and ±Infinity are refused.
 *
 * Example: `rapidity(0.6)` → 0.693147… (= ln 2).
 *
 * Source: Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.3 (boost parameter ζ, tanh ζ = β);
 * Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (rapidity).
 *
 * Numerics: atanh in double-double: series near 0, ½ log1p(2β/(1 − β)) otherwise with 1 − β exact,
 * rounded once.
 */
export const rapidity: CalcFunction = {
  name: 'rapidity',
  params: [{ name: 'v', kind: 'speed', description: 'speed of the body (a velocity, or β = v/c)' }],
  returns: 'number',
  doc: {
    summary: 'The rapidity η = atanh β; rapidities of collinear motions add.',
    formula: '\\eta = \\operatorname{atanh}\\beta = \\tfrac12 \\ln\\frac{1+\\beta}{1-\\beta}',
    domain: '|β| < 1 (a massive body). NaN and ±Infinity are refused.',
    example: 'rapidity(0.6)',
    exampleResult: '0.693147180559945 (= ln 2)',
    source:
      'J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.3 (boost parameter, tanh ζ = β); Particle Data Group, Review of Particle Physics (2024), review "Kinematics".',
    numerics:
      'Evaluated in double-double: the odd series β + β³/3 + … below |β| = 0.01, ½ log1p(2β/(1 − β)) above it with 1 − β formed exactly (a Newton step on a double-double exponential gives the logarithm). Rounded once: within about half an ulp up to 1 − β = 1e-16.',
  },
  kernel: (v: KernelArgument): number => round(rapidityOf(massiveSpeed('rapidity', 'v', v))),
};
