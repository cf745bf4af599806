import { C } from '../constants';
import { requireFinite } from './support/domain';
import { dd, div, mul, round, scale, sub, twoSum } from './support/double-double';
import { log1p } from './support/elementary';
import { C_SQUARED } from './support/kinematics';
import { type CalcFunction, DomainError, type KernelArgument } from './types';

const FN = 'shapiroDelay';

/**
 * shapiroDelay(GM, r1, r2, r12) — the gravitational (Shapiro) delay of a signal between two points
 * at distances r1 and r2 from a body of gravitational parameter GM, r12 apart: the time by which it
 * arrives later than the straight-line travel time r12/c.
 *
 * Formula: Δt = (2GM/c³) ln((r1 + r2 + r12)/(r1 + r2 − r12)).
 *
 * Domain: GM ≥ 0; r1, r2 > 0; |r1 − r2| ≤ r12 < r1 + r2 (a triangle; the line must not pass through
 * the centre); NaN and ±Infinity are refused.
 *
 * Example: `shapiroDelay(GM_E, 26561.75 km, R_E, 26561.75 km - R_E)` → 42.21 ps (a GPS satellite
 * at the zenith; 12.7 mm of range).
 *
 * Source: I. I. Shapiro, "Fourth test of general relativity", Physical Review Letters 13 (1964) 789;
 * IERS Conventions (2010), eq. 11.17 (the gravitational delay); N. Ashby, Living Reviews in
 * Relativity 6 (2003) 1, §5.
 *
 * Numerics: ln of the ratio as log1p(2 r12/(r1 + r2 − r12)) in double-double, r1 + r2 − r12 formed
 * without cancellation, so a short path (ratio near 1) and a path grazing behind the body both keep
 * their digits; rounded once.
 */
export const shapiroDelay: CalcFunction = {
  name: FN,
  params: [
    {
      name: 'GM',
      kind: 'gravitational-parameter',
      description: 'gravitational parameter of the body, e.g. GM_E or GM_S',
    },
    { name: 'r1', kind: 'length', description: 'distance of the emitter from the centre of the body' },
    { name: 'r2', kind: 'length', description: 'distance of the receiver from the centre of the body' },
    { name: 'r12', kind: 'length', description: 'distance between emitter and receiver' },
  ],
  returns: 'time',
  doc: {
    summary:
      'Gravitational (Shapiro) delay of a signal between points at r1 and r2 from a body of gravitational parameter GM, r12 apart.',
    formula: '\\Delta t = \\frac{2GM}{c^3}\\ln\\frac{r_1 + r_2 + r_{12}}{r_1 + r_2 - r_{12}}',
    domain:
      'GM ≥ 0; r1, r2 > 0; |r1 − r2| ≤ r12 < r1 + r2 (the three distances form a triangle whose path does not pass through the centre). NaN and ±Infinity are refused.',
    example: 'shapiroDelay(GM_E, 26561.75 km, R_E, 26561.75 km - R_E)',
    exampleResult: '42.21 ps (a GPS satellite at the zenith of a point on the equator: 12.7 mm of range)',
    source:
      'I. I. Shapiro, "Fourth test of general relativity", Phys. Rev. Lett. 13 (1964) 789; IERS Conventions (2010), eq. 11.17; N. Ashby, Living Reviews in Relativity 6 (2003) 1, §5.',
    numerics:
      'ln((s + r12)/(s − r12)) is evaluated as log1p(2 r12/(s − r12)), s = r1 + r2, in double-double with s − r12 formed without cancellation: a short path (ratio near 1) and a path grazing behind the body both keep their digits. Rounded once.',
  },
  kernel: (GMArg: KernelArgument, r1Arg: KernelArgument, r2Arg: KernelArgument, r12Arg: KernelArgument): number => {
    const GM = requireFinite(FN, 'GM', GMArg as number);
    const r1 = requireFinite(FN, 'r1', r1Arg as number);
    const r2 = requireFinite(FN, 'r2', r2Arg as number);
    const r12 = requireFinite(FN, 'r12', r12Arg as number);
    if (!(GM >= 0))
      throw new DomainError(`${FN}: the gravitational parameter GM must not be negative; got ${GM} m³/s²`);
    if (!(r1 > 0) || !(r2 > 0))
      throw new DomainError(
        `${FN}: r1 and r2 are distances from the centre of the body and must be positive; got r1 = ${r1} m, r2 = ${r2} m`,
      );
    const s = twoSum(r1, r2);
    if (!(r12 >= Math.abs(r1 - r2) * (1 - 1e-12) && r12 < s[0] + s[1])) {
      throw new DomainError(
        `${FN}: r1, r2 and r12 must form a triangle with |r1 − r2| ≤ r12 < r1 + r2 (a path not through the centre); got r1 = ${r1} m, r2 = ${r2} m, r12 = ${r12} m`,
      );
    }
    const denominator = sub(s, dd(r12));
    if (!(denominator[0] > 0))
      throw new DomainError(`${FN}: the path passes through the centre of the body (r12 = r1 + r2)`);
    const factor = scale(div(dd(GM), mul(C_SQUARED, dd(C))), 2);
    return round(mul(factor, log1p(div(dd(2 * r12), denominator))));
  },
};
