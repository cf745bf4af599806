import { H_PLANCK } from '../constants';
import { finiteResult, requireNonNegative, requirePositive } from './support/domain';
import { add, dd, div, mul, round, scale, sqrt } from './support/double-double';
import { C_DD, decimalConstant, restEnergy } from './support/kinematics';
import type { CalcFunction } from './types';

const FN = 'wavelengthFromKinetic';

const PLANCK_TIMES_C = mul(decimalConstant(H_PLANCK), C_DD);

/**
 * wavelengthFromKinetic(T, m) — the de Broglie wavelength λ = h/p of a particle of mass m with
 * kinetic energy T (any particle: electrons, neutrons, protons, ions; m = 0 for a photon, λ = hc/T).
 *
 * Formula: λ = hc / √(T (T + 2mc²)).
 *
 * Domain: T > 0; m ≥ 0 (a mass, or an energy read as mc²); NaN and ±Infinity are refused; a result
 * beyond the double range is refused.
 *
 * Example: `wavelengthFromKinetic(25.3 meV, m_n) to nm` → 0.17982 nm (1.7982 Å, a thermal neutron).
 *
 * Source: L. de Broglie (1924); the relativistic momentum pc = √(T(T + 2mc²)) as in the PDG Review
 * of Particle Physics, "Kinematics"; G. L. Squires, Introduction to the Theory of Thermal Neutron
 * Scattering (1978), ch. 1 (thermal neutrons, 25.3 meV ↔ 1.798 Å).
 *
 * Numerics: √T·√(T + 2mc²) in double-double (√T rather than the product's root, so a tiny T does not
 * underflow), h at its defined value; rounded once. For an electron it is electronWavelength(T/e).
 */
export const wavelengthFromKinetic: CalcFunction = {
  name: FN,
  params: [
    { name: 'T', kind: 'energy', description: 'kinetic energy' },
    { name: 'm', kind: 'mass', description: 'rest mass (or rest energy); 0 for a photon' },
  ],
  returns: 'length',
  doc: {
    summary:
      'de Broglie wavelength h/p of a particle of mass m and kinetic energy T (any particle; m = 0 for a photon).',
    formula: '\\lambda = \\frac{h}{p} = \\frac{hc}{\\sqrt{T\\,(T + 2mc^2)}}',
    domain:
      'T > 0; m ≥ 0 (a mass, or an energy read as mc²). NaN and ±Infinity are refused; a result beyond the double range is refused.',
    example: 'wavelengthFromKinetic(25.3 meV, m_n) to nm',
    exampleResult: '0.17982 nm (1.7982 Å: a thermal neutron)',
    source:
      'L. de Broglie (1924); PDG Review of Particle Physics, "Kinematics" (pc = √(T(T + 2mc²))); G. L. Squires, Introduction to the Theory of Thermal Neutron Scattering (1978), ch. 1. Constant: h exact (SI 2019).',
    numerics:
      '√T·√(T + 2mc²) in double-double (a tiny T does not underflow), h at its defined value; rounded once. For an electron it equals electronWavelength(T/e).',
  },
  kernel: (T: number, m: number): number => {
    requirePositive(FN, 'T', T, 'J', 'a kinetic energy');
    requireNonNegative(FN, 'm', m, 'kg', 'a rest mass');
    const rootT = T < 2 ** -900 ? scale(sqrt(dd(T * 2 ** 1000)), 2 ** -500) : sqrt(dd(T));
    const pc = mul(rootT, sqrt(add(dd(T), scale(restEnergy(m), 2))));
    return finiteResult(FN, round(div(PLANCK_TIMES_C, pc)));
  },
};
