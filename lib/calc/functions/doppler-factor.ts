import { finiteResult } from './support/domain';
import { round } from './support/double-double';
import { dopplerOf, massiveSpeed } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

/**
 * dopplerFactor(v) — the ratio f_observed/f_source for a source moving at v along the line of sight,
 * approaching the observer for v > 0 (blue shift, factor > 1) and receding for v < 0.
 *
 * Formula: D = √((1 + β)/(1 − β)) = e^η (η the rapidity).
 *
 * Domain: |β| < 1; NaN and ±Infinity are refused.
 *
 * Example: `dopplerFactor(0.6)` → 2.
 *
 * Source: Einstein, Annalen der Physik 17 (1905), §7; Jackson, Classical Electrodynamics, 3rd ed.
 * (1999), §11.3.
 *
 * Numerics: 1 + β and 1 − β are exact in double-double (TwoSum), so the factor keeps every digit
 * when β is near ±1; quotient and root in double-double, rounded once.
 */
export const dopplerFactor: CalcFunction = {
  name: 'dopplerFactor',
  params: [
    {
      name: 'v',
      kind: 'speed',
      description: 'speed of the source along the line of sight, > 0 when approaching (a velocity, or β)',
    },
  ],
  returns: 'number',
  doc: {
    summary: 'f_observed/f_source for a source moving along the line of sight, approaching for v > 0.',
    formula: 'D = \\sqrt{\\frac{1+\\beta}{1-\\beta}} = e^{\\eta}',
    domain: '|β| < 1 (a massive source; v > 0 approaching, v < 0 receding). NaN and ±Infinity are refused.',
    example: 'dopplerFactor(0.6)',
    exampleResult: '2',
    source:
      'A. Einstein, "Zur Elektrodynamik bewegter Körper", Annalen der Physik 17 (1905), §7; J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.3.',
    numerics:
      '1 + β and 1 − β are formed exactly (TwoSum), so nothing is lost near β = ±1; quotient and square root in double-double, rounded once (within about half an ulp).',
  },
  kernel: (v: KernelArgument): number =>
    finiteResult('dopplerFactor', round(dopplerOf(massiveSpeed('dopplerFactor', 'v', v)))),
};
