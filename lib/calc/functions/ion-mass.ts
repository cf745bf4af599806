import { C, E_CHARGE, M_ALPHA, M_DEUTERON, M_E, M_HELION, M_P, M_TRITON, M_U } from '../constants';
import { finiteResult, requireFinite, requirePositive } from './support/domain';
import { add, dd, round, sub, twoProd } from './support/double-double';
import { type CalcFunction, DomainError, type KernelArgument } from './types';

const FN = 'ionMass';

/** Heaviest atomic number accepted (oganesson). */
const Z_MAX = 118;

/**
 * Total binding energy of all Z electrons of a neutral atom, in eV: the fit of D. Lunney,
 * J. M. Pearson and C. Thibault, Rev. Mod. Phys. 75 (2003) 1021, appendix A, eq. (A4).
 */
export function electronBindingEnergyEV(Z: number): number {
  return 14.4381 * Z ** 2.39 + 1.55468e-6 * Z ** 5.35;
}

/** The nuclear masses of the constants table: an ion's mass starts from an ATOMIC mass instead. */
const NUCLEAR_MASSES: ReadonlyMap<number, string> = new Map([
  [M_P, 'm_p is the proton (¹H nucleus): give the atomic mass M_H1'],
  [M_DEUTERON, 'm_d is the deuteron (²H nucleus): give the atomic mass of ²H'],
  [M_TRITON, 'm_triton is the ³H nucleus: give the atomic mass of ³H'],
  [M_HELION, 'm_helion is the ³He nucleus: give the atomic mass of ³He'],
  [M_ALPHA, 'm_alpha is the ⁴He nucleus: give the atomic mass M_He4'],
]);

/** The charge state as an integer number of electrons removed (the adapter passes a charge in C). */
function chargeState(q: number): number {
  const n = q / E_CHARGE;
  const whole = Math.round(n);
  if (Math.abs(n - whole) > 1e-9 * Math.max(1, Math.abs(whole))) {
    throw new DomainError(
      `${FN}: the charge state q must be a whole number of elementary charges; got q = ${q} C (${n} e)`,
    );
  }
  return whole;
}

/**
 * ionMass(M_atom, Z, q) — the mass of the ion of charge state q (q electrons removed) of an atom of
 * atomic number Z whose NEUTRAL atomic mass is M_atom (electrons included, as tabulated: M_C12,
 * M_He4 …).
 *
 * Formula: m_ion = M_atom − q·m_e + B_el(Z)/c² for the fully stripped ion (q = Z), with the total
 * electron binding energy of the atom B_el(Z) = 14.4381 Z^2.39 + 1.55468e-6 Z^5.35 eV (Lunney,
 * Pearson & Thibault 2003, eq. A4); m_ion = M_atom − q·m_e for 0 ≤ q < Z and for q = −1.
 *
 * What is neglected, and how much: the fit B_el(Z) is itself approximate (our comparison with the
 * sums of the NIST ionization energies: 14.44 eV against 13.60 eV for H, 75.7 eV against 79.0 eV
 * for He, 1045 eV against 1030 eV for C; below 1e-9 of the ion's mass in each case). For a
 * partially stripped ion (0 < q < Z) the binding energy of the q removed electrons (the sum of the
 * first q ionization energies) is NOT added: it lies between 0 and B_el(Z), so the result is low
 * by at most B_el(Z)/c² (1.0 keV/c², 9e-8 relative, for carbon; 3.5 keV/c², 1.9e-7, for neon). For a
 * negative ion (q = −1, e.g. H⁻) the electron affinity (below 3.7 eV for every element) is neglected.
 *
 * Domain: M_atom > 0 and at least 0.99·Z u (an atom has A ≥ Z nucleons); Z an integer from 1 to 118;
 * q a whole number of elementary charges from −1 to Z (a charge such as 6 q_e, or the charge number
 * 6). A nuclear mass of the constants table (m_p, m_d, m_alpha …) is refused: the electrons would be
 * removed twice.
 *
 * Example: `ionMass(M_C12, 6, 6) to u` → 11.99671 u (the ¹²C⁶⁺ nucleus).
 *
 * Source: AME 2020 convention (atomic masses of neutral atoms; W. J. Huang et al., Chinese Phys. C
 * 45 (2021) 030002); D. Lunney, J. M. Pearson, C. Thibault, Rev. Mod. Phys. 75 (2003) 1021, eq. (A4).
 *
 * Numerics: M_atom − q·m_e (an exact product) plus the binding term in double-double, rounded once;
 * the binding term is about 1e-7 of the mass, so its own rounding does not show.
 */
