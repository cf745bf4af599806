import { finiteResult, requireNonNegative } from './support/domain';
import { dd, round } from './support/double-double';
import { kineticFromMomentumDD } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'kineticFromMomentum';

/**
 * kineticFromMomentum(p, m) — the kinetic energy of a body of mass m with momentum p.
 *
 * Formula: T = pc · y/(√(1 + y²) + 1) with y = p/(mc), i.e. T = p²c²/(E + mc²); textbook
 * T = E − mc², E = √(p²c² + m²c⁴).
 *
 * Domain: p ≥ 0, m ≥ 0 (m = 0: a massless particle, T = pc); NaN and ±Infinity are refused, as is a
 * result outside the double range.
 *
 * Example: `kineticFromMomentum(1 GeV, m_p) to MeV` (p = 1 GeV/c, written as pc) → 432.99 MeV.
 *
 * Source: Particle Data Group, Review of Particle Physics (2024), review "Kinematics"
 * (E² = p²c² + m²c⁴, T = E − mc²).
 *
 * Numerics: E − mc² cancels at small p (every digit is lost below p ≈ 1e-8 mc); the quotient
 * p²c²/(E + mc²), written with y = p/(mc) so that nothing is squared, has no subtraction.
 * Double-double, rounded once.
 */
export const kineticFromMomentum: CalcFunction = {
  name: FN,
  params: [
    { name: 'p', kind: 'momentum', description: 'momentum of the body (a momentum, or pc as an energy)' },
    { name: 'm', kind: 'mass', description: 'rest mass (a mass, or the rest energy mc²); 0 for a massless particle' },
  ],
  returns: 'energy',
  doc: {
    summary: 'Kinetic energy of a body of mass m with momentum p.',
    formula:
      'T = \\frac{p^2c^2}{E + mc^2} = pc\\,\\frac{y}{\\sqrt{1+y^2} + 1},\\quad y = \\frac{p}{mc} \\quad\\left(= E - mc^2,\\ E = \\sqrt{p^2c^2 + m^2c^4}\\right)',
    domain:
      'p ≥ 0 and m ≥ 0 (m = 0 is a massless particle: T = pc). NaN and ±Infinity are refused, as is a result outside the double range.',
    example: 'kineticFromMomentum(1 GeV, m_p) to MeV',
    exampleResult: '432.99 MeV (a proton of 1 GeV/c)',
    source:
      'Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (E² = p²c² + m²c⁴, T = E − mc²).',
    numerics:
      'E − mc² loses every digit below p ≈ 1e-8 mc; T = p²c²/(E + mc²), written as pc·y/(√(1 + y²) + 1) with y = p/(mc) so that no square leaves the double range, has no subtraction. Double-double, rounded once (within about half an ulp).',
  },
  kernel: (p: KernelArgument, m: KernelArgument): number => {
    requireNonNegative(FN, 'p', p as number, 'kg m/s', 'a momentum magnitude');
    requireNonNegative(FN, 'm', m as number, 'kg', 'a rest mass');
    return finiteResult(FN, round(kineticFromMomentumDD(dd(p as number), m as number)));
  },
};
