import { distanceMotion, speedAfter } from './support/hyperbolic-from-distance';
import { speedValue } from './support/kinematics';
import type { CalcFunction, KernelArgument, PreciseSpeed } from './types';

const FN = 'hyperbolicSpeedFromDistance';

function precise(a0: KernelArgument, d: KernelArgument): PreciseSpeed | number {
  return speedAfter(distanceMotion(FN, a0 as number, d as number));
}

/**
 * hyperbolicSpeedFromDistance(a0, d) — the speed of a body that starts from rest and keeps a
 * constant proper acceleration a0, once it has covered the coordinate (lab) distance d.
 *
 * Formula: γ = 1 + a0 d/c², β = √(x(2 + x))/(1 + x) with x = a0 d/c² = γ − 1; the work-energy
 * relation of hyperbolic motion (γ − 1)mc² = m a0 d.
 *
 * Domain: a0 finite (its sign is the direction of the motion, and of the speed returned; a0 = 0 only
 * with d = 0); d ≥ 0; NaN and ±Infinity are refused. When the speed rounds to c the largest double
 * below 1 is returned. The result keeps its precise companion, so lorentzFactor of it gives
 * 1 + a0 d/c² to the last digit.
 *
 * Example: `hyperbolicSpeedFromDistance(q_e * 1 MV/m / m_e, 60 mm)` → 1.3377e8 m/s (β = 0.44623):
 * an electron starting from rest across a 60 mm gap in a uniform 1 MV/m field, i.e. after 60 keV.
 *
 * Source: W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3
 * (hyperbolic motion, γ = 1 + a x/c² from rest); C. W. Misner, K. S. Thorne, J. A. Wheeler,
 * Gravitation (1973), §6.2.
 *
 * Numerics: x = a0 d/c² from the exact product, β and 1/γ in double-double without cancellation
 * at small x (√(1 − 1/γ²) keeps nothing at x = 1e-17) and without overflow at large x; rounded once.
 */
export const hyperbolicSpeedFromDistance: CalcFunction = {
  name: FN,
  params: [
    {
      name: 'a0',
      kind: 'acceleration',
      description: 'constant proper acceleration (its sign is the direction of motion)',
    },
    { name: 'd', kind: 'length', description: 'coordinate (lab) distance covered from rest' },
  ],
  returns: 'speed',
  doc: {
    summary:
      'Speed of a body starting from rest with constant proper acceleration a0 once it has covered the lab distance d.',
    formula: '\\beta = \\frac{\\sqrt{x(2+x)}}{1+x},\\quad x = \\gamma - 1 = \\frac{a_0 d}{c^2}',
    domain:
      'a0 finite, either sign (the direction of motion and of the speed returned; 0 only with d = 0); d ≥ 0. NaN and ±Infinity are refused. When the speed rounds to c the largest double below 1 is returned.',
    example: 'hyperbolicSpeedFromDistance(q_e * 1 MV/m / m_e, 60 mm)',
    exampleResult: '1.3377e8 m/s (β = 0.44623: an electron from rest across a 60 mm gap at 1 MV/m, i.e. after 60 keV)',
    source:
      'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 (hyperbolic motion: γ = 1 + a x/c² from rest); C. W. Misner, K. S. Thorne, J. A. Wheeler, Gravitation (1973), §6.2.',
    numerics:
      'x = a0 d/c² from the exact product; β = √(x(2 + x))/(1 + x) and 1/γ = 1/(1 + x) in double-double (the textbook √(1 − 1/γ²) keeps nothing at x = 1e-17), √(x(2 + x)) as x√(1 + 2/x) above x = 1 so nothing overflows; rounded once. The precise companion makes lorentzFactor of the result exact.',
  },
  kernel: (a0: KernelArgument, d: KernelArgument): number => speedValue(precise(a0, d)),
  preciseKernel: precise,
};