export const ionMass: CalcFunction = {
  name: FN,
  params: [
    {
      name: 'M_atom',
      kind: 'mass',
      description: 'atomic mass of the NEUTRAL atom, electrons included (M_C12, M_He4, or an AME 2020 value in u)',
    },
    {
      name: 'Z',
      kind: 'number',
      description: 'atomic number of the element (protons in the nucleus: 6 for carbon); not the charge state',
    },
    {
      name: 'q',
      kind: 'charge',
      description: 'charge state: electrons removed (6 or 6 q_e for C⁶⁺, 4 for C⁴⁺, −1 for H⁻)',
    },
  ],
  returns: 'mass',
  doc: {
    summary:
      'Mass of the ion of charge state q of an atom of atomic number Z, from the neutral atomic mass: q electrons removed, and for a fully stripped ion (q = Z) the electrons’ total binding energy added back (Lunney, Pearson & Thibault 2003, eq. A4). For 0 < q < Z the removed electrons’ binding is neglected (the result is low by at most B_el(Z)/c²: 9e-8 relative for carbon).',
    formula:
      'm_{\\mathrm{ion}} = M_{\\mathrm{atom}} - q\\,m_{\\mathrm{e}} + \\frac{B_{\\mathrm{el}}(Z)}{c^2}\\ (q = Z),\\quad B_{\\mathrm{el}}(Z) = \\left(14.4381\\,Z^{2.39} + 1.55468\\times10^{-6}\\,Z^{5.35}\\right)\\,\\mathrm{eV}; \\quad m_{\\mathrm{ion}} = M_{\\mathrm{atom}} - q\\,m_{\\mathrm{e}}\\ (q < Z)',
    domain:
      'M_atom > 0, at least 0.99·Z u (A ≥ Z nucleons), the mass of the NEUTRAL atom: a nuclear mass of the constants table (m_p, m_d, m_triton, m_helion, m_alpha) is refused. Z an integer 1 … 118 (atomic number). q a whole number of elementary charges, −1 ≤ q ≤ Z (electrons removed; −1 for a negative ion such as H⁻, whose electron affinity, below 3.7 eV, is neglected). For 0 < q < Z the binding energy of the removed electrons is neglected (low by at most B_el(Z)/c²). NaN and ±Infinity are refused.',
    example: 'ionMass(M_C12, 6, 6) to u',
    exampleResult: '11.99671 u (the ¹²C⁶⁺ nucleus)',
    source:
      'Atomic masses of neutral atoms: AME 2020 (W. J. Huang et al., Chinese Phys. C 45 (2021) 030002); total electron binding energy: D. Lunney, J. M. Pearson, C. Thibault, Rev. Mod. Phys. 75 (2003) 1021, appendix A, eq. (A4).',
    numerics:
      'M_atom − q·m_e with the product exact (Dekker) and the binding term added in double-double, rounded once. The binding fit is good to a few percent of B_el (a few eV for light atoms), i.e. below 1e-9 of the ion’s mass for the therapy ions.',
  },
  kernel: (MArg: KernelArgument, ZArg: KernelArgument, qArg: KernelArgument): number => {
    const M = requirePositive(FN, 'M_atom', MArg as number, 'kg', 'the atomic mass of the neutral atom');
    const Z = requireFinite(FN, 'Z', ZArg as number);
    const q = requireFinite(FN, 'q', qArg as number);
    if (!Number.isInteger(Z) || Z < 1 || Z > Z_MAX) {
      throw new DomainError(
        `${FN}: Z is the atomic number, an integer from 1 to ${Z_MAX} (6 for carbon); got Z = ${Z}`,
      );
    }
    const nuclear = NUCLEAR_MASSES.get(M);
    if (nuclear)
      throw new DomainError(`${FN}: M_atom must be the mass of the neutral atom, electrons included; ${nuclear}`);
    if (M < 0.99 * Z * M_U) {
      throw new DomainError(
        `${FN}: M_atom = ${M} kg is too light for an atom of atomic number Z = ${Z} (at least 0.99·Z u = ${0.99 * Z * M_U} kg): is it an atomic mass, and are M_atom and Z in their places?`,
      );
    }
    const n = chargeState(q);
    if (n < -1 || n > Z) {
      throw new DomainError(
        `${FN}: the charge state q (electrons removed) must be between −1 and Z = ${Z}; got q = ${n}`,
      );
    }
    let m = sub(dd(M), twoProd(n, M_E));
    if (n === Z) m = add(m, dd((electronBindingEnergyEV(Z) * E_CHARGE) / (C * C)));
    return finiteResult(FN, round(m));
  },
};
