import { GM_EARTH } from '../constants';
import { requireFinite } from './support/domain';
import { dd, div, mul, mulNum, neg, round, scale, sqrt } from './support/double-double';
import { C_SQUARED } from './support/kinematics';
import { type CalcFunction, DomainError, type KernelArgument } from './types';

const FN = 'eccentricityClockCorrection';
/** F = −2√(GM_E)/c², s/√m. */
const F = neg(scale(div(sqrt(dd(GM_EARTH)), C_SQUARED), 2));

/**
 * eccentricityClockCorrection(a, e, E) — the periodic relativistic correction Δt_r of a clock on an
 * eccentric Earth orbit (semi-major axis a, eccentricity e) at eccentric anomaly E, as IS-GPS-200
 * has a receiver add it to the broadcast satellite clock correction.
 *
 * Formula: Δt_r = F e √a sin E, with F = −2√(GM_E)/c² (IS-GPS-200: −4.442 807 633 × 10⁻¹⁰ s/√m).
 *
 * Domain: a > 0; 0 ≤ e < 1; E an angle; NaN and ±Infinity are refused.
 *
 * Example: `eccentricityClockCorrection(26561.75 km, 0.01, 90 deg)` → −22.897 ns (a GPS orbit of
 * e = 0.01 at E = 90°: the amplitude is about 23 ns).
 *
 * Source: IS-GPS-200, §20.3.3.3.3.1 (user algorithm for the SV clock correction); N. Ashby,
 * Living Reviews in Relativity 6 (2003) 1, §5.
 *
 * Numerics: F, √a and their product in double-double, times sin E; F from the library's GM_E (IERS 2010), which
 * differs from IS-GPS-200's F (formed with μ = 3.986005e14) by 7.3e-8 of itself (below 2 fs here).
 */
export const eccentricityClockCorrection: CalcFunction = {
  name: FN,
  params: [
    { name: 'a', kind: 'length', description: 'semi-major axis of the orbit' },
    { name: 'e', kind: 'number', description: 'eccentricity, 0 ≤ e < 1' },
    { name: 'E', kind: 'angle', description: 'eccentric anomaly (an angle, or a plain number in radians)' },
  ],
  returns: 'time',
  doc: {
    summary:
      'Periodic relativistic clock correction Δt_r = F e √a sin E of a satellite on an eccentric Earth orbit (IS-GPS-200), to be added to the satellite clock correction.',
    formula: '\\Delta t_{\\mathrm{r}} = F\\,e\\,\\sqrt{a}\\,\\sin E,\\quad F = -\\frac{2\\sqrt{GM_{\\mathrm{E}}}}{c^2}',
    domain: 'a > 0; 0 ≤ e < 1; E an angle (a plain number is read in radians). NaN and ±Infinity are refused.',
    example: 'eccentricityClockCorrection(26561.75 km, 0.01, 90 deg)',
    exampleResult: '−22.897 ns (the amplitude for a GPS orbit of eccentricity 0.01)',
    source:
      'IS-GPS-200, §20.3.3.3.3.1 (F = −4.442807633e-10 s/√m); N. Ashby, "Relativity in the Global Positioning System", Living Reviews in Relativity 6 (2003) 1, §5.',
    numerics:
      "A product of well-conditioned factors. F is formed from GM_E (IERS Conventions 2010), 7.3e-8 of itself from IS-GPS-200's F, which is formed with μ = 3.986005e14 (below 2 fs on a GPS orbit).",
  },
  kernel: (aArg: KernelArgument, eArg: KernelArgument, EArg: KernelArgument): number => {
    const a = requireFinite(FN, 'a', aArg as number);
    const e = requireFinite(FN, 'e', eArg as number);
    const E = requireFinite(FN, 'E', EArg as number);
    if (!(a > 0)) throw new DomainError(`${FN}: the semi-major axis a must be positive; got ${a} m`);
    if (!(e >= 0 && e < 1))
      throw new DomainError(`${FN}: the eccentricity must satisfy 0 ≤ e < 1 (a closed orbit); got e = ${e}`);
    return round(mulNum(mul(mulNum(F, e), sqrt(dd(a))), Math.sin(E)));
  },
};
