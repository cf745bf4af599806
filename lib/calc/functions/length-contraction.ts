import { finiteResult, requireNonNegative } from './support/domain';
import { mulNum, round } from './support/double-double';
import { massiveSpeed } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'lengthContraction';

/**
 * lengthContraction(L0, v) — the length L = L0/γ, along the motion, of a body of proper length L0
 * moving at v.
 *
 * Formula: L = L0 √((1 − β)(1 + β)).
 *
 * Domain: L0 ≥ 0 (a proper length), |β| < 1; NaN and ±Infinity are refused.
 *
 * Example: `lengthContraction(1 m, 0.6)` → 0.8 m.
 *
 * Source: Einstein, Annalen der Physik 17 (1905), §4; Jackson, Classical Electrodynamics, 3rd ed.
 * (1999), §11.3.
 *
 * Numerics: 1/γ = √(1 − β²) with 1 − β² exact in double-double, times L0, rounded once.
 */
export const lengthContraction: CalcFunction = {
  name: FN,
  params: [
    { name: 'L0', kind: 'length', description: 'proper length L0, measured in the body’s rest frame along the motion' },
    { name: 'v', kind: 'speed', description: 'speed of the body (a velocity, or β)' },
  ],
  returns: 'length',
  doc: {
    summary: 'The contracted length L0/γ of a body of proper length L0 moving at v along its length.',
    formula: 'L = \\frac{L_0}{\\gamma} = L_0\\sqrt{(1-\\beta)(1+\\beta)}',
    domain: 'L0 ≥ 0 (a proper length); |β| < 1. NaN and ±Infinity are refused.',
    example: 'lengthContraction(1 m, 0.6)',
    exampleResult: '0.8 m',
    source:
      'A. Einstein, "Zur Elektrodynamik bewegter Körper", Annalen der Physik 17 (1905), §4; J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.3.',
    numerics:
      '1/γ = √(1 − β²) with 1 − β² formed exactly in double-double, times L0 in double-double, rounded once (within about half an ulp).',
  },
  kernel: (L0: KernelArgument, v: KernelArgument): number => {
    requireNonNegative(FN, 'L0', L0 as number, 'm', 'a proper length');
    const speed = massiveSpeed(FN, 'v', v);
    return finiteResult(FN, round(mulNum(speed.inverseGamma, L0 as number)));
  },
};
