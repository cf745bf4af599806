import { finiteResult, requireFinite } from './support/domain';
import { dd, div, mul, round, sub } from './support/double-double';
import { ONE } from './support/kinematics';
import { type CalcFunction, DomainError } from './types';

const FN = 'slipFactor';

/**
 * slipFactor(alpha_c, gamma) — the phase-slip factor η of a ring with momentum compaction factor
 * α_c for particles of Lorentz factor γ: how the revolution period changes with momentum.
 *
 * Formula: η = α_c − 1/γ² (= 1/γ_t² − 1/γ² with γ_t = 1/√α_c).
 *
 * Sign convention (stated because texts differ): η = α_c − 1/γ² with ΔT/T = η Δp/p and
 * Δf/f = −η Δp/p, so η < 0 below transition (a particle with more momentum goes round sooner) and
 * η > 0 above it; as in S. Y. Lee, Accelerator Physics. Some texts, e.g. H. Wiedemann, Particle
 * Accelerator Physics, use the opposite sign, η_c = 1/γ² − α_c with Δf/f = η_c Δp/p: negate the
 * result for those.
 *
 * Domain: α_c finite (either sign: negative-momentum-compaction lattices exist); γ ≥ 1; NaN and
 * ±Infinity are refused.
 *
 * Example: `slipFactor(3.225e-4, 450 GeV / (m_p * c^2))` → 3.1815e-4 (an LHC-like ring with
 * α_c = 3.225e-4 at 450 GeV total energy, above transition).
 *
 * Source: S. Y. Lee, Accelerator Physics, 3rd ed. (2012), ch. 3 (synchrotron motion: η = α_c − 1/γ²);
 * the opposite sign: H. Wiedemann, Particle Accelerator Physics (η_c = 1/γ² − α_c).
 *
 * Numerics: near transition α_c and 1/γ² are nearly equal and their difference cancels; 1/γ² is
 * formed in double-double and the difference is exact, so the result is the correctly rounded
 * value of α_c − 1/γ² for the given inputs however close γ is to γ_t.
 */
export const slipFactor: CalcFunction = {
  name: FN,
  params: [
    { name: 'alpha_c', kind: 'number', description: 'momentum compaction factor α_c = (ΔC/C)/(Δp/p)' },
    { name: 'gamma', kind: 'number', description: 'Lorentz factor γ of the beam (≥ 1)' },
  ],
  returns: 'number',
  doc: {
    summary: 'Phase-slip factor η = α_c − 1/γ² of a ring (ΔT/T = η Δp/p, Δf/f = −η Δp/p: negative below transition).',
    formula:
      '\\eta = \\alpha_c - \\frac{1}{\\gamma^2} = \\frac{1}{\\gamma_t^2} - \\frac{1}{\\gamma^2},\\qquad \\frac{\\Delta T}{T} = \\eta\\,\\frac{\\Delta p}{p},\\ \\frac{\\Delta f}{f} = -\\eta\\,\\frac{\\Delta p}{p}',
    domain:
      'α_c finite, either sign (negative momentum compaction is allowed); γ ≥ 1. NaN and ±Infinity are refused. Sign convention: η = α_c − 1/γ², negative below transition (as in S. Y. Lee, Accelerator Physics); texts that write η_c = 1/γ² − α_c (e.g. H. Wiedemann, Particle Accelerator Physics) have the opposite sign.',
    example: 'slipFactor(3.225e-4, 450 GeV / (m_p * c^2))',
    exampleResult: '3.1815e-4 (an LHC-like ring, α_c = 3.225e-4, at 450 GeV total energy: above transition)',
    source:
      'S. Y. Lee, Accelerator Physics, 3rd ed. (2012), ch. 3 (η = α_c − 1/γ², ΔT/T = η Δp/p). Opposite sign convention: H. Wiedemann, Particle Accelerator Physics (η_c = 1/γ² − α_c).',
    numerics:
      'Near transition α_c and 1/γ² nearly cancel. 1/γ² is formed in double-double and the difference is exact, so the result is α_c − 1/γ² correctly rounded for the given inputs however close γ is to γ_t (the double 1/(γ*γ) alone would leave only the digits beyond the cancellation).',
  },
  kernel: (alphaArg: number, gammaArg: number): number => {
    const alpha = requireFinite(FN, 'alpha_c', alphaArg);
    const gamma = requireFinite(FN, 'gamma', gammaArg);
    if (!(gamma >= 1)) throw new DomainError(`${FN}: gamma must be ≥ 1 (a Lorentz factor); got gamma = ${gamma}`);
    const inverse = div(ONE, dd(gamma));
    return finiteResult(FN, round(sub(dd(alpha), mul(inverse, inverse))));
  },
};
