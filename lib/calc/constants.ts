// Physical constants of the engine, with their provenance. Exact ones are defined by the SI
// (SI Brochure, 9th edition, 2019, table 1 and §2.3.1); the rest are the CODATA 2022 recommended
// values (Mohr, Newell, Taylor, Tiesinga, "CODATA recommended values of the fundamental physical
// constants: 2022", published 2024), each with its standard uncertainty; meson and Λ masses from the
// PDG Review of Particle Physics 2024, atomic masses from AME 2020, geodesy and timing from IERS
// Conventions (2010), IAU resolutions and WGS 84. The edition string names them all: it is stored with
// every evaluation, so a sheet evaluated against another set of constants can be found.

export const CONSTANTS_EDITION = 'CODATA 2022; SI 2019 exact; PDG 2024; AME 2020; IERS 2010';

export interface ConstantDef {
  /** The name a sheet uses. */
  name: string;
  description: string;
  /** Value in the SI unit given by `unit`. */
  value: number;
  /** The SI unit of `value`; '' for a dimensionless constant (a plain number in sheets). */
  unit: string;
  /** Standard uncertainty in the same unit; 0 when exact. */
  uncertainty: number;
  provenance: string;
  tex: string;
}

/** Speed of light in vacuum, m/s: exact (SI 2019, defining constant). */
export const C = 299_792_458;
/** Elementary charge, C: exact (SI 2019, defining constant). */
export const E_CHARGE = 1.602_176_634e-19;
/** Planck constant, J s: exact (SI 2019, defining constant). */
export const H_PLANCK = 6.626_070_15e-34;
/** Reduced Planck constant ħ = h/(2π), J s: exact, derived from the exact h (SI 2019). */
const HBAR = H_PLANCK / (2 * Math.PI);
/** Standard acceleration of gravity, m/s²: exact (3rd CGPM 1901; SI Brochure 9th ed.). */
export const G_N = 9.806_65;
/** Electron mass, kg: CODATA 2022, u = 2.8e-40 kg. */
export const M_E = 9.109_383_7139e-31;
/** Proton mass, kg: CODATA 2022, u = 5.2e-37 kg. */
export const M_P = 1.672_621_925_95e-27;
/** Neutron mass, kg: CODATA 2022, u = 8.5e-37 kg. */
export const M_N = 1.674_927_500_56e-27;
/** Atomic mass constant, kg: CODATA 2022, u = 5.2e-37 kg. */
export const M_U = 1.660_539_068_92e-27;
/** Muon mass, kg: CODATA 2022, u = 4.2e-36 kg. */
export const M_MU = 1.883_531_627e-28;

// Particles and ions (beam lines, therapy, decays). CODATA 2022 for the light nuclei and the τ
// (kg values as published); PDG, Review of Particle Physics 2024 (S. Navas et al., Phys. Rev. D 110
// (2024) 030001) for mesons and the Λ, given in MeV/c² and converted here exactly: 1 MeV/c² =
// 10⁶ e/c² kg with the exact e and c of the SI (2019), the double nearest the exact product.
// Atomic masses (neutral atoms, electrons included) from the Atomic Mass Evaluation 2020 (AME 2020:
// W. J. Huang et al., Chinese Phys. C 45 (2021) 030002; M. Wang et al., 030003), A_r in u converted
// with the CODATA 2022 m_u (the double nearest A_r·m_u; uncertainty from both).
/** Deuteron mass, kg: CODATA 2022 (2.013 553 212 544(15) u), u = 1.0e-36 kg. */
export const M_DEUTERON = 3.343_583_7768e-27;
/** Triton mass, kg: CODATA 2022 (3.015 500 715 97(10) u), u = 1.6e-36 kg. */
export const M_TRITON = 5.007_356_7512e-27;
/** Helion (³He nucleus) mass, kg: CODATA 2022 (3.014 932 246 932(74) u), u = 1.6e-36 kg. */
export const M_HELION = 5.006_412_7862e-27;
/** Alpha particle (⁴He nucleus) mass, kg: CODATA 2022 (4.001 506 179 129(62) u), u = 2.1e-36 kg. */
export const M_ALPHA = 6.644_657_345e-27;
/** Tau mass, kg: CODATA 2022, u = 2.1e-31 kg. */
const M_TAU = 3.167_54e-27;
/** Charged pion mass, kg: PDG 2024, 139.570 39(18) MeV/c², converted exactly. */
const M_PI_CHARGED = 2.4880681963975513e-28;
/** Neutral pion mass, kg: PDG 2024, 134.9768(5) MeV/c², converted exactly. */
const M_PI_NEUTRAL = 2.4061800166318444e-28;
/** Charged kaon mass, kg: PDG 2024, 493.677(15) MeV/c², converted exactly. */
const M_K_CHARGED = 8.800591894834956e-28;
/** Neutral kaon mass, kg: PDG 2024, 497.611(13) MeV/c², converted exactly. */
const M_K_NEUTRAL = 8.870721814831798e-28;
/** Λ baryon mass, kg: PDG 2024, 1115.683(6) MeV/c², converted exactly. */
const M_LAMBDA = 1.9888856007075777e-27;
/** Atomic mass of ¹H (neutral atom), kg: AME 2020, 1.007 825 031 898(14) u. */
export const M_ATOM_H1 = 1.6735328401021743e-27;
/** Atomic mass of ⁴He (neutral atom), kg: AME 2020, 4.002 603 254 13(16) u. */
export const M_ATOM_HE4 = 6.646479080869192e-27;
/** Atomic mass of ¹²C (neutral atom), kg: exactly 12 u by the definition of u, so 12 m_u (CODATA 2022). */
export const M_ATOM_C12 = 1.992646882704e-26;
/** Atomic mass of ¹⁶O (neutral atom), kg: AME 2020, 15.994 914 619 26(32) u. */
export const M_ATOM_O16 = 2.65601806293209e-26;
/** Atomic mass of ²⁰Ne (neutral atom), kg: AME 2020, 19.992 440 1762(17) u. */
export const M_ATOM_NE20 = 3.319822799562595e-26;

