import { finiteResult, requireFinite } from './support/domain';
import { dd, mul, round } from './support/double-double';
import { massiveSpeed } from './support/kinematics';
import { type CalcFunction, DomainError, type KernelArgument } from './types';

function betaSquared(fn: string, v: KernelArgument) {
  const speed = massiveSpeed(fn, 'v', v);
  const b2 = mul(speed.beta, speed.beta);
  if (!(b2[0] > 0))
    throw new DomainError(
      `${fn}: the particle must move (β ≠ 0): at rest a momentum spread has no energy spread to match`,
    );
  return b2;
}

/**
 * energySpreadFromMomentumSpread(dp_over_p, v) — the relative spread ΔE/E of the TOTAL energy
 * E = γmc² that goes with a relative momentum spread Δp/p, for particles of speed v: the inverse of
 * momentumSpreadFromEnergySpread.
 *
 * Formula: ΔE/E = β² Δp/p (from E² = p²c² + m²c⁴).
 *
 * Domain: 0 < |β| < 1; NaN and ±Infinity are refused. The kinetic-energy spread is
 * ΔT/T = (ΔE/E)·E/T (ΔT = ΔE).
 *
 * Example: `energySpreadFromMomentumSpread(4e-3, 0.5)` → 0.001.
 *
 * Source: common practice; PDG Review of Particle Physics, "Kinematics"; H. Wiedemann, Particle
 * Accelerator Physics, 4th ed. (2015), ch. 8.
 *
 * Numerics: β² in double-double (from the precise-speed companion when β comes from the library);
 * rounded once.
 */
export const energySpreadFromMomentumSpread: CalcFunction = {
  name: 'energySpreadFromMomentumSpread',
  params: [
    { name: 'dp_over_p', kind: 'number', description: 'relative momentum spread Δp/p' },
    { name: 'v', kind: 'speed', description: 'speed of the particles (a velocity, or β)' },
  ],
  returns: 'number',
  doc: {
    summary:
      'Relative spread ΔE/E = β² Δp/p of the total energy E = γmc² (not the kinetic energy) for a relative momentum spread.',
    formula: '\\frac{\\Delta E}{E} = \\beta^2\\,\\frac{\\Delta p}{p}',
    domain:
      '0 < |β| < 1. E is the total energy γmc²: the kinetic-energy spread is ΔT/T = (ΔE/E)·E/T. NaN and ±Infinity are refused.',
    example: 'energySpreadFromMomentumSpread(4e-3, 0.5)',
    exampleResult: '0.001',
    source:
      'Common practice; PDG Review of Particle Physics, "Kinematics"; H. Wiedemann, Particle Accelerator Physics, 4th ed. (2015), ch. 8.',
    numerics: 'β² in double-double (with the precise-speed companion when β comes from the library); rounded once.',
  },
  kernel: (x: KernelArgument, v: KernelArgument): number => {
    const spread = requireFinite('energySpreadFromMomentumSpread', 'dp_over_p', x as number);
    return finiteResult(
      'energySpreadFromMomentumSpread',
      round(mul(dd(spread), betaSquared('energySpreadFromMomentumSpread', v))),
    );
  },
};
