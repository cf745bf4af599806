import { div, round } from './support/double-double';
import { massiveSpeed } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

/**
 * betaGamma(v) — βγ = p/(mc), the reduced momentum of a body moving at v; accurate near c.
 *
 * Formula: βγ = β/√((1 − β)(1 + β)).
 *
 * Domain: |β| < 1; NaN and ±Infinity are refused.
 *
 * Example: `betaGamma(0.6)` → 0.75.
 *
 * Source: Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (βγ = p/(mc));
 * Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.3.
 *
 * Numerics: 1 − β² exact in double-double, root and quotient in double-double, rounded once.
 */
export const betaGamma: CalcFunction = {
  name: 'betaGamma',
  params: [{ name: 'v', kind: 'speed', description: 'speed of the body (a velocity, or β)' }],
  returns: 'number',
  doc: {
    summary: 'βγ = p/(mc), the reduced momentum of a body moving at v.',
    formula: '\\beta\\gamma = \\frac{\\beta}{\\sqrt{(1-\\beta)(1+\\beta)}}',
    domain: '|β| < 1 (a massive body). NaN and ±Infinity are refused.',
    example: 'betaGamma(0.6)',
    exampleResult: '0.75',
    source:
      'Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (βγ = p/(mc)); J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.3.',
    numerics:
      '1 − β² is formed exactly in double-double (it keeps every digit of 1 − β near c), root and quotient in double-double, rounded once (within about half an ulp).',
  },
  kernel: (v: KernelArgument): number => {
    const speed = massiveSpeed('betaGamma', 'v', v);
    return round(div(speed.beta, speed.inverseGamma));
  },
};