// Geodesy and timing (satellite clocks, ground stations, spaceflight).
/** Geocentric gravitational constant GM of the Earth (atmosphere included), m³/s²: IERS Conventions (2010) table 1.1, u = 8e5 m³/s². */
export const GM_EARTH = 3.986_004_418e14;
/** Nominal mean angular velocity of the Earth, rad/s: WGS 84 / IS-GPS-200 (defining value for GPS computations). */
const OMEGA_EARTH = 7.292_115_146_7e-5;
/** Equatorial radius (semi-major axis) of the WGS 84 ellipsoid, m: defining parameter. */
export const R_EARTH = 6_378_137;
/** L_G = 1 − d(TT)/d(TCG): IAU 2000 Resolution B1.9 (defining, exact). */
const L_G = 6.969_290_134e-10;
/** Geoid potential W₀ = L_G c², m²/s² (IERS Conventions (2010) §1.1: 62 636 856.0 m²/s²). */
const W_0 = L_G * C * C;
/** Heliocentric gravitational constant GM of the Sun, TDB-compatible, m³/s²: IERS Conventions (2010) table 1.1 (IAU 2009 system), u = 1e10 m³/s². */
const GM_SUN = 1.327_124_400_41e20;

const SI_2019 = 'exact by definition (SI Brochure, 9th edition, 2019)';

