import { keepBelowLight, requireFinite } from './support/domain';
import { add, div, round, twoProd, twoSum } from './support/double-double';
import { type CalcFunction, DomainError } from './types';

const FN = 'addVelocities';

function requireSpeedUpToLight(name: string, beta: number): number {
  requireFinite(FN, name, beta);
  if (Math.abs(beta) > 1) {
    throw new DomainError(`${FN}: |β| of ${name} must not exceed 1 (1 is light); got β = ${beta}`);
  }
  return beta;
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
 * Example: `addVelocities(0.5, 0.5)` → 0.8 c = 239 833 966.4 m/s.
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
    formula: 'u \\oplus v = \\frac{\\beta_u + \\beta_v}{1 + \\beta_u \\beta_v}\\,c \\quad\\left(= \\frac{u + v}{1 + uv/c^2}\\right)',
    domain:
      '|β_u|, |β_v| ≤ 1. Exactly c is light: c ⊕ v = c for any v > −c, −c ⊕ v = −c for v < c; c ⊕ −c is refused, as are NaN, ±Infinity and |β| > 1. For |β_u|, |β_v| < 1 the result is strictly below c: when the exact value is below 1 but rounds to 1, the largest double below 1 is returned.',
    example: 'addVelocities(0.5, 0.5)',
    exampleResult: '0.8 c = 2.398339664e8 m/s',
    source: 'A. Einstein, "Zur Elektrodynamik bewegter Körper", Annalen der Physik 17 (1905), §5; J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), §11.4.',
    numerics:
      'Numerator (TwoSum) and denominator 1 + β_u β_v (Dekker product) are exact in double-double, so opposite speeds close to c, where 1 + β_u β_v cancels, lose nothing; one double-double division, rounded once (within about half an ulp).',
  },
  kernel: (u: number, v: number): number => {
    requireSpeedUpToLight('u', u);
    requireSpeedUpToLight('v', v);
    const uLight = Math.abs(u) === 1;
    const vLight = Math.abs(v) === 1;
    if (uLight || vLight) {
      if (uLight && vLight && u !== v) {
        throw new DomainError(`${FN}: light composed with light in the opposite direction is undefined; got β_u = ${u}, β_v = ${v}`);
      }
      return uLight ? u : v;
    }
    const numerator = twoSum(u, v);
    const denominator = add([1, 0], twoProd(u, v));
    return keepBelowLight(round(div(numerator, denominator)));
  },
};
