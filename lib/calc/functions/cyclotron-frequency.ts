import { finiteResult, requireFinite, requireNonNegative, requirePositive } from './support/domain';
import { add, dd, div, mul, round } from './support/double-double';
import { C_SQUARED, restEnergy } from './support/kinematics';
import type { CalcFunction } from './types';

const FN = 'cyclotronFrequency';

const TWO_PI: readonly [number, number] = [6.283185307179586, 2.4492935982947064e-16];

/**
 * cyclotronFrequency(q, B, m, T) — the (relativistic) cyclotron frequency f = |q|B/(2πγm) of a
 * particle of charge q, mass m and kinetic energy T in a magnetic field B.
 *
 * Formula: f = |q| |B| c² / (2π (mc² + T)), i.e. qB/(2πγm) with γ = 1 + T/(mc²).
 *
 * Domain: q a charge or an integer charge number (its sign is dropped); B any field (its sign is
 * dropped); m > 0; T ≥ 0; NaN and ±Infinity are refused.
 *
 * Example: `cyclotronFrequency(1, 1 T, m_p, 0 MeV) to MHz` → 15.245 MHz (a slow proton in 1 T).
 *
 * Source: J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §12.2 (ω_B = qB/(γmc) in
 * Gaussian units); CODATA 2022 (e/(2πm_p) = 15.245 MHz/T).
 *
 * Numerics: |q||B|c²/(2π(mc² + T)) in double-double; rounded once.
 */
export const cyclotronFrequency: CalcFunction = {
  name: FN,
  params: [
    { name: 'q', kind: 'charge', description: 'charge (e.g. 6 q_e) or integer charge number (6 for C⁶⁺)' },
    { name: 'B', kind: 'magnetic-field', description: 'magnetic flux density' },
    { name: 'm', kind: 'mass', description: 'rest mass (or rest energy)' },
    { name: 'T', kind: 'energy', description: 'kinetic energy (0 for the non-relativistic frequency)' },
  ],
  returns: 'frequency',
  doc: {
    summary:
      'Relativistic cyclotron frequency |q|B/(2πγm) of a particle of charge q, mass m and kinetic energy T in a field B.',
    formula: 'f_c = \\frac{|q|\\,B}{2\\pi\\gamma m} = \\frac{|q|\\,B\\,c^2}{2\\pi\\,(mc^2 + T)}',
    domain:
      'q a charge or an integer charge number and B a field (their signs are dropped); m > 0; T ≥ 0. NaN and ±Infinity are refused.',
    example: 'cyclotronFrequency(1, 1 T, m_p, 0 MeV) to MHz',
    exampleResult: '15.245 MHz (a slow proton in 1 T)',
    source: 'J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §12.2; CODATA 2022 (e, m_p).',
    numerics: '|q||B|c²/(2π(mc² + T)) in double-double; rounded once.',
  },
  kernel: (q: number, B: number, m: number, T: number): number => {
    requireFinite(FN, 'q', q);
    requireFinite(FN, 'B', B);
    requirePositive(FN, 'm', m, 'kg', 'a rest mass');
    requireNonNegative(FN, 'T', T, 'J', 'a kinetic energy');
    const numerator = mul(mul(dd(Math.abs(q)), dd(Math.abs(B))), C_SQUARED);
    return finiteResult(FN, round(div(numerator, mul(TWO_PI, add(restEnergy(m), dd(T))))));
  },
};
