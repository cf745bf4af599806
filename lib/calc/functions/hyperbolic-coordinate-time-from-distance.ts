import { finiteResult } from './support/domain';
import { round } from './support/double-double';
import { coordinateTimeAfter, distanceMotion } from './support/hyperbolic-from-distance';
import type { CalcFunction } from './types';

const FN = 'hyperbolicCoordinateTimeFromDistance';

/**
 * hyperbolicCoordinateTimeFromDistance(a0, d) — the coordinate (lab) time a body that starts from
 * rest with constant proper acceleration a0 takes to cover the lab distance d; √(2d/a0) at small d,
 * approaching d/c + c/a0 at large d. The inverse of hyperbolicDistance.
 *
 * Formula: t = (c/a0)√(γ² − 1), γ = 1 + a0 d/c²; evaluated as √(d/a0)·√(2 + x) for x = a0 d/c² < 1
 * and (d/c)·√(1 + 2/x) above.
 *
 * Domain: a0 finite (either sign; t depends on |a0|; a0 = 0 only with d = 0); d ≥ 0; NaN and
 * ±Infinity are refused.
 *
 * Example: `hyperbolicCoordinateTimeFromDistance(q_e * 1 MV/m / m_e, 60 mm) to ns` → 0.84990 ns
 * (an electron from rest across a 60 mm gap in a uniform 1 MV/m field).
 *
 * Source: W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3
 * (hyperbolic motion); C. W. Misner, K. S. Thorne, J. A. Wheeler, Gravitation (1973), §6.2.
 *
 * Numerics: γ² − 1 = x(2 + x) without cancellation (the textbook form keeps nothing of it at
 * x = 1e-17); the small-x form needs no division by a small a0 and the large-x form no product that
 * could overflow; double-double, rounded once.
 */
export const hyperbolicCoordinateTimeFromDistance: CalcFunction = {
  name: FN,
  params: [
    { name: 'a0', kind: 'acceleration', description: 'constant proper acceleration' },
    { name: 'd', kind: 'length', description: 'coordinate (lab) distance covered from rest' },
  ],
  returns: 'time',
  doc: {
    summary:
      'Coordinate (lab) time a body starting from rest with constant proper acceleration a0 takes to cover the lab distance d (the inverse of hyperbolicDistance).',
    formula:
      't = \\frac{c}{a_0}\\sqrt{\\gamma^2 - 1} = \\sqrt{\\frac{d}{a_0}}\\,\\sqrt{2 + x},\\quad \\gamma = 1 + x,\\ x = \\frac{a_0 d}{c^2}',
    domain: 'a0 finite, either sign (t depends on |a0|; 0 only with d = 0); d ≥ 0. NaN and ±Infinity are refused.',
    example: 'hyperbolicCoordinateTimeFromDistance(q_e * 1 MV/m / m_e, 60 mm) to ns',
    exampleResult: '0.84990 ns (an electron from rest across a 60 mm gap at 1 MV/m)',
    source:
      'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 (hyperbolic motion); C. W. Misner, K. S. Thorne, J. A. Wheeler, Gravitation (1973), §6.2.',
    numerics:
      'γ² − 1 = x(2 + x) with x = a0 d/c² from the exact product (the textbook form keeps nothing at x = 1e-17); √(d/a0)·√(2 + x) below x = 1 needs no division by a small a0, (d/c)·√(1 + 2/x) above no product that could overflow. Double-double, rounded once.',
  },
  kernel: (a0: number, d: number): number => finiteResult(FN, round(coordinateTimeAfter(distanceMotion(FN, a0, d)))),
};
