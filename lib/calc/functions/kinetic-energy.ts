import { finiteResult, requirePositive } from './support/domain';
import { mul, mulNum, round } from './support/double-double';
import { C_SQUARED, gammaMinusOneOf, massiveSpeed } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'kineticEnergy';

/**
 * kineticEnergy(m, v) — the kinetic energy T = (γ − 1)mc² of a body of mass m moving at v; equal to
 * ½mv² to full precision at low speed.
 *
 * Formula: T = mc² β² / (s(1 + s)), s = √((1 − β)(1 + β)); textbook T = (γ − 1)mc².
 *
 * Domain: m > 0 (a body slower than light has mass), |β| < 1; NaN and ±Infinity are refused.
 *
 * Example: `kineticEnergy(m_p, 0.6) to MeV` → 234.568 MeV (= ¼ m_p c²).
 *
 * Source: Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (E = γmc²);
 * Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.5.
 *
 * Numerics: γ − 1 without cancellation (see gammaMinusOne), times m and the exact c² in
 * double-double, rounded once.
 */
export const kineticEnergy: CalcFunction = {
  name: FN,
  params: [
    { name: 'm', kind: 'mass', description: 'rest mass of the body (a mass, or its rest energy mc²)' },
    { name: 'v', kind: 'speed', description: 'speed of the body (a velocity, or β)' },
  ],
  returns: 'energy',
  doc: {
    summary: 'Kinetic energy (γ − 1)mc² of a body of mass m at speed v, equal to ½mv² to full precision at low speed.',
    formula:
      'T = \\frac{\\beta^2}{s\\,(1+s)}\\,mc^2,\\ s = \\sqrt{(1-\\beta)(1+\\beta)} \\quad\\left(= (\\gamma - 1)\\,mc^2\\right)',
    domain: 'm > 0 (a body slower than light has mass); |β| < 1. NaN and ±Infinity are refused.',
    example: 'kineticEnergy(m_p, 0.6) to MeV',
    exampleResult: '234.568022 MeV (¼ m_p c²)',
    source:
      'Particle Data Group, Review of Particle Physics (2024), review "Kinematics"; J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.5.',
    numerics:
      '(γ − 1) is formed as β²/(s(1 + s)) in double-double (no cancellation), multiplied by m and by c² (exact in double-double) and rounded once: within about half an ulp, and identical to ½mv² to the last digit below β ≈ 1e-8.',
  },
  kernel: (m: KernelArgument, v: KernelArgument): number => {
    requirePositive(FN, 'm', m as number, 'kg', 'a body slower than light has mass');
    const speed = massiveSpeed(FN, 'v', v);
    return finiteResult(FN, round(mul(mulNum(gammaMinusOneOf(speed), m as number), C_SQUARED)));
  },
};
