import { finiteResult, requirePositive } from './support/domain';
import { dd, div, round, sqrt } from './support/double-double';
import { ONE } from './support/kinematics';
import type { CalcFunction } from './types';

const FN = 'transitionGamma';

/**
 * transitionGamma(alpha_c) — the transition Lorentz factor γ_t of a ring with momentum compaction
 * factor α_c: the energy at which the phase-slip factor η = α_c − 1/γ² changes sign (see slipFactor).
 *
 * Formula: γ_t = 1/√α_c.
 *
 * Domain: α_c > 0 (a ring with α_c ≤ 0 has no transition: η stays negative, or γ_t is imaginary);
 * NaN and ±Infinity are refused.
 *
 * Example: `transitionGamma(3.225e-4)` → 55.685 (an LHC-like ring; the LHC Design Report quotes
 * α_c = 3.225e-4 and γ_t = 55.68).
 *
 * Source: S. Y. Lee, Accelerator Physics, 3rd ed. (2012), ch. 3; LHC Design Report, CERN-2004-003,
 * vol. I (α_c and γ_t of the LHC).
 *
 * Numerics: √α_c and the reciprocal in double-double, rounded once (within about half an ulp).
 */
export const transitionGamma: CalcFunction = {
  name: FN,
  params: [{ name: 'alpha_c', kind: 'number', description: 'momentum compaction factor α_c = (ΔC/C)/(Δp/p), > 0' }],
  returns: 'number',
  doc: {
    summary: 'Transition Lorentz factor γ_t = 1/√α_c of a ring: where the phase-slip factor changes sign.',
    formula: '\\gamma_t = \\frac{1}{\\sqrt{\\alpha_c}}',
    domain: 'α_c > 0 (with α_c ≤ 0 there is no transition energy). NaN and ±Infinity are refused.',
    example: 'transitionGamma(3.225e-4)',
    exampleResult: '55.685 (an LHC-like ring: α_c = 3.225e-4)',
    source:
      'S. Y. Lee, Accelerator Physics, 3rd ed. (2012), ch. 3 (γ_t = 1/√α_c); LHC Design Report, CERN-2004-003, vol. I (α_c = 3.225e-4, γ_t = 55.68).',
    numerics: '√α_c and its reciprocal in double-double, rounded once (within about half an ulp).',
  },
  kernel: (alphaArg: number): number => {
    const alpha = requirePositive(FN, 'alpha_c', alphaArg, '', 'a ring with α_c ≤ 0 has no transition energy');
    return finiteResult(FN, round(div(ONE, sqrt(dd(alpha)))));
  },
};
