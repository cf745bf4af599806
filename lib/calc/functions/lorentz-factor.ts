import { round } from './support/double-double';
import { gammaOfSpeed, massiveSpeed } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

/**
 * lorentzFactor(v) — the Lorentz factor γ of a body moving at speed v.
 *
 * Formula: γ = 1/√((1 − β)(1 + β)), textbook γ = 1/√(1 − v²/c²).
 *
 * Domain: |β| < 1 (a massive body); NaN and ±Infinity are refused.
 *
 * Example: `gamma = lorentzFactor(0.6)` → 1.25.
 *
 * Source: A. Einstein, "Zur Elektrodynamik bewegter Körper", Annalen der Physik 17 (1905) §3;
 * J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.3.
 *
 * Numerics: 1 − β² is formed exactly in double-double (Dekker's product and TwoSum), then the square
 * root and the reciprocal; the result is rounded once. The textbook 1 − β·β keeps no correct digit at
 * 1 − β ≈ 1e-16.
 */
export const lorentzFactor: CalcFunction = {
  name: 'lorentzFactor',
  params: [{ name: 'v', kind: 'speed', description: 'speed of the body (a velocity, or β = v/c)' }],
  returns: 'number',
  doc: {
    summary: 'The Lorentz factor γ of a body moving at speed v.',
    formula: '\\gamma = \\frac{1}{\\sqrt{(1-\\beta)(1+\\beta)}} \\quad\\left(= \\frac{1}{\\sqrt{1 - v^2/c^2}}\\right)',
    domain: '|β| < 1 (a massive body). NaN and ±Infinity are refused.',
    example: 'gamma = lorentzFactor(0.6)',
    exampleResult: '1.25',
    source:
      'A. Einstein, "Zur Elektrodynamik bewegter Körper", Annalen der Physik 17 (1905), §3; J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.3.',
    numerics:
      '1 − β² is formed exactly in double-double arithmetic (Dekker product of β with itself, TwoSum with 1), then the square root and reciprocal are taken in double-double and the result is rounded once: within about half an ulp from β = 1e-12 to 1 − β = 1e-16. The textbook 1 − β·β in doubles loses every digit of 1 − β² near c.',
  },
  kernel: (v: KernelArgument): number => round(gammaOfSpeed(massiveSpeed('lorentzFactor', 'v', v))),
};
