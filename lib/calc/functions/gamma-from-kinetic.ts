import { finiteResult, requireNonNegative, requirePositive } from './support/domain';
import { dd, round } from './support/double-double';
import { gammaFromKineticDD } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'gammaFromKinetic';

/**
 * gammaFromKinetic(T, m) — the Lorentz factor of a body of mass m with kinetic energy T, directly
 * (γ from a speed cannot be more precise than the speed, and β rounds near c).
 *
 * Formula: γ = 1 + T/(mc²).
 *
 * Domain: T ≥ 0, m > 0 (a body with a rest frame); NaN and ±Infinity are refused, as is a result
 * outside the double range.
 *
 * Example: `gammaFromKinetic(1.5 TeV, m_e)` → 2.9354e6.
 *
 * Source: Particle Data Group, Review of Particle Physics (2024), review "Kinematics"
 * (γ = E/mc², E = T + mc²).
 *
 * Numerics: T/(mc²) in double-double (c² exact), plus 1, rounded once: within about half an ulp.
 */
export const gammaFromKinetic: CalcFunction = {
  name: FN,
  params: [
    { name: 'T', kind: 'energy', description: 'kinetic energy of the body' },
    { name: 'm', kind: 'mass', description: 'rest mass (a mass, or the rest energy mc²)' },
  ],
  returns: 'number',
  doc: {
    summary: 'Lorentz factor γ of a body of mass m with kinetic energy T, computed directly from the energies.',
    formula: '\\gamma = 1 + \\frac{T}{mc^2}',
    domain:
      'T ≥ 0; m > 0 (a body with a rest frame). NaN and ±Infinity are refused, as is a result outside the double range.',
    example: 'gammaFromKinetic(1.5 TeV, m_e)',
    exampleResult: '2.9354e6',
    source: 'Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (γ = E/mc², E = T + mc²).',
    numerics:
      'T/(mc²) is formed in double-double with c² exact, 1 is added and the result rounded once: within about half an ulp. lorentzFactor(speedFromKinetic(T, m)) gives the same through the precise-speed companion; this is the direct route.',
  },
  kernel: (T: KernelArgument, m: KernelArgument): number => {
    requireNonNegative(FN, 'T', T as number, 'J', 'a kinetic energy');
    requirePositive(FN, 'm', m as number, 'kg', 'a body with a rest frame has mass');
    return finiteResult(FN, round(gammaFromKineticDD(dd(T as number), m as number)));
  },
};
