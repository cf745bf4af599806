import { requireFinite } from './support/domain';
import { div, fromDecimal, mulNum, round, scale } from './support/double-double';
import { C_SQUARED } from './support/kinematics';
import type { CalcFunction, KernelArgument } from './types';

const FN = 'sagnacDelay';
/** 2ω_E/c², s/m², from ω_E's decimal value (IS-GPS-200). */
const TWO_OMEGA_OVER_C2 = scale(div(fromDecimal('7.2921151467e-5'), C_SQUARED), 2);

/**
 * sagnacDelay(A_z) — the Sagnac correction of a signal (or a clock) carried between two points in
 * the Earth-fixed frame: the extra time 2ω_E A_z/c², where A_z is the area swept by the line from
 * the Earth's centre to the signal, projected on the equatorial plane (positive when swept eastward).
 *
 * Formula: Δt = 2 ω_E A_z / c² (2ω_E/c² = 1.6227 × 10⁻²¹ s/m²); for a signal from a satellite at
 * (x_s, y_s) to a receiver at (x_r, y_r) in Earth-fixed coordinates, A_z = (x_s y_r − y_s x_r)/2.
 *
 * Domain: A_z any area (its sign is the sense of the sweep); NaN and ±Infinity are refused.
 *
 * Example: `sagnacDelay(pi R_E^2)` → 207.39 ns (a clock carried once eastward around the equator).
 *
 * Source: N. Ashby, "Relativity in the Global Positioning System", Living Reviews in Relativity 6
 * (2003) 1, §2 (eq. for the Sagnac effect; 207.4 ns around the equator); ITU-R TF.1010.
 *
 * Numerics: 2ω_E/c² in double-double from ω_E's decimal value, times A_z; rounded once.
 */
export const sagnacDelay: CalcFunction = {
  name: FN,
  params: [
    {
      name: 'A_z',
      kind: 'area',
      description:
        "area swept by the line from the Earth's centre, projected on the equatorial plane (positive eastward)",
    },
  ],
  returns: 'time',
  doc: {
    summary:
      'Sagnac correction 2ω_E A_z/c² of a signal or clock carried in the rotating Earth frame (A_z: equatorial projection of the area swept, positive eastward).',
    formula: '\\Delta t = \\frac{2\\,\\omega_{\\mathrm{E}}\\,A_z}{c^2},\\quad A_z = \\tfrac{1}{2}(x_s y_r - y_s x_r)',
    domain:
      "A_z any area: positive when the line from the Earth's centre sweeps eastward, negative westward. NaN and ±Infinity are refused.",
    example: 'sagnacDelay(pi R_E^2)',
    exampleResult: '207.39 ns (a clock carried once eastward around the equator)',
    source:
      'N. Ashby, "Relativity in the Global Positioning System", Living Reviews in Relativity 6 (2003) 1, §2; ITU-R Recommendation TF.1010.',
    numerics: "2ω_E/c² (1.6227e-21 s/m²) in double-double from ω_E's decimal value, times A_z; rounded once.",
  },
  kernel: (AArg: KernelArgument): number => {
    const A = requireFinite(FN, 'A_z', AArg as number);
    return round(mulNum(TWO_OMEGA_OVER_C2, A));
  },
};
