import { H_PLANCK } from '../constants';
import { finiteResult, requirePositive } from './support/domain';
import { dd, div, round } from './support/double-double';
import { decimalConstant } from './support/kinematics';
import type { CalcFunction } from './types';

const FN = 'wavelengthFromMomentum';

const PLANCK = decimalConstant(H_PLANCK);

/**
 * wavelengthFromMomentum(p) — the de Broglie wavelength λ = h/p of a particle of momentum p (any
 * particle; for a photon, p = E/c).
 *
 * Formula: λ = h/p.
 *
 * Domain: p > 0 (a momentum, or an energy read as pc, so a photon's energy gives its wavelength);
 * NaN and ±Infinity are refused; a result beyond the double range is refused.
 *
 * Example: `wavelengthFromMomentum(1 eV) to nm` → 1239.8 nm (a photon of 1 eV: hc = 1239.841 98 eV·nm).
 *
 * Source: L. de Broglie (1924); CODATA 2022 (hc = 1.239 841 984… × 10⁻⁶ eV·m, exact from h, c, e).
 *
 * Numerics: h at its defined value over p; rounded once.
 */
export const wavelengthFromMomentum: CalcFunction = {
  name: FN,
  params: [{ name: 'p', kind: 'momentum', description: 'momentum (or an energy read as pc, e.g. a photon energy)' }],
  returns: 'length',
  doc: {
    summary: 'de Broglie wavelength h/p of a particle of momentum p (a photon: give its energy, read as pc).',
    formula: '\\lambda = \\frac{h}{p}',
    domain:
      'p > 0 (a momentum, or an energy read as pc). NaN and ±Infinity are refused; a result beyond the double range is refused. A kinetic energy is not a momentum: use wavelengthFromKinetic(T, m).',
    example: 'wavelengthFromMomentum(1 eV) to nm',
    exampleResult: '1239.8 nm (a photon of 1 eV)',
    source: 'L. de Broglie (1924); CODATA 2022: hc = 1.239 841 984… × 10⁻⁶ eV·m (exact from h, c and e).',
    numerics: 'h at its defined value over p; rounded once.',
  },
  kernel: (p: number): number => {
    requirePositive(FN, 'p', p, 'kg m/s', 'a momentum');
    return finiteResult(FN, round(div(PLANCK, dd(p))));
  },
};
