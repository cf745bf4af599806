import { finiteResult, requirePositive } from './support/domain';
import { dd, div, mul, neg, round } from './support/double-double';
import { betaOf, C_DD, massiveSpeed } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'revolutionFrequency';

/**
 * revolutionFrequency(v, L) — the revolution frequency f = v/L of a particle of speed v on a closed
 * orbit of length L (a ring's circumference).
 *
 * Formula: f = βc/L.
 *
 * Domain: 0 < |β| < 1 (a massive particle; the sign is dropped); L > 0; NaN and ±Infinity are refused.
 *
 * Example: `revolutionFrequency(speedFromKinetic(7 TeV, m_p), 26658.883 m) to kHz` → 11.245 kHz (the
 * LHC at 7 TeV).
 *
 * Source: common practice (f = v/L); LHC Design Report, CERN-2004-003 (circumference 26 658.883 m,
 * revolution frequency 11.245 kHz).
 *
 * Numerics: βc/L in double-double (β with its precise-speed companion when it comes from the
 * library); rounded once.
 */
export const revolutionFrequency: CalcFunction = {
  name: FN,
  params: [
    { name: 'v', kind: 'speed', description: 'speed of the particle (a velocity, or β)' },
    { name: 'L', kind: 'length', description: 'length of the closed orbit (circumference)' },
  ],
  returns: 'frequency',
  doc: {
    summary: 'Revolution frequency v/L of a particle of speed v on a closed orbit of length L.',
    formula: 'f_{\\mathrm{rev}} = \\frac{\\beta c}{L}',
    domain: '0 < |β| < 1 (the sign is dropped); L > 0. NaN and ±Infinity are refused.',
    example: 'revolutionFrequency(speedFromKinetic(7 TeV, m_p), 26658.883 m) to kHz',
    exampleResult: '11.245 kHz (the LHC at 7 TeV)',
    source: 'Common practice (f = v/L); LHC Design Report, CERN-2004-003 (26 658.883 m; 11.245 kHz).',
    numerics: 'βc/L in double-double, β with its precise-speed companion when it comes from the library; rounded once.',
  },
  kernel: (v: KernelArgument, L: KernelArgument): number => {
    const speed = massiveSpeed(FN, 'v', v);
    requirePositive(FN, 'v', Math.abs(betaOf(speed)), 'β', 'a moving particle');
    requirePositive(FN, 'L', L as number, 'm', 'an orbit length');
    const beta = speed.beta[0] < 0 ? neg(speed.beta) : speed.beta;
    return finiteResult(FN, round(div(mul(beta, C_DD), dd(L as number))));
  },
};
