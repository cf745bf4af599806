import { BELOW_ONE, requireFinite, requireNonNegative } from './support/domain';
import { div } from './support/double-double';
import { hypotOne } from './support/elementary';
import { hyperbolicParameter, massiveResult, ONE, speedValue } from './support/kinematics';
import type { CalcFunction, KernelArgument, PreciseSpeed } from './types';

function precise(a0Arg: KernelArgument, tArg: KernelArgument): PreciseSpeed | number {
  const a0 = requireFinite(FN, 'a0', a0Arg as number);
  const t = requireNonNegative(FN, 't', tArg as number, 's', 'time since the start from rest');
  if (Math.abs(a0 * t) > 1e300) return Math.sign(a0) * BELOW_ONE;
  const w = hyperbolicParameter(a0, t);
  // β = w/√(1 + w²) and 1/γ = 1/√(1 + w²), both without cancellation.
  const root = hypotOne(w);
  return massiveResult(div(w, root), div(ONE, root));
}

const FN = 'hyperbolicSpeed';

/**
 * hyperbolicSpeed(a0, t) — the speed reached at coordinate time t by a body that starts from rest at
 * t = 0 and keeps a constant proper acceleration a0 (hyperbolic motion).
 *
 * Formula: β = w/√(1 + w²), w = a0 t/c.
 *
 * Domain: a0 finite (its sign is the direction of the motion), t ≥ 0; NaN and ±Infinity are refused.
 * The speed stays below c: when it rounds to c (w above ≈ 6.7e7), the largest double below 1 is
 * returned.
 *
 * Example: `hyperbolicSpeed(q_e * 1 MV/m / m_e, 1 ns)` → 1.5170e8 m/s (β = 0.50602): an electron
 * 1 ns after starting from rest in a uniform 1 MV/m field (proper acceleration eE/m_e).
 *
 * Source: W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3
 * (hyperbolic motion); C. W. Misner, K. S. Thorne, J. A. Wheeler, Gravitation (1973), §6.2.
 *
 * Numerics: w in double-double, √(1 + w²) without overflow (|w|·√(1 + 1/w²) for |w| > 1), rounded
 * once.
 */
export const hyperbolicSpeed: CalcFunction = {
  name: FN,
  params: [
    { name: 'a0', kind: 'acceleration', description: 'constant proper acceleration' },
    { name: 't', kind: 'time', description: 'coordinate (lab) time since the start from rest' },
  ],
  returns: 'speed',
  doc: {
    summary: 'Speed at coordinate time t of a body starting from rest with constant proper acceleration a0.',
    formula: '\\beta = \\frac{w}{\\sqrt{1 + w^2}},\\quad w = \\frac{a_0 t}{c}',
    domain:
      'a0 finite, either sign (the direction of motion); t ≥ 0. NaN and ±Infinity are refused. The speed stays below c: when it rounds to c (w above about 6.7e7) the largest double below 1 is returned.',
    example: 'hyperbolicSpeed(q_e * 1 MV/m / m_e, 1 ns)',
    exampleResult: '1.5170e8 m/s (β = 0.50602: an electron 1 ns after starting from rest in a uniform 1 MV/m field)',
    source:
      'W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 3 (hyperbolic motion); C. W. Misner, K. S. Thorne, J. A. Wheeler, Gravitation (1973), §6.2.',
    numerics:
      'w = a0 t/c in double-double; √(1 + w²) is taken as |w|·√(1 + 1/w²) for |w| > 1 so nothing overflows; rounded once (within about half an ulp).',
  },
  kernel: (a0: KernelArgument, t: KernelArgument): number => speedValue(precise(a0, t)),
  preciseKernel: precise,
};
