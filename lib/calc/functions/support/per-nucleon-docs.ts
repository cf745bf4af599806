// Documentation shared by the per-nucleon functions: one wording of the convention, everywhere.
import type { ParamDoc } from '../types';

export const TN_PARAM: ParamDoc = {
  name: 'Tn',
  kind: 'energy-per-nucleon',
  description:
    'kinetic energy PER NUCLEON, T/A (430 MeV, or 430 MeV/u as the therapy trade writes it: read as per nucleon)',
};
export const A_PARAM: ParamDoc = {
  name: 'A',
  kind: 'number',
  description: 'mass number: nucleons in the nucleus (12 for ¹²C), a plain integer; not the charge state',
};
export const ION_MASS_PARAM: ParamDoc = {
  name: 'm',
  kind: 'mass',
  description:
    'rest mass of the ion as accelerated (e.g. ionMass(M_C12, 6, 6), m_p, m_alpha); not the neutral atomic mass',
};
export const CHARGE_STATE_PARAM: ParamDoc = {
  name: 'q',
  kind: 'charge',
  description:
    'charge of the ion: the charge state as an integer (6 for C⁶⁺) or a charge (6 q_e); not the atomic number',
};

/** The per-nucleon convention, said the same way in every per-nucleon function's documentation. */
export const PER_NUCLEON_CONVENTION =
  'Per nucleon: T = A·Tn with A the mass number (430 MeV/u for ¹²C is T = 5160 MeV). An argument written in MeV/u is read as per nucleon (its value times 1 u); the engine otherwise reads u as the atomic mass unit. Some facilities quote the kinetic energy per atomic mass unit of the ion’s mass, T/(m/u); the per-nucleon number is that number times m/(A u) (0.999 73 for ¹²C⁶⁺, 1.007 28 for a proton): for such a value write T = Tu·m (MeV/u times the ion’s mass is an energy) and use the functions of the total kinetic energy.';

export const PER_NUCLEON_SOURCE =
  'Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (E = T + mc², p²c² = T(T + 2mc²), β = pc/E, γ = E/mc²) and Bρ = p/q; the per-nucleon convention of ion-beam therapy (T/A in MeV/u): e.g. U. Amaldi and G. Kraft, Rep. Prog. Phys. 68 (2005) 1861.';
