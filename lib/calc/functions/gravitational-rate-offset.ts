import { C } from '../constants';
import { requireFinite } from './support/domain';
import { dd, div, mul, round, twoSum } from './support/double-double';
import { C_SQUARED } from './support/kinematics';
import { type CalcFunction, DomainError, type KernelArgument } from './types';

const FN = 'gravitationalRateOffset';

/**
 * gravitationalRateOffset(GM, r, r_ref) — the fractional rate of a clock at distance r from a body of
 * gravitational parameter GM, relative to an identical clock at distance r_ref (weak field, first
 * order): positive when r > r_ref (the higher clock runs fast).
 *
 * Formula: Δf/f = (GM/c²)(1/r_ref − 1/r) = (GM/c²)(r − r_ref)/(r · r_ref).
 *
 * Domain: GM ≥ 0; r, r_ref > 0; GM/(c² r) and GM/(c² r_ref) at most 1e-4 (the first-order formula
 * errs by about that fraction of itself beyond); NaN and ±Infinity are refused.
 *
 * Example: `gravitationalRateOffset(GM_E, 26561.75 km, R_E)` → 5.2838e-10 (a GPS orbit against the
 * equator, rotation and oblateness aside).
 *
 * Source: N. Ashby, "Relativity in the Global Positioning System", Living Reviews in Relativity 6
 * (2003) 1, §2 (the gravitational frequency shift); IERS Conventions (2010) ch. 10.
 *
 * Numerics: written as (GM/(c² r_ref))·(r − r_ref)/r in double-double with r − r_ref exact, so two
 * radii that differ by a millimetre keep every digit of their difference (1/r_ref − 1/r would
 * cancel); rounded once.
 */
export const gravitationalRateOffset: CalcFunction = {
  name: FN,
  params: [
    {
      name: 'GM',
      kind: 'gravitational-parameter',
      description: 'gravitational parameter of the body, e.g. GM_E or GM_S',
    },
    { name: 'r', kind: 'length', description: 'distance of the clock from the centre of the body' },
    { name: 'r_ref', kind: 'length', description: 'distance of the reference clock from the centre' },
  ],
  returns: 'number',
  doc: {
    summary:
      'Fractional rate of a clock at r relative to one at r_ref near a body of gravitational parameter GM (weak field): positive when the clock is higher.',
    formula:
      '\\frac{\\Delta f}{f} = \\frac{GM}{c^2}\\left(\\frac{1}{r_{\\mathrm{ref}}} - \\frac{1}{r}\\right) = \\frac{GM}{c^2}\\,\\frac{r - r_{\\mathrm{ref}}}{r\\,r_{\\mathrm{ref}}}',
    domain:
      'GM ≥ 0; r, r_ref > 0; weak field: GM/(c²r) and GM/(c²r_ref) at most 1e-4, refused beyond (the first-order formula no longer holds to that fraction). NaN and ±Infinity are refused. For a clock on the rotating Earth use the geoid potential W_0 (orbitClockRateOffset does).',
    example: 'gravitationalRateOffset(GM_E, 26561.75 km, R_E)',
    exampleResult: '5.2838e-10 (a GPS orbit relative to the equator, Earth rotation and oblateness left out)',
    source:
      'N. Ashby, "Relativity in the Global Positioning System", Living Reviews in Relativity 6 (2003) 1, §2; IERS Conventions (2010), ch. 10.',
    numerics:
      'Evaluated as (GM/(c² r_ref))·(r − r_ref)/r in double-double with r − r_ref formed exactly: two nearby radii keep every digit of their difference, which 1/r_ref − 1/r would cancel away. Rounded once.',
  },
  kernel: (GMArg: KernelArgument, rArg: KernelArgument, refArg: KernelArgument): number => {
    const GM = requireFinite(FN, 'GM', GMArg as number);
    const r = requireFinite(FN, 'r', rArg as number);
    const ref = requireFinite(FN, 'r_ref', refArg as number);
    if (!(GM >= 0))
      throw new DomainError(`${FN}: the gravitational parameter GM must not be negative; got ${GM} m³/s²`);
    if (!(r > 0) || !(ref > 0))
      throw new DomainError(
        `${FN}: both distances must be positive (from the centre of the body); got r = ${r} m, r_ref = ${ref} m`,
      );
    const mPlain = GM / (C * C);
    const strongest = mPlain / Math.min(r, ref);
    if (strongest > 1e-4) {
      throw new DomainError(
        `${FN}: GM/(c²r) = ${strongest.toPrecision(3)} is beyond the weak field (at most 1e-4) where this first-order formula holds`,
      );
    }
    if (GM === 0 || r === ref) return 0;
    // GM/(c²r) or GM/(c²r_ref) near the subnormal range (a body of next to no mass, or distances of
    // 1e200 m): the double-double steps would under- or overflow; in doubles the result is as small
    // as it is (and may be zero). Both quotients are at most 1e-4 here, so neither overflows.
    if (Math.min(mPlain / r, mPlain / ref) < 1e-280) return mPlain / ref - mPlain / r;
    const m = div(dd(GM), C_SQUARED);
    return round(mul(div(m, dd(ref)), div(twoSum(r, -ref), dd(r))));
  },
};
