import { H_PLANCK } from '../constants';
import { finiteResult, requirePositive, ROUNDING_ALLOWANCE } from './support/domain';
import { div, dd, mul, mulNum, round } from './support/double-double';
import { C_DD, decimalConstant, restEnergy } from './support/kinematics';
import { type CalcFunction, DomainError } from './types';

const FN = 'synchrotronCriticalEnergy';

const TWO_PI: readonly [number, number] = [6.283185307179586, 2.4492935982947064e-16];
/** (3/2) ħc = 3hc/(4π), J m, from the defined h and c. */
const THREE_HALVES_HBAR_C = div(mulNum(mul(decimalConstant(H_PLANCK), C_DD), 1.5), TWO_PI);

/**
 * synchrotronCriticalEnergy(E, rho, m) — the critical photon energy ε_c = ħω_c of the synchrotron
 * radiation of a particle of total energy E and mass m bent on radius ρ: half the radiated power is
 * above it.
 *
 * Formula: ε_c = (3/2) ħc γ³/ρ, γ = E/(mc²) (the ultra-relativistic form). For electrons
 * ε_c [keV] = 2.218 E³[GeV]/ρ[m].
 *
 * Domain: m > 0, E ≥ mc² (total energy, rest energy included; a shortfall below 2^-50·E is read as
 * E = mc²), ρ > 0; NaN and ±Infinity are refused; a result beyond the double range is refused. The
 * formula assumes γ ≫ 1: at low γ it is no longer the spectrum's characteristic energy.
 *
 * Example: `synchrotronCriticalEnergy(3 GeV, 7 m, m_e) to keV` → 8.5562 keV.
 *
 * Source: J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §14.6 (ω_c = (3/2)γ³c/ρ);
 * H. Wiedemann, Particle Accelerator Physics, 4th ed. (2015), ch. 24 (ε_c[keV] = 2.218 E³/ρ).
 *
 * Numerics: γ = E/(mc²) and γ³ in double-double, ħc from the defined h and c; rounded once.
 */
export const synchrotronCriticalEnergy: CalcFunction = {
  name: FN,
  params: [
    { name: 'E', kind: 'energy', description: 'total energy of the particle (rest energy included)' },
    { name: 'rho', kind: 'length', description: 'bending radius' },
    { name: 'm', kind: 'mass', description: 'rest mass of the particle (a mass, or mc²)' },
  ],
  returns: 'energy',
  doc: {
    summary: 'Critical photon energy ε_c = (3/2)ħcγ³/ρ of synchrotron radiation (half the power is radiated above it).',
    formula: '\\varepsilon_c = \\frac{3}{2}\\,\\frac{\\hbar c\\,\\gamma^3}{\\rho},\\quad \\gamma = \\frac{E}{mc^2}',
    domain:
      'm > 0; E ≥ mc² (total energy); ρ > 0. NaN and ±Infinity are refused; a result beyond the double range is refused. Ultra-relativistic form: for γ of a few it is not the characteristic energy of the spectrum.',
    example: 'synchrotronCriticalEnergy(3 GeV, 7 m, m_e) to keV',
    exampleResult: '8.5562 keV',
    source:
      'J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §14.6; H. Wiedemann, Particle Accelerator Physics, 4th ed. (2015), ch. 24. Constants h and c exact (SI 2019).',
    numerics: 'γ = E/(mc²) and γ³ in double-double, (3/2)ħc from the defined h and c; rounded once.',
  },
  kernel: (E: number, rho: number, m: number): number => {
    requirePositive(FN, 'm', m, 'kg', 'the rest mass');
    requirePositive(FN, 'rho', rho, 'm', 'a bending radius');
    requirePositive(FN, 'E', E, 'J', 'a total energy');
    const rest = restEnergy(m);
    if (E < rest[0] * (1 - ROUNDING_ALLOWANCE))
      throw new DomainError(
        `${FN}: E is the total energy and must be at least the rest energy mc² = ${rest[0]} J; got E = ${E} J`,
      );
    const gamma = div(dd(E), rest);
    const g3 = mul(mul(gamma, gamma), gamma);
    return finiteResult(FN, round(div(mul(THREE_HALVES_HBAR_C, g3), dd(rho))));
  },
};
