// Physical constants of the engine, with their provenance. Exact ones are defined by the SI
// (SI Brochure, 9th edition, 2019, table 1 and §2.3.1); the rest are the CODATA 2022 recommended
// values (Mohr, Newell, Taylor, Tiesinga, "CODATA recommended values of the fundamental physical
// constants: 2022", published 2024), each with its standard uncertainty.

export const CONSTANTS_EDITION = 'CODATA 2022; SI 2019 exact constants';

export interface ConstantDef {
  /** The name a sheet uses. */
  name: string;
  description: string;
  /** Value in the SI unit given by `unit`. */
  value: number;
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
export const HBAR = H_PLANCK / (2 * Math.PI);
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

// Geodesy and timing (satellite clocks, ground stations, spaceflight).
/** Geocentric gravitational constant GM of the Earth (atmosphere included), m³/s²: IERS Conventions (2010) table 1.1, u = 8e5 m³/s². */
export const GM_EARTH = 3.986_004_418e14;
/** Nominal mean angular velocity of the Earth, rad/s: WGS 84 / IS-GPS-200 (defining value for GPS computations). */
export const OMEGA_EARTH = 7.292_115_146_7e-5;
/** Equatorial radius (semi-major axis) of the WGS 84 ellipsoid, m: defining parameter. */
export const R_EARTH = 6_378_137;
/** L_G = 1 − d(TT)/d(TCG): IAU 2000 Resolution B1.9 (defining, exact). */
export const L_G = 6.969_290_134e-10;
/** Geoid potential W₀ = L_G c², m²/s² (IERS Conventions (2010) §1.1: 62 636 856.0 m²/s²). */
export const W_0 = L_G * C * C;
/** Heliocentric gravitational constant GM of the Sun, TDB-compatible, m³/s²: IERS Conventions (2010) table 1.1 (IAU 2009 system), u = 1e10 m³/s². */
export const GM_SUN = 1.327_124_400_41e20;

const SI_2019 = 'exact by definition (SI Brochure, 9th edition, 2019)';

export const CONSTANTS: readonly ConstantDef[] = [
  { name: 'c', description: 'speed of light in vacuum', value: C, unit: 'm/s', uncertainty: 0, provenance: SI_2019, tex: 'c' },
  { name: 'g_n', description: 'standard acceleration of gravity', value: G_N, unit: 'm/s^2', uncertainty: 0, provenance: 'exact by definition (3rd CGPM, 1901; SI Brochure, 9th edition)', tex: 'g_{\\mathrm{n}}' },
  { name: 'q_e', description: 'elementary charge', value: E_CHARGE, unit: 'C', uncertainty: 0, provenance: SI_2019, tex: 'e' },
  { name: 'h_P', description: 'Planck constant', value: H_PLANCK, unit: 'J s', uncertainty: 0, provenance: SI_2019, tex: 'h' },
  { name: 'hbar_P', description: 'reduced Planck constant h/(2π)', value: HBAR, unit: 'J s', uncertainty: 0, provenance: 'derived from the exact h (SI 2019): h/(2π)', tex: '\\hbar' },
  { name: 'ħ', description: 'reduced Planck constant h/(2π), the same as hbar_P', value: HBAR, unit: 'J s', uncertainty: 0, provenance: 'derived from the exact h (SI 2019): h/(2π)', tex: '\\hbar' },
  { name: 'm_e', description: 'electron mass', value: M_E, unit: 'kg', uncertainty: 2.8e-40, provenance: 'CODATA 2022', tex: 'm_{\\mathrm{e}}' },
  { name: 'm_p', description: 'proton mass', value: M_P, unit: 'kg', uncertainty: 5.2e-37, provenance: 'CODATA 2022', tex: 'm_{\\mathrm{p}}' },
  { name: 'm_n', description: 'neutron mass', value: M_N, unit: 'kg', uncertainty: 8.5e-37, provenance: 'CODATA 2022', tex: 'm_{\\mathrm{n}}' },
  { name: 'm_u', description: 'atomic mass constant', value: M_U, unit: 'kg', uncertainty: 5.2e-37, provenance: 'CODATA 2022', tex: 'm_{\\mathrm{u}}' },
  { name: 'm_mu', description: 'muon mass', value: M_MU, unit: 'kg', uncertainty: 4.2e-36, provenance: 'CODATA 2022', tex: 'm_{\\mu}' },
  { name: 'GM_E', description: 'geocentric gravitational constant (Earth, atmosphere included)', value: GM_EARTH, unit: 'm^3/s^2', uncertainty: 8e5, provenance: 'IERS Conventions (2010), table 1.1; the WGS 84 value (IS-GPS-200 user algorithms use 3.986005e14)', tex: 'GM_{\\mathrm{E}}' },
  { name: 'omega_E', description: 'mean angular velocity of the Earth', value: OMEGA_EARTH, unit: 'rad/s', uncertainty: 0, provenance: 'IS-GPS-200, table 20-IV (WGS 84 value of the Earth rotation rate; defining for GPS computations)', tex: '\\omega_{\\mathrm{E}}' },
  { name: 'R_E', description: 'equatorial radius of the Earth (WGS 84 semi-major axis)', value: R_EARTH, unit: 'm', uncertainty: 0, provenance: 'WGS 84 defining parameter (NGA.STND.0036, 2014)', tex: 'R_{\\mathrm{E}}' },
  { name: 'W_0', description: 'potential of the geoid, W₀ = L_G c² (L_G = 6.969 290 134 × 10⁻¹⁰)', value: W_0, unit: 'm^2/s^2', uncertainty: 0, provenance: 'IAU 2000 Resolution B1.9 (L_G, defining); IERS Conventions (2010) §1.1 (W₀ = 62 636 856.0 m²/s²)', tex: 'W_{0}' },
  { name: 'GM_S', description: 'heliocentric gravitational constant (Sun), TDB-compatible', value: GM_SUN, unit: 'm^3/s^2', uncertainty: 1e10, provenance: 'IERS Conventions (2010), table 1.1 (IAU 2009 system of astronomical constants)', tex: 'GM_{\\mathrm{S}}' },
];
