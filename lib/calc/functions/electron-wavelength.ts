import { E_CHARGE, H_PLANCK, M_E } from '../constants';
import { finiteResult, requirePositive } from './support/domain';
import { add, dd, div, mul, mulNum, round, scale, sqrt } from './support/double-double';
import { C_DD, C_SQUARED, decimalConstant } from './support/kinematics';
import type { CalcFunction } from './types';

const FN = 'electronWavelength';

const ELEMENTARY_CHARGE = decimalConstant(E_CHARGE);
const PLANCK_TIMES_C = mul(decimalConstant(H_PLANCK), C_DD);
const ELECTRON_REST_ENERGY = mul(decimalConstant(M_E), C_SQUARED);
const ROOT_ELEMENTARY_CHARGE = sqrt(ELEMENTARY_CHARGE);

/**
 * electronWavelength(U) — the relativistic de Broglie wavelength of an electron accelerated from
 * rest through the potential difference U.
 *
 * Formula: λ = hc / √(eU (eU + 2mₑc²)); textbook λ = h / √(2mₑeU (1 + eU/(2mₑc²))).
 *
 * Domain: U > 0; NaN and ±Infinity are refused.
 *
 * Example: `electronWavelength(200 kV) to pm` → 2.5079 pm.
 *
 * Source: D. B. Williams & C. B. Carter, Transmission Electron Microscopy, 2nd ed. (2009), table 1.1;
 * L. Reimer & H. Kohl, Transmission Electron Microscopy, 5th ed. (2008), ch. 2.
 * Constants h, e (SI 2019, exact) and mₑ (CODATA 2022).
 *
 * Numerics: the kinetic energy eU and the product with e, h and mₑ taken at their decimal values in
 * double-double, λ = hc/(√e·√U·√(T + 2mₑc²)) evaluated in double-double (√e·√U rather than √(eU),
 * which underflows below 1e-289 V), rounded once.
 */
export const electronWavelength: CalcFunction = {
  name: FN,
  params: [{ name: 'U', kind: 'voltage', description: 'accelerating potential difference' }],
  returns: 'length',
  doc: {
    summary: 'Relativistic de Broglie wavelength of an electron accelerated from rest through U.',
    formula:
      '\\lambda = \\frac{hc}{\\sqrt{eU\\,(eU + 2m_ec^2)}} \\quad\\left(= \\frac{h}{\\sqrt{2m_e eU\\,(1 + \\frac{eU}{2m_ec^2})}}\\right)',
    domain: 'U > 0. NaN and ±Infinity are refused.',
    example: 'electronWavelength(200 kV) to pm',
    exampleResult: '2.5079 pm',
    source:
      'D. B. Williams & C. B. Carter, Transmission Electron Microscopy, 2nd ed. (2009), table 1.1; L. Reimer & H. Kohl, Transmission Electron Microscopy, 5th ed. (2008), ch. 2. Constants: h and e exact (SI 2019), mₑ CODATA 2022.',
    numerics:
      'e, h and mₑ enter at their decimal (defined or recommended) values in double-double; λ = hc/(√T·√(T + 2mₑc²)) with T = eU is evaluated in double-double and rounded once (within about half an ulp of the formula with those constants).',
  },
  kernel: (U: number): number => {
    requirePositive(FN, 'U', U, 'V', 'an accelerating voltage');
    const T = mulNum(ELEMENTARY_CHARGE, U);
    // √T = √e·√U, not √(eU): eU underflows below U ≈ 1e-289 V, where λ (up to 5e152 m) is still a
    // double. A tiny U is scaled by 2^1000 (exactly) before its square root.
    const rootU = U < 2 ** -900 ? scale(sqrt(dd(U * 2 ** 1000)), 2 ** -500) : sqrt(dd(U));
    const pc = mul(mul(ROOT_ELEMENTARY_CHARGE, rootU), sqrt(add(T, scale(ELECTRON_REST_ENERGY, 2))));
    return finiteResult(FN, round(div(PLANCK_TIMES_C, pc)));
  },
};
