import { finiteResult, requireNonNegative } from './support/domain';
import { mulNum, round } from './support/double-double';
import { gammaOfSpeed, massiveSpeed } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'timeDilation';

/**
 * timeDilation(dtau, v) — the coordinate-time interval Δt = γΔτ in which a clock moving at v
 * ticks off the proper interval Δτ.
 *
 * Formula: Δt = γ Δτ = Δτ/√((1 − β)(1 + β)).
 *
 * Domain: Δτ ≥ 0 (an elapsed proper time), |β| < 1; NaN and ±Infinity are refused.
 *
 * Example: `timeDilation(2.1969811 us, 0.8)` (a muon's mean life at 0.8 c) → 3.6616 µs.
 *
 * Source: Einstein, Annalen der Physik 17 (1905), §4; Jackson, Classical Electrodynamics, 3rd ed.
 * (1999), §11.3.
 *
 * Numerics: γ in double-double (1 − β² exact), multiplied by Δτ in double-double, rounded once.
 */
export const timeDilation: CalcFunction = {
  name: FN,
  params: [
    { name: 'dtau', kind: 'time', description: 'proper time interval Δτ shown by the moving clock' },
    { name: 'v', kind: 'speed', description: 'speed of the clock (a velocity, or β)' },
  ],
  returns: 'time',
  doc: {
    summary: 'The coordinate interval γΔτ for a proper interval Δτ of a clock moving at v.',
    formula: '\\Delta t = \\gamma\\,\\Delta\\tau = \\frac{\\Delta\\tau}{\\sqrt{(1-\\beta)(1+\\beta)}}',
    domain: 'Δτ ≥ 0 (an elapsed proper time); |β| < 1. NaN and ±Infinity are refused.',
    example: 'timeDilation(2.1969811 us, 0.8)',
    exampleResult: '3.66163517e-6 s (a muon mean life seen at 0.8 c)',
    source:
      'A. Einstein, "Zur Elektrodynamik bewegter Körper", Annalen der Physik 17 (1905), §4; J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.3.',
    numerics:
      'γ is formed in double-double with 1 − β² exact, multiplied by Δτ in double-double and rounded once (within about half an ulp).',
  },
  kernel: (dtau: KernelArgument, v: KernelArgument): number => {
    requireNonNegative(FN, 'dtau', dtau as number, 's', 'an elapsed proper time');
    const speed = massiveSpeed(FN, 'v', v);
    return finiteResult(FN, round(mulNum(gammaOfSpeed(speed), dtau as number)));
  },
};
