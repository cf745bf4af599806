import { finiteResult, requireFinite } from './support/domain';
import { mul, mulNum, round } from './support/double-double';
import { massiveSpeed, oneMinusBetaSquaredOf } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'properToCoordinateAcceleration';

/**
 * properToCoordinateAcceleration(a0, v) — the acceleration dv/dt seen in the lab of a body moving at v
 * whose proper (felt) acceleration a0 is along its velocity.
 *
 * Formula: a = a0/γ³ = a0 ((1 − β)(1 + β))^{3/2}.
 *
 * Domain: a0 any finite value (its sign is its direction along the motion); |β| < 1; NaN and
 * ±Infinity are refused.
 *
 * Example: `properToCoordinateAcceleration(q_e * 1 MV/m / m_e, 0.6)` → 9.0052e16 m/s² (an electron at
 * 0.6 c pushed along its motion by a 1 MV/m field).
 *
 * Source: W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3
 * (transformation of acceleration); Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.
 *
 * Numerics: 1/γ³ = (1 − β²)·√(1 − β²) with 1 − β² exact in double-double, times a0, rounded once.
 */
export const properToCoordinateAcceleration: CalcFunction = {
  name: FN,
  params: [
    { name: 'a0', kind: 'acceleration', description: 'proper acceleration along the direction of motion' },
    { name: 'v', kind: 'speed', description: 'speed of the body (a velocity, or β)' },
  ],
  returns: 'acceleration',
  doc: {
    summary: 'Lab-frame (coordinate) acceleration of a body whose proper acceleration a0 is along its velocity v.',
    formula: 'a = \\frac{a_0}{\\gamma^3} = a_0\\,\\big((1-\\beta)(1+\\beta)\\big)^{3/2}',
    domain: 'a0 finite, either sign (its direction along the motion); |β| < 1. NaN and ±Infinity are refused.',
    example: 'properToCoordinateAcceleration(q_e * 1 MV/m / m_e, 0.6)',
    exampleResult: '9.0052e16 m/s^2 (an electron at 0.6 c pushed along its motion by a 1 MV/m field)',
    source:
      'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 (transformation of acceleration, proper acceleration); J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), ch. 11.',
    numerics:
      '1/γ³ = (1 − β²)·√(1 − β²) with 1 − β² formed exactly in double-double, times a0, rounded once (within about half an ulp).',
  },
  kernel: (a0: KernelArgument, v: KernelArgument): number => {
    requireFinite(FN, 'a0', a0 as number);
    const speed = massiveSpeed(FN, 'v', v);
    return finiteResult(FN, round(mulNum(mul(oneMinusBetaSquaredOf(speed), speed.inverseGamma), a0 as number)));
  },
};
