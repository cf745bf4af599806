import { requireFinite } from './support/domain';
import { add, type DD, div, mul, round, sub } from './support/double-double';
import {
  absDD,
  betaOf,
  isPrecise,
  massiveResult,
  ONE,
  oneMinusAbsBeta,
  preciseFromBeta,
  speedValue,
} from './support/kinematics';
import { type CalcFunction, DomainError, type KernelArgument, type PreciseSpeed } from './types';

const FN = 'addVelocities';

function requireSpeedUpToLight(name: string, speed: KernelArgument): PreciseSpeed {
  const beta = requireFinite(FN, name, betaOf(speed));
  if (Math.abs(beta) > 1) {
    throw new DomainError(`${FN}: |β| of ${name} must not exceed 1 (1 is light); got β = ${beta}`);
  }
  return isPrecise(speed) ? speed : preciseFromBeta(beta);
}

const isLight = (s: PreciseSpeed) => s.inverseGamma[0] === 0 && Math.abs(round(s.beta)) === 1;

function precise(uArg: KernelArgument, vArg: KernelArgument): PreciseSpeed | number {
  const u = requireSpeedUpToLight('u', uArg);
  const v = requireSpeedUpToLight('v', vArg);
  const uLight = isLight(u);
  const vLight = isLight(v);
  if (uLight || vLight) {
    const [bu, bv] = [round(u.beta), round(v.beta)];
    if (uLight && vLight && bu !== bv) {
      throw new DomainError(
        `${FN}: light composed with light in the opposite direction is undefined; got β_u = ${bu}, β_v = ${bv}`,
      );
    }
    return uLight ? bu : bv;
  }
  const a = absDD(u.beta);
  const b = absDD(v.beta);
  const sameSign = u.beta[0] >= 0 === v.beta[0] >= 0;
  let numerator: DD;
  let denominator: DD;
  if (sameSign) {
    numerator = add(u.beta, v.beta);
    denominator = add(ONE, mul(a, b));
  } else {
    // Opposite directions: u + v = ±(|u| − |v|) and 1 + uv = 1 − |u||v| both cancel near c; formed
    // from 1 − |u| and 1 − |v| (exact in double-double, from s near c) they do not:
    // |u| − |v| = (1 − |v|) − (1 − |u|), and 1 − |u||v| = (1 − |u|) + |u|(1 − |v|).
    // Plain doubles are exact, so for them (and away from c) the direct forms are exact already.
    const nearLight = (isPrecise(uArg) || isPrecise(vArg)) && a[0] >= 0.5 && b[0] >= 0.5;
    let difference: DD;
    if (nearLight) {
      const [da, db] = [oneMinusAbsBeta(u), oneMinusAbsBeta(v)];
      difference = sub(db, da);
      denominator = add(da, mul(a, db));
    } else {
      difference = sub(a, b);
      denominator = sub(ONE, mul(a, b));
    }
    numerator = u.beta[0] >= 0 ? difference : [-difference[0], -difference[1]];
  }
  // γ_w = γ_u γ_v (1 + uv) (the composition law of γ), so 1/γ_w = s_u s_v / (1 + uv).
  return massiveResult(div(numerator, denominator), div(mul(u.inverseGamma, v.inverseGamma), denominator));
}

/**
 * addVelocities(u, v) — the collinear composition of two velocities: the speed, in frame S, of a
 * body moving at v in a frame that itself moves at u in S (both along the same line).
 *
 * Formula: u ⊕ v = (β_u + β_v)/(1 + β_u β_v) (in units of c).
 *
 * Domain: |β_u|, |β_v| ≤ 1. A speed of exactly c is light: c ⊕ v = c for any v > −c, and likewise
 * −c ⊕ v = −c. Light against light in opposite directions (c ⊕ −c) is undefined and refused, as
 * are NaN, ±Infinity and |β| > 1. For two massive bodies (|β| < 1) the result never reaches c: when
 * the exact composition is below 1 but rounds to 1, the largest double below 1 is returned.
 *
 * Example: `addVelocities(0.5, 0.5)` → 0.8 (plain β in, plain β out); `addVelocities(0.5 c, 0.5 c)` →
 * 2.3983e8 m/s.
 *
 * Result: a plain β when both u and v are plain numbers (β), otherwise a velocity in m/s.
 *
 * Source: A. Einstein, "Zur Elektrodynamik bewegter Körper", Annalen der Physik 17 (1905), §5;
 * Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.4.
 *
 * Numerics: numerator by TwoSum and 1 + β_u β_v by Dekker's product are exact in double-double, so
 * opposite speeds near c (1 + β_u β_v → 0) keep every digit; one division, rounded once.
 */
export const addVelocities: CalcFunction = {
  name: FN,
  params: [
    { name: 'u', kind: 'speed', description: 'speed of the moving frame S′ in S (a velocity, or β)' },
    { name: 'v', kind: 'speed', description: 'speed of the body in S′, along the same line (a velocity, or β)' },
  ],
  returns: 'speed',
  doc: {
    summary: 'Collinear composition of two velocities; for massive bodies the result never reaches c.',
    formula:
      'u \\oplus v = \\frac{\\beta_u + \\beta_v}{1 + \\beta_u \\beta_v}\\,c \\quad\\left(= \\frac{u + v}{1 + uv/c^2}\\right)',
    domain:
      '|β_u|, |β_v| ≤ 1. Exactly c is light: c ⊕ v = c for any v > −c, −c ⊕ v = −c for v < c; c ⊕ −c is refused, as are NaN, ±Infinity and |β| > 1. For |β_u|, |β_v| < 1 the result is strictly below c: when the exact value is below 1 but rounds to 1, the largest double below 1 is returned. The result is a plain β when u and v are both plain numbers (β), as speeds read plain numbers; with a velocity among them it is a velocity.',
    example: 'addVelocities(0.5, 0.5)',
    exampleResult: '0.8 (plain β in, plain β out; addVelocities(0.5 c, 0.5 c) gives 2.3983e8 m/s)',
    source:
      'A. Einstein, "Zur Elektrodynamik bewegter Körper", Annalen der Physik 17 (1905), §5; J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.4.',
    numerics:
      'Numerator (TwoSum) and denominator 1 + β_u β_v (Dekker product) are exact in double-double, so opposite speeds close to c, where 1 + β_u β_v cancels, lose nothing; one double-double division, rounded once (within about half an ulp).',
  },
  kernel: (u: KernelArgument, v: KernelArgument): number => speedValue(precise(u, v)),
  preciseKernel: precise,
};
