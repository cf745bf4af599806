import { finiteResult, requireNonNegative, requirePositive } from './support/domain';
import { dd, div, round } from './support/double-double';
import { C_DD } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'betaGammaFromMomentum';

/**
 * betaGammaFromMomentum(p, m) — βγ of a body of mass m with momentum p.
 *
 * Formula: βγ = p/(mc).
 *
 * Domain: p ≥ 0 (a momentum magnitude), m > 0; NaN and ±Infinity are refused, as is a result
 * outside the double range.
 *
 * Example: `betaGammaFromMomentum(1 GeV, m_p)` (p = 1 GeV/c, written as pc) → 1.0658.
 *
 * Source: Particle Data Group, Review of Particle Physics (2024), review "Kinematics"
 * (p = γmβc, i.e. βγ = p/(mc)).
 *
 * Numerics: p/m, then /c, in double-double (no product that could leave the double range), rounded once.
 */
export const betaGammaFromMomentum: CalcFunction = {
  name: FN,
  params: [
    { name: 'p', kind: 'momentum', description: 'momentum of the body (a momentum, or pc as an energy)' },
    { name: 'm', kind: 'mass', description: 'rest mass (a mass, or the rest energy mc²)' },
  ],
  returns: 'number',
  doc: {
    summary: 'βγ = p/(mc) of a body of mass m with momentum p.',
    formula: '\\beta\\gamma = \\frac{p}{mc}',
    domain:
      'p ≥ 0 (a momentum magnitude); m > 0. NaN and ±Infinity are refused, as is a result outside the double range.',
    example: 'betaGammaFromMomentum(1 GeV, m_p)',
    exampleResult: '1.0658 (a proton of 1 GeV/c)',
    source: 'Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (p = γmβc).',
    numerics: 'p/m and then /c in double-double, rounded once: within about half an ulp.',
  },
  kernel: (p: KernelArgument, m: KernelArgument): number => {
    requireNonNegative(FN, 'p', p as number, 'kg m/s', 'a momentum magnitude');
    requirePositive(FN, 'm', m as number, 'kg', 'a body with a rest frame has mass');
    return finiteResult(FN, round(div(div(dd(p as number), dd(m as number)), C_DD)));
  },
};
