import { E_CHARGE, M_E } from '../constants';
import { finiteResult, requireNonNegative } from './support/domain';
import { add, div, mul, mulNum, round, scale } from './support/double-double';
import { C_SQUARED, decimalConstant, ONE } from './support/kinematics';
import type { CalcFunction } from './types';

const FN = 'relativisticVoltage';

const ELEMENTARY_CHARGE = decimalConstant(E_CHARGE);
const TWICE_ELECTRON_REST_ENERGY = scale(mul(decimalConstant(M_E), C_SQUARED), 2);

/**
 * relativisticVoltage(U) — the relativistically corrected accelerating voltage U* of an electron
 * accelerated from rest through U: the voltage that gives the electron's momentum in the classical
 * formula p = √(2mₑeU*).
 *
 * Formula: U* = U (1 + eU/(2mₑc²)).
 *
 * Domain: U ≥ 0; NaN and ±Infinity are refused; a result beyond the double range is refused.
 *
 * Example: `relativisticVoltage(200 kV)` → 239.14 kV.
 *
 * Source: L. Reimer & H. Kohl, Transmission Electron Microscopy, 5th ed. (2008), §2.1 (U* and the
 * table of electron properties); constants e (SI 2019, exact) and mₑ (CODATA 2022).
 *
 * Numerics: eU/(2mₑc²) with e and mₑ at their decimal values and 1 + that times U in double-double;
 * rounded once.
 */
export const relativisticVoltage: CalcFunction = {
  name: FN,
  params: [{ name: 'U', kind: 'voltage', description: 'accelerating potential difference' }],
  returns: 'voltage',
  doc: {
    summary:
      'Relativistically corrected accelerating voltage U* = U(1 + eU/(2mₑc²)) of an electron (so that p = √(2mₑeU*)).',
    formula: 'U^{*} = U\\left(1 + \\frac{eU}{2m_ec^2}\\right)',
    domain: 'U ≥ 0. NaN and ±Infinity are refused; a result beyond the double range is refused.',
    example: 'relativisticVoltage(200 kV)',
    exampleResult: '239.14 kV',
    source:
      'L. Reimer & H. Kohl, Transmission Electron Microscopy, 5th ed. (2008), §2.1. Constants: e exact (SI 2019), mₑ CODATA 2022.',
    numerics:
      'eU/(2mₑc²) with e and mₑ at their decimal values, and U(1 + eU/(2mₑc²)), in double-double; rounded once.',
  },
  kernel: (U: number): number => {
    requireNonNegative(FN, 'U', U, 'V', 'an accelerating voltage');
    const ratio = div(mulNum(ELEMENTARY_CHARGE, U), TWICE_ELECTRON_REST_ENERGY);
    return finiteResult(FN, round(mulNum(add(ONE, ratio), U)));
  },
};
