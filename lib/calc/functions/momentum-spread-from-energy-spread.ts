import { finiteResult, requireFinite } from './support/domain';
import { dd, div, mul, round } from './support/double-double';
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
 * momentumSpreadFromEnergySpread(dE_over_E, v) — the relative momentum spread Δp/p that goes with a
 * relative spread ΔE/E of the TOTAL energy E = γmc², for particles of speed v.
 *
 * Formula: Δp/p = (1/β²) ΔE/E (from E² = p²c² + m²c⁴: dE/E = β² dp/p).
 *
 * Domain: 0 < |β| < 1; NaN and ±Infinity are refused. E is the total energy: a kinetic-energy
 * spread converts as ΔE/E = (ΔT/T)·T/E (ΔT = ΔE), and ΔT/T = (1 + 1/γ) Δp/p.
 *
 * Example: `momentumSpreadFromEnergySpread(1e-3, 0.5)` → 0.004 (β = 0.5: ΔE/E = 1e-3 is Δp/p = 4e-3).
 *
 * Source: common practice; PDG Review of Particle Physics, "Kinematics" (E² = p²c² + m²c⁴); H.
 * Wiedemann, Particle Accelerator Physics, 4th ed. (2015), ch. 8.
 *
 * Numerics: β² in double-double (from the precise-speed companion when β comes from the library);
 * rounded once.
 */
export const momentumSpreadFromEnergySpread: CalcFunction = {
  name: 'momentumSpreadFromEnergySpread',
  params: [
    {
      name: 'dE_over_E',
      kind: 'number',
      description: 'relative spread ΔE/E of the total energy (rest energy included)',
    },
    { name: 'v', kind: 'speed', description: 'speed of the particles (a velocity, or β)' },
  ],
  returns: 'number',
  doc: {
    summary:
      'Relative momentum spread Δp/p = ΔE/(β²E) for a relative spread of the total energy E = γmc² (not the kinetic energy).',
    formula: '\\frac{\\Delta p}{p} = \\frac{1}{\\beta^2}\\,\\frac{\\Delta E}{E}',
    domain:
      '0 < |β| < 1. E is the total energy γmc²: for a kinetic-energy spread ΔT/T, ΔE/E = (ΔT/T)·T/E. NaN and ±Infinity are refused.',
    example: 'momentumSpreadFromEnergySpread(1e-3, 0.5)',
    exampleResult: '0.004',
    source:
      'Common practice; PDG Review of Particle Physics, "Kinematics"; H. Wiedemann, Particle Accelerator Physics, 4th ed. (2015), ch. 8.',
    numerics: 'β² in double-double (with the precise-speed companion when β comes from the library); rounded once.',
  },
  kernel: (x: KernelArgument, v: KernelArgument): number => {
    const spread = requireFinite('momentumSpreadFromEnergySpread', 'dE_over_E', x as number);
    return finiteResult(
      'momentumSpreadFromEnergySpread',
      round(div(dd(spread), betaSquared('momentumSpreadFromEnergySpread', v))),
    );
  },
};
