import { requireNonNegative } from './support/domain';
import { dd, div } from './support/double-double';
import { hypotOne } from './support/elementary';
import { C_DD, massiveResult, ONE, speedValue } from './support/kinematics';
import { type CalcFunction, DomainError, type KernelArgument, type PreciseSpeed } from './types';

const FN = 'speedFromMomentum';

function precise(pArg: KernelArgument, mArg: KernelArgument): PreciseSpeed | number {
  const p = requireNonNegative(FN, 'p', pArg as number, 'kg m/s', 'a momentum magnitude');
  const m = requireNonNegative(FN, 'm', mArg as number, 'kg', 'a rest mass');
  if (m === 0) {
    if (p === 0)
      throw new DomainError(
        `${FN}: the speed of a massless particle with no momentum is undefined; got p = 0 kg m/s, m = 0 kg`,
      );
    return { beta: [1, 0], inverseGamma: [0, 0] };
  }
  // y = βγ = p/(mc); β = y/√(1 + y²) and 1/γ = 1/√(1 + y²), without cancellation or overflow.
  const y = div(div(dd(p), dd(m)), C_DD);
  // Beyond y = 2^500, √(1 + y²) = y to far below an ulp (and y may be infinite: no companion then).
  if (!(y[0] <= 2 ** 500)) return massiveResult([1, 0], div(ONE, y));
  const root = hypotOne(y);
  return massiveResult(div(y, root), div(ONE, root));
}

/**
 * speedFromMomentum(p, m) — the speed of a body of mass m with momentum p.
 *
 * Formula: β = y/√(1 + y²) with y = βγ = p/(mc); textbook β = pc/E, E = √(p²c² + m²c⁴).
 *
 * Domain: p ≥ 0, m ≥ 0; m = 0 (massless) gives c for p > 0, and p = m = 0 is refused. NaN and
 * ±Infinity are refused. A speed that rounds to c is returned as the largest double below 1, with
 * its precise companion (lorentzFactor of the result is still exact).
 *
 * Example: `speedFromMomentum(1 GeV, m_p)` (p = 1 GeV/c, written as pc) → 2.1863e8 m/s (β = 0.72926).
 *
 * Source: Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (β = pc/E,
 * E² = p²c² + m²c⁴).
 *
 * Numerics: y = p/(mc) in double-double; √(1 + y²) without overflow (hypot form); β and 1/γ are
 * quotients without subtraction, rounded once. The result carries 1/γ exactly, so that
 * lorentzFactor of it is as precise as the momentum.
 */
export const speedFromMomentum: CalcFunction = {
  name: FN,
  params: [
    { name: 'p', kind: 'momentum', description: 'momentum of the body (a momentum, or pc as an energy)' },
    { name: 'm', kind: 'mass', description: 'rest mass (a mass, or the rest energy mc²); 0 for a massless particle' },
  ],
  returns: 'speed',
  doc: {
    summary: 'Speed of a body of mass m with momentum p.',
    formula:
      '\\beta = \\frac{y}{\\sqrt{1 + y^2}},\\quad y = \\beta\\gamma = \\frac{p}{mc} \\quad\\left(= \\frac{pc}{E},\\ E = \\sqrt{p^2c^2 + m^2c^4}\\right)',
    domain:
      'p ≥ 0 and m ≥ 0; m = 0 gives c for p > 0, and p = m = 0 is refused. NaN and ±Infinity are refused. A speed that rounds to c is returned as the largest double below 1, with its precise companion: lorentzFactor of the result is still exact.',
    example: 'speedFromMomentum(1 GeV, m_p)',
    exampleResult: '2.1863e8 m/s (β = 0.72926, a proton of 1 GeV/c)',
    source: 'Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (β = pc/E, E² = p²c² + m²c⁴).',
    numerics:
      'y = p/(mc) in double-double; √(1 + y²) in the hypot form (no overflow for huge y); β = y/√(1 + y²) and 1/γ = 1/√(1 + y²) have no subtraction and are rounded once (within about half an ulp). 1/γ travels with the result (the precise-speed companion).',
  },
  kernel: (p: KernelArgument, m: KernelArgument): number => speedValue(precise(p, m)),
  preciseKernel: precise,
};
