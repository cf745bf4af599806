import { E_CHARGE, H_PLANCK, M_E } from '../constants';
import { finiteResult, requirePositive } from './support/domain';
import { add, dd, div, mul, mulNum, round, scale, sqrt } from './support/double-double';
import { C_DD, C_SQUARED, decimalConstant } from './support/kinematics';
import type { CalcFunction } from './types';

const FN = 'interactionConstant';

const ELEMENTARY_CHARGE = decimalConstant(E_CHARGE);
const ROOT_ELEMENTARY_CHARGE = sqrt(ELEMENTARY_CHARGE);
const PLANCK_TIMES_C = mul(decimalConstant(H_PLANCK), C_DD);
const ELECTRON_REST_ENERGY = mul(decimalConstant(M_E), C_SQUARED);
const TWO_PI: readonly [number, number] = [6.283185307179586, 2.4492935982947064e-16];

/**
 * interactionConstant(U) — the interaction constant σ of an electron accelerated from rest through
 * U: the phase shift per unit projected potential, σ = 2π mₑγ e λ/h², as used in phase-contrast
 * and holography.
 *
 * Formula: σ = 2π e (mₑc² + eU) / (hc · pc), pc = √(eU (eU + 2mₑc²)); equivalently
 * σ = (2π/(λU)) (mₑc² + eU)/(2mₑc² + eU).
 *
 * Domain: U > 0; NaN and ±Infinity are refused; a result beyond the double range is refused.
 *
 * Example: `interactionConstant(200 kV)` → 7.2884 × 10⁶ V⁻¹·m⁻¹ (0.728 84 rad per kV·Å: radians of
 * phase per volt-metre of projected potential).
 *
 * Source: E. J. Kirkland, Advanced Computing in Electron Microscopy, 2nd ed. (2010), §5.2 (σ = 0.729
 * rad/(kV·Å) at 200 kV); L. Reimer & H. Kohl, Transmission Electron Microscopy, 5th ed. (2008), §3.1.
 *
 * Numerics: e, h and mₑ at their decimal values; √(eU) as √e·√U (no underflow below U ≈ 1e-289 V);
 * all in double-double, rounded once.
 */
export const interactionConstant: CalcFunction = {
  name: FN,
  params: [{ name: 'U', kind: 'voltage', description: 'accelerating potential difference' }],
  returns: 'interaction-constant',
  doc: {
    summary:
      'Interaction constant σ = 2π mₑγ e λ/h² of an electron accelerated through U (phase shift per volt-metre of projected potential).',
    formula:
      '\\sigma = \\frac{2\\pi e\\,(m_ec^2 + eU)}{hc\\,\\sqrt{eU\\,(eU + 2m_ec^2)}} = \\frac{2\\pi}{\\lambda U}\\,\\frac{m_ec^2 + eU}{2m_ec^2 + eU}',
    domain: 'U > 0. NaN and ±Infinity are refused; a result beyond the double range is refused.',
    example: 'interactionConstant(200 kV)',
    exampleResult: '7.2884e6 V^-1 m^-1 (0.728 84 radians per kV·Å of projected potential)',
    source:
      'E. J. Kirkland, Advanced Computing in Electron Microscopy, 2nd ed. (2010), §5.2; L. Reimer & H. Kohl, Transmission Electron Microscopy, 5th ed. (2008), §3.1. Constants: h, e exact (SI 2019), mₑ CODATA 2022.',
    numerics:
      'e, h and mₑ at their decimal values; √(eU) as √e·√U so that a tiny U does not underflow; in double-double, rounded once.',
  },
  kernel: (U: number): number => {
    requirePositive(FN, 'U', U, 'V', 'an accelerating voltage');
    const T = mulNum(ELEMENTARY_CHARGE, U);
    const rootU = U < 2 ** -900 ? scale(sqrt(dd(U * 2 ** 1000)), 2 ** -500) : sqrt(dd(U));
    const pc = mul(mul(ROOT_ELEMENTARY_CHARGE, rootU), sqrt(add(T, scale(ELECTRON_REST_ENERGY, 2))));
    const numerator = mul(mul(TWO_PI, ELEMENTARY_CHARGE), add(ELECTRON_REST_ENERGY, T));
    return finiteResult(FN, round(div(numerator, mul(PLANCK_TIMES_C, pc))));
  },
};
