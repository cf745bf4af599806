import { finiteResult, requireNonNegative, requirePositive } from './support/domain';
import { add, div, mul, round, scale, sub } from './support/double-double';
import { restEnergy } from './support/kinematics';
import type { CalcFunction } from './types';

const FN = 'thresholdKinetic';

/**
 * thresholdKinetic(mBeam, mTarget, mProducts) — the least kinetic energy a beam particle needs, on a
 * target at rest, to produce final particles whose masses add up to mProducts.
 *
 * Formula: T_th = ((Σm_f)² − (m_a + m_b)²) c² / (2 m_b), evaluated as
 * (M_f − M_a − M_b)(M_f + M_a + M_b)/(2 M_b) with M = mc².
 *
 * Domain: mBeam ≥ 0 (0 for a photon), mTarget > 0, mProducts ≥ 0 (the SUM of the final-state
 * masses). When Σm_f ≤ m_a + m_b the reaction has no threshold and 0 is returned. NaN and ±Infinity
 * are refused.
 *
 * Example: `thresholdKinetic(m_p, m_p, 4 m_p) to GeV` (p p → p p p p̄) → 5.6296 GeV.
 *
 * Source: Particle Data Group, Review of Particle Physics (2024), review "Kinematics"; R. Hagedorn,
 * Relativistic Kinematics (1963), ch. 7.
 *
 * Numerics: the difference of squares is factored, and the mass excess M_f − M_a − M_b is formed in
 * double-double from exact products with c², so a small excess over large masses keeps its digits;
 * rounded once.
 */
export const thresholdKinetic: CalcFunction = {
  name: FN,
  params: [
    { name: 'mBeam', kind: 'mass', description: 'rest mass of the beam particle (a mass, or mc²); 0 for a photon' },
    { name: 'mTarget', kind: 'mass', description: 'rest mass of the target particle at rest (a mass, or mc²)' },
    {
      name: 'mProducts',
      kind: 'mass',
      description: 'SUM of the rest masses of all final-state particles (a mass, or an energy)',
    },
  ],
  returns: 'energy',
  doc: {
    summary: 'Threshold kinetic energy of a beam on a fixed target for final particles of total mass mProducts.',
    formula:
      'T_{\\mathrm{th}} = \\frac{(M_f - M_a - M_b)(M_f + M_a + M_b)}{2M_b},\\ M = mc^2 \\quad\\left(= \\frac{\\big((\\textstyle\\sum m_f)^2 - (m_a + m_b)^2\\big)c^2}{2m_b}\\right)',
    domain:
      'mBeam ≥ 0 (0 for a photon); mTarget > 0; mProducts ≥ 0 is the SUM of the final-state masses. When it does not exceed mBeam + mTarget the reaction has no threshold and 0 is returned. NaN and ±Infinity are refused.',
    example: 'thresholdKinetic(m_p, m_p, 4 m_p) to GeV',
    exampleResult: '5.6296 GeV (antiproton production p p → p p p p̄, 6 m_p c²)',
    source:
      'Particle Data Group, Review of Particle Physics (2024), review "Kinematics"; R. Hagedorn, Relativistic Kinematics (1963), ch. 7.',
    numerics:
      'The difference of squares is factored, and the mass excess M_f − M_a − M_b is taken in double-double from exact products with c², so a small Q value over large masses keeps its digits; rounded once (within about half an ulp).',
  },
  kernel: (mBeam: number, mTarget: number, mProducts: number): number => {
    requireNonNegative(FN, 'mBeam', mBeam, 'kg', 'a rest mass');
    requirePositive(FN, 'mTarget', mTarget, 'kg', 'a target at rest has mass');
    requireNonNegative(FN, 'mProducts', mProducts, 'kg', 'a sum of rest masses');
    const Ma = restEnergy(mBeam);
    const Mb = restEnergy(mTarget);
    const Mf = restEnergy(mProducts);
    const initial = add(Ma, Mb);
    const excess = sub(Mf, initial);
    if (excess[0] <= 0) return 0;
    return finiteResult(FN, round(mul(excess, div(add(Mf, initial), scale(Mb, 2)))));
  },
};
