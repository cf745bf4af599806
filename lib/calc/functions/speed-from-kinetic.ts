import { requireNonNegative } from './support/domain';
import { dd } from './support/double-double';
import { speedFromKineticDD, speedValue } from './support/kinematics';
import { type CalcFunction, DomainError, type KernelArgument, type PreciseSpeed } from './types';

function precise(TArg: KernelArgument, mArg: KernelArgument): PreciseSpeed | number {
  const T = requireNonNegative(FN, 'T', TArg as number, 'J', 'a kinetic energy');
  const m = requireNonNegative(FN, 'm', mArg as number, 'kg', 'a rest mass');
  if (m === 0) {
    if (T === 0)
      throw new DomainError(
        `${FN}: the speed of a massless particle with no energy is undefined; got T = 0 J, m = 0 kg`,
      );
    return { beta: [1, 0], inverseGamma: [0, 0] };
  }
  // β = √(x(x + 2))/(x + 1) and 1/γ = 1/(1 + x), x = (T/m)/c²: the companion keeps γ exactly as T/mc² gives it.
  return speedFromKineticDD(dd(T), m);
}

const FN = 'speedFromKinetic';

/**
 * speedFromKinetic(T, m) — the speed of a body of mass m with kinetic energy T.
 *
 * Formula: β = √(x(x + 2))/(x + 1) with x = T/(mc²); textbook β = √(1 − 1/γ²), γ = 1 + x.
 *
 * Domain: T ≥ 0, m ≥ 0; m = 0 (massless) gives c for T > 0, and T = m = 0 is refused. Negative
 * values, NaN and ±Infinity are refused. Above x ≈ 6.7e7 the exact β is within half an ulp of 1;
 * the largest double below 1 is returned then (β cannot carry more: use energies or momenta for
 * such beams).
 *
 * Example: `speedFromKinetic(250 MeV, m_p)` → 0.61361 c = 1.8396e8 m/s.
 *
 * Source: Particle Data Group, Review of Particle Physics (2024), review "Kinematics"
 * (β = pc/E, E = T + mc²).
 *
 * Numerics: x = T/(mc²) in double-double; the form √(x(x + 2))/(x + 1) has no subtraction (the
 * textbook √(1 − 1/γ²) loses all digits at small T), evaluated in double-double, rounded once.
 */
export const speedFromKinetic: CalcFunction = {
  name: FN,
  params: [
    { name: 'T', kind: 'energy', description: 'kinetic energy of the body' },
    { name: 'm', kind: 'mass', description: 'rest mass (a mass, or the rest energy mc²); 0 for a massless particle' },
  ],
  returns: 'speed',
  doc: {
    summary: 'Speed of a body of mass m with kinetic energy T.',
    formula:
      '\\beta = \\frac{\\sqrt{x\\,(x+2)}}{x+1},\\quad x = \\frac{T}{mc^2} \\quad\\left(= \\sqrt{1 - 1/\\gamma^2},\\ \\gamma = 1 + x\\right)',
    domain:
      'T ≥ 0 and m ≥ 0; m = 0 gives c for T > 0, and T = m = 0 is refused. NaN and ±Infinity are refused. Above T/mc² ≈ 6.7e7 the exact β is within half an ulp of 1 and the largest double below 1 is returned: a speed cannot carry more than that, so work with energies or momenta for such beams.',
    example: 'speedFromKinetic(250 MeV, m_p)',
    exampleResult: '1.8396e8 m/s (β = 0.61361)',
    source: 'Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (β = pc/E, E = T + mc²).',
    numerics:
      'x = T/(mc²) is formed in double-double; β = √(x(x + 2))/(x + 1) has no subtraction (the textbook √(1 − 1/γ²) loses every digit at small T), and is evaluated in double-double and rounded once (within about half an ulp).',
  },
  kernel: (T: KernelArgument, m: KernelArgument): number => speedValue(precise(T, m)),
  preciseKernel: precise,
};
