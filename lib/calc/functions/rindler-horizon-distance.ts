import { finiteResult, requirePositive } from './support/domain';
import { dd, div, round } from './support/double-double';
import { C_SQUARED } from './support/kinematics';
import type { CalcFunction } from './types';

const FN = 'rindlerHorizonDistance';

/**
 * rindlerHorizonDistance(a0) — the distance c²/a0 behind a body with constant proper acceleration a0
 * to its Rindler horizon: events beyond it can never send it a signal while it keeps accelerating.
 *
 * Formula: d = c²/a0.
 *
 * Domain: a0 > 0 (the magnitude of the proper acceleration); NaN and ±Infinity are refused.
 *
 * Example: `rindlerHorizonDistance(q_e * 1 MV/m / m_e) to mm` → 510.999 mm (m_e c²/(eE) for an electron
 * in a uniform 1 MV/m field).
 *
 * Source: W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 and ch. 12;
 * Misner, Thorne, Wheeler, Gravitation (1973), §6.2–6.3.
 *
 * Numerics: c² exact in double-double, one division, rounded once.
 */
export const rindlerHorizonDistance: CalcFunction = {
  name: FN,
  params: [{ name: 'a0', kind: 'acceleration', description: 'magnitude of the constant proper acceleration' }],
  returns: 'length',
  doc: {
    summary: 'Distance c²/a0 from a body with constant proper acceleration a0 to its Rindler horizon.',
    formula: 'd = \\frac{c^2}{a_0}',
    domain: 'a0 > 0 (the magnitude of the proper acceleration). NaN and ±Infinity are refused.',
    example: 'rindlerHorizonDistance(q_e * 1 MV/m / m_e) to mm',
    exampleResult: '510.999 mm (m_e c²/(eE) for an electron in a uniform 1 MV/m field)',
    source:
      'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 and ch. 12 (Rindler coordinates); C. W. Misner, K. S. Thorne, J. A. Wheeler, Gravitation (1973), §6.2–6.3.',
    numerics: 'c² is exact in double-double; one division, rounded once (within about half an ulp).',
  },
  kernel: (a0: number): number => {
    requirePositive(FN, 'a0', a0, 'm/s^2', 'the magnitude of the proper acceleration');
    return finiteResult(FN, round(div(C_SQUARED, dd(a0))));
  },
};