export const CONSTANTS: readonly ConstantDef[] = [
  {
    name: 'c',
    description: 'speed of light in vacuum',
    value: C,
    unit: 'm/s',
    uncertainty: 0,
    provenance: SI_2019,
    tex: 'c',
  },
  {
    name: 'g_n',
    description: 'standard acceleration of gravity',
    value: G_N,
    unit: 'm/s^2',
    uncertainty: 0,
    provenance: 'exact by definition (3rd CGPM, 1901; SI Brochure, 9th edition)',
    tex: 'g_{\\mathrm{n}}',
  },
  {
    name: 'q_e',
    description: 'elementary charge',
    value: E_CHARGE,
    unit: 'C',
    uncertainty: 0,
    provenance: SI_2019,
    tex: 'e',
  },
  {
    name: 'h_P',
    description: 'Planck constant',
    value: H_PLANCK,
    unit: 'J s',
    uncertainty: 0,
    provenance: SI_2019,
    tex: 'h',
  },
  {
    name: 'hbar_P',
    description: 'reduced Planck constant h/(2π)',
    value: HBAR,
    unit: 'J s',
    uncertainty: 0,
    provenance: 'derived from the exact h (SI 2019): h/(2π)',
    tex: '\\hbar',
  },
  {
    name: 'ħ',
    description: 'reduced Planck constant h/(2π), the same as hbar_P',
    value: HBAR,
    unit: 'J s',
    uncertainty: 0,
    provenance: 'derived from the exact h (SI 2019): h/(2π)',
    tex: '\\hbar',
  },
  {
    name: 'm_e',
    description: 'electron mass',
    value: M_E,
    unit: 'kg',
    uncertainty: 2.8e-40,
    provenance: 'CODATA 2022',
    tex: 'm_{\\mathrm{e}}',
  },
  {
    name: 'm_p',
    description: 'proton mass',
    value: M_P,
    unit: 'kg',
    uncertainty: 5.2e-37,
    provenance: 'CODATA 2022',
    tex: 'm_{\\mathrm{p}}',
  },
  {
    name: 'm_n',
    description: 'neutron mass',
    value: M_N,
    unit: 'kg',
    uncertainty: 8.5e-37,
    provenance: 'CODATA 2022',
    tex: 'm_{\\mathrm{n}}',
  },
  {
    name: 'm_u',
    description: 'atomic mass constant',
    value: M_U,
    unit: 'kg',
    uncertainty: 5.2e-37,
    provenance: 'CODATA 2022',
    tex: 'm_{\\mathrm{u}}',
  },
  {
    name: 'm_mu',
    description: 'muon mass',
    value: M_MU,
    unit: 'kg',
    uncertainty: 4.2e-36,
    provenance: 'CODATA 2022',
    tex: 'm_{\\mu}',
  },
  // Particles: CODATA 2022 for the light nuclei and the τ, PDG 2024 for mesons and the Λ. Named so that
  // none reads as another particle: not m_t (the top-quark mass in PDG notation) but m_triton, not m_h
  // (the Higgs mass) but m_helion; m_d is CODATA's deuteron symbol.
  {
    name: 'm_d',
    description: 'deuteron mass (²H nucleus)',
    value: M_DEUTERON,
    unit: 'kg',
    uncertainty: 1.0e-36,
    provenance: 'CODATA 2022 (2.013 553 212 544(15) u)',
    tex: 'm_{\\mathrm{d}}',
  },
  {
    name: 'm_triton',
    description: 'triton mass (³H nucleus)',
    value: M_TRITON,
    unit: 'kg',
    uncertainty: 1.6e-36,
    provenance: 'CODATA 2022 (3.015 500 715 97(10) u)',
    tex: 'm_{\\mathrm{t}}',
  },
  {
    name: 'm_helion',
    description: 'helion mass (³He nucleus)',
    value: M_HELION,
    unit: 'kg',
    uncertainty: 1.6e-36,
    provenance: 'CODATA 2022 (3.014 932 246 932(74) u)',
    tex: 'm_{\\mathrm{h}}',
  },
  {
    name: 'm_alpha',
    description: 'alpha particle mass (⁴He nucleus)',
    value: M_ALPHA,
    unit: 'kg',
    uncertainty: 2.1e-36,
    provenance: 'CODATA 2022 (4.001 506 179 129(62) u)',
    tex: 'm_{\\alpha}',
  },
  {
    name: 'm_tau',
    description: 'tau lepton mass',
    value: M_TAU,
    unit: 'kg',
    uncertainty: 2.1e-31,
    provenance: 'CODATA 2022',
    tex: 'm_{\\tau}',
  },
  {
    name: 'm_pi',
    description: 'charged pion mass (π⁺, π⁻)',
    value: M_PI_CHARGED,
    unit: 'kg',
    uncertainty: 3.2e-34,
    provenance:
      'PDG, Review of Particle Physics 2024: 139.570 39(18) MeV/c², converted to kg exactly with the SI 2019 e and c',
    tex: 'm_{\\pi^{\\pm}}',
  },
  {
    name: 'm_pi0',
    description: 'neutral pion mass (π⁰)',
    value: M_PI_NEUTRAL,
    unit: 'kg',
    uncertainty: 8.9e-34,
    provenance:
      'PDG, Review of Particle Physics 2024: 134.9768(5) MeV/c², converted to kg exactly with the SI 2019 e and c',
    tex: 'm_{\\pi^{0}}',
  },
  {
    name: 'm_K',
    description: 'charged kaon mass (K⁺, K⁻)',
    value: M_K_CHARGED,
    unit: 'kg',
    uncertainty: 2.7e-32,
    provenance:
      'PDG, Review of Particle Physics 2024: 493.677(15) MeV/c², converted to kg exactly with the SI 2019 e and c',
    tex: 'm_{K^{\\pm}}',
  },
  {
    name: 'm_K0',
    description: 'neutral kaon mass (K⁰)',
    value: M_K_NEUTRAL,
    unit: 'kg',
    uncertainty: 2.3e-32,
    provenance:
      'PDG, Review of Particle Physics 2024: 497.611(13) MeV/c², converted to kg exactly with the SI 2019 e and c',
    tex: 'm_{K^{0}}',
  },
  {
    name: 'm_Lambda',
    description: 'Λ baryon mass',
    value: M_LAMBDA,
    unit: 'kg',
    uncertainty: 1.1e-32,
    provenance:
      'PDG, Review of Particle Physics 2024: 1115.683(6) MeV/c², converted to kg exactly with the SI 2019 e and c',
    tex: 'm_{\\Lambda}',
  },
  // Atomic masses of the therapy ions: the NEUTRAL ATOM, electrons included (capital M and the mass
  // number in the name, never a nuclear mass); ionMass(M, Z, q) removes electrons.
  {
    name: 'M_H1',
    description: '¹H atomic mass (neutral atom, electrons included; not the proton mass)',
    value: M_ATOM_H1,
    unit: 'kg',
    uncertainty: 5.3e-37,
    provenance: 'AME 2020 (1.007 825 031 898(14) u), times m_u (CODATA 2022)',
    tex: 'M(^{1}\\mathrm{H})',
  },
  {
    name: 'M_He4',
    description: '⁴He atomic mass (neutral atom, electrons included; not the alpha particle mass)',
    value: M_ATOM_HE4,
    unit: 'kg',
    uncertainty: 2.1e-36,
    provenance: 'AME 2020 (4.002 603 254 13(16) u), times m_u (CODATA 2022)',
    tex: 'M(^{4}\\mathrm{He})',
  },
  {
    name: 'M_C12',
    description: '¹²C atomic mass (neutral atom, electrons included; not the nuclear mass)',
    value: M_ATOM_C12,
    unit: 'kg',
    uncertainty: 6.2e-36,
    provenance: 'exactly 12 u by definition of the atomic mass unit, times m_u (CODATA 2022)',
    tex: 'M(^{12}\\mathrm{C})',
  },
  {
    name: 'M_O16',
    description: '¹⁶O atomic mass (neutral atom, electrons included; not the nuclear mass)',
    value: M_ATOM_O16,
    unit: 'kg',
    uncertainty: 8.3e-36,
    provenance: 'AME 2020 (15.994 914 619 26(32) u), times m_u (CODATA 2022)',
    tex: 'M(^{16}\\mathrm{O})',
  },
  {
    name: 'M_Ne20',
    description: '²⁰Ne atomic mass (neutral atom, electrons included; not the nuclear mass)',
    value: M_ATOM_NE20,
    unit: 'kg',
    uncertainty: 1.1e-35,
    provenance: 'AME 2020 (19.992 440 1762(17) u), times m_u (CODATA 2022)',
    tex: 'M(^{20}\\mathrm{Ne})',
  },
  {
    name: 'GM_E',
    description: 'geocentric gravitational constant (Earth, atmosphere included)',
    value: GM_EARTH,
    unit: 'm^3/s^2',
    uncertainty: 8e5,
    provenance: 'IERS Conventions (2010), table 1.1; the WGS 84 value (IS-GPS-200 user algorithms use 3.986005e14)',
    tex: 'GM_{\\mathrm{E}}',
  },
  {
    name: 'omega_E',
    description: 'mean angular velocity of the Earth',
    value: OMEGA_EARTH,
    unit: 'rad/s',
    uncertainty: 0,
    provenance: 'IS-GPS-200, table 20-IV (WGS 84 value of the Earth rotation rate; defining for GPS computations)',
    tex: '\\omega_{\\mathrm{E}}',
  },
  {
    name: 'R_E',
    description: 'equatorial radius of the Earth (WGS 84 semi-major axis)',
    value: R_EARTH,
    unit: 'm',
    uncertainty: 0,
    provenance: 'WGS 84 defining parameter (NGA.STND.0036, 2014)',
    tex: 'R_{\\mathrm{E}}',
  },
  {
    name: 'L_G',
    description: 'rate of TT against TCG, L_G = 1 − d(TT)/d(TCG): the geoid potential over c²',
    value: L_G,
    unit: '',
    uncertainty: 0,
    provenance: 'IAU 2000 Resolution B1.9 (defining, exact); IERS Conventions (2010) §1.1',
    tex: 'L_{\\mathrm{G}}',
  },
  {
    name: 'W_0',
    description: 'potential of the geoid, W₀ = L_G c² (L_G = 6.969 290 134 × 10⁻¹⁰)',
    value: W_0,
    unit: 'm^2/s^2',
    uncertainty: 0,
    provenance: 'IAU 2000 Resolution B1.9 (L_G, defining); IERS Conventions (2010) §1.1 (W₀ = 62 636 856.0 m²/s²)',
    tex: 'W_{0}',
  },
  {
    name: 'GM_S',
    description: 'heliocentric gravitational constant (Sun), TDB-compatible',
    value: GM_SUN,
    unit: 'm^3/s^2',
    uncertainty: 1e10,
    provenance: 'IERS Conventions (2010), table 1.1 (IAU 2009 system of astronomical constants)',
    tex: 'GM_{\\mathrm{S}}',
  },
];
