import { E_CHARGE } from '../constants';
import { finiteResult, requirePositive, ROUNDING_ALLOWANCE } from './support/domain';
import { add, dd, div, mul, round, sqrt, sub } from './support/double-double';
import { decimalConstant, ONE, restEnergy } from './support/kinematics';
import { type CalcFunction, DomainError } from './types';

const FN = 'synchrotronLossPerTurn';

/** Vacuum electric permittivity ε0, F/m: CODATA 2022, 8.854 187 8188(14) × 10⁻¹² (not exact since SI 2019). */
export const EPSILON_0 = 8.854_187_8188e-12;

/** e²/(3ε0), J m: the prefactor of the loss per turn, from the decimal values of e and ε0. */
const PREFACTOR = (() => {
  const e = decimalConstant(E_CHARGE);
  return div(mul(e, e), mul(dd(3), decimalConstant(EPSILON_0)));
})();

/**
 * synchrotronLossPerTurn(E, rho, m) — the energy radiated in one turn by a singly charged particle of
 * total energy E and mass m on an isomagnetic ring (all bends of radius ρ, no field elsewhere).
 *
 * Formula: U0 = e² β³γ⁴/(3ε0ρ) with γ = E/(mc²), evaluated as e²/(3ε0ρ) · (βγ)³ γ and
 * (βγ)² = (γ − 1)(γ + 1). For electrons, U0 [keV] = 88.46 E⁴[GeV]/ρ[m].
 *
 * Domain: m > 0, E ≥ mc² (total energy, rest energy included; a shortfall below 2^-50·E, rounding in
 * the inputs, is read as E = mc²), ρ > 0; NaN and ±Infinity are refused.
 *
 * Example: `synchrotronLossPerTurn(3 GeV, 7 m, m_e) to keV` → 1023.6 keV.
 *
 * Source: M. Sands, "The Physics of Electron Storage Rings: An Introduction", SLAC-121 (1970)
 * (U0 = C_γ E⁴/ρ, C_γ = 8.85e-5 m/GeV³); Jackson, Classical Electrodynamics, 3rd ed. (1999), §14.2
 * (relativistic Larmor formula). ε0 from CODATA 2022.
 *
 * Numerics: γ − 1 = (E − mc²)/(mc²) in double-double so low energies keep their digits; the
 * constants at their decimal values; double-double throughout, rounded once.
 */
export const synchrotronLossPerTurn: CalcFunction = {
  name: FN,
  params: [
    { name: 'E', kind: 'energy', description: 'total energy of the particle (rest energy included)' },
    { name: 'rho', kind: 'length', description: 'bending radius of the dipoles' },
    { name: 'm', kind: 'mass', description: 'rest mass of the particle (a mass, or mc²); charge ±e' },
  ],
  returns: 'energy',
  doc: {
    summary:
      'Energy radiated per turn by a singly charged particle of total energy E on an isomagnetic ring of bending radius ρ.',
    formula:
      'U_0 = \\frac{e^2}{3\\varepsilon_0\\rho}\\,(\\beta\\gamma)^3\\,\\gamma,\\ (\\beta\\gamma)^2 = (\\gamma-1)(\\gamma+1),\\ \\gamma = \\frac{E}{mc^2} \\quad\\left(= \\frac{e^2\\beta^3\\gamma^4}{3\\varepsilon_0\\rho}\\right)',
    domain:
      'm > 0; E ≥ mc² (total energy, rest energy included; a shortfall below 2^-50·E, about four ulp of rounding in the inputs, is read as E = mc² and gives 0); ρ > 0. The charge is ±e. NaN and ±Infinity are refused.',
    example: 'synchrotronLossPerTurn(3 GeV, 7 m, m_e) to keV',
    exampleResult: '1023.6 keV',
    source:
      'M. Sands, "The Physics of Electron Storage Rings: An Introduction", SLAC-121 (1970): U0 = C_γE⁴/ρ, U0[keV] = 88.46 E⁴[GeV]/ρ[m] for electrons; J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §14.2. ε0 = 8.8541878188e-12 F/m (CODATA 2022).',
    numerics:
      'γ − 1 = (E − mc²)/(mc²) is formed in double-double, so (βγ)² = (γ − 1)(γ + 1) keeps its digits at low energy; e and ε0 enter at their decimal values; double-double throughout, rounded once (within about half an ulp).',
  },
  kernel: (E: number, rho: number, m: number): number => {
    requirePositive(FN, 'E', E, 'J', 'a total energy');
    requirePositive(FN, 'rho', rho, 'm', 'a bending radius');
    requirePositive(FN, 'm', m, 'kg', 'a massive particle');
    const M = restEnergy(m);
    let excess = sub(dd(E), M);
    if (excess[0] < 0) {
      if (-excess[0] > ROUNDING_ALLOWANCE * E) {
        throw new DomainError(
          `${FN}: the total energy E must be at least the rest energy mc² (${round(M)} J); got E = ${E} J`,
        );
      }
      // E entered as m·c² may round an ulp below the exact product: read it as a particle at rest.
      excess = [0, 0];
    }
    const g = div(dd(E), M);
    const betaGammaSquared = mul(div(excess, M), add(g, ONE));
    const betaGamma3 = mul(betaGammaSquared, sqrt(betaGammaSquared));
    return finiteResult(FN, round(div(mul(PREFACTOR, mul(betaGamma3, g)), dd(rho))));
  },
};
