import { finiteResult, requireFinite } from './support/domain';
import { mulNum, round } from './support/double-double';
import { massiveSpeed, oneMinusBetaSquaredOf } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'transverseCoordinateAcceleration';

/**
 * transverseCoordinateAcceleration(a0, v) — the lab-frame acceleration of a body moving at v whose
 * proper acceleration a0 is perpendicular to its velocity (e.g. in a bending magnet, at the instant
 * considered).
 *
 * Formula: a = a0/γ² = a0 (1 − β)(1 + β).
 *
 * Domain: a0 finite (either sign); |β| < 1; NaN and ±Infinity are refused.
 *
 * Example: `transverseCoordinateAcceleration(q_e * 1 MV/m / m_e, 0.6)` → 1.1256e17 m/s² (an electron at
 * 0.6 c in a 1 MV/m field across its motion, as seen in the lab).
 *
 * Source: W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3
 * (transformation of acceleration); Jackson, Classical Electrodynamics, 3rd ed. (1999), ch. 11.
 *
 * Numerics: 1 − β² exact in double-double, times a0, rounded once.
 */
export const transverseCoordinateAcceleration: CalcFunction = {
  name: FN,
  params: [
    { name: 'a0', kind: 'acceleration', description: 'proper acceleration perpendicular to the direction of motion' },
    { name: 'v', kind: 'speed', description: 'speed of the body (a velocity, or β)' },
  ],
  returns: 'acceleration',
  doc: {
    summary: 'Lab-frame acceleration of a body whose proper acceleration a0 is perpendicular to its velocity v.',
    formula: 'a = \\frac{a_0}{\\gamma^2} = a_0\\,(1-\\beta)(1+\\beta)',
    domain: 'a0 finite, either sign; |β| < 1. NaN and ±Infinity are refused.',
    example: 'transverseCoordinateAcceleration(q_e * 1 MV/m / m_e, 0.6)',
    exampleResult: '1.1256e17 m/s^2 (an electron at 0.6 c in a 1 MV/m field across its motion, as seen in the lab)',
    source:
      'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 (transformation of acceleration); J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), ch. 11.',
    numerics:
      '1 − β² is formed exactly in double-double (the textbook 1 − β·β loses it near c), times a0, rounded once (within about half an ulp).',
  },
  kernel: (a0: KernelArgument, v: KernelArgument): number => {
    requireFinite(FN, 'a0', a0 as number);
    const speed = massiveSpeed(FN, 'v', v);
    return finiteResult(FN, round(mulNum(oneMinusBetaSquaredOf(speed), a0 as number)));
  },
};
