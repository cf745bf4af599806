// Hyperbolic motion given by the distance covered from rest: the shared double-double core of
// hyperbolicSpeedFromDistance, hyperbolicCoordinateTimeFromDistance, hyperbolicProperTimeFromDistance
// and the accelerate-then-decelerate trip functions.
//
// Everything follows from x = γ − 1 = |a0| d/c² (the work done per unit rest energy), formed as an
// exact product divided once: βγ = w = √(x(2 + x)), coordinate time t = (c/a)w, proper time
// τ = (c/a) acosh(1 + x) = (c/a) asinh(w), speed β = w/(1 + x) and 1/γ = 1/(1 + x). The textbook
// forms lose everything at small x (γ² − 1 and acosh(γ) at γ = 1 + 1e-12) and overflow early (c/a
// at a tiny a, a·d at large ones); the forms here keep full relative accuracy from x = 0 to the
// double range (Rindler, Relativity: Special, General, and Cosmological, 2nd ed., 2006, ch. 3).
import { DomainError, type PreciseSpeed } from '../types';
import { BELOW_ONE, requireFinite, requireNonNegative } from './domain';
import { add, type DD, dd, div, mul, neg, round, sqrt, twoProd } from './double-double';
import { asinh, log } from './elementary';
import { C_DD, C_SQUARED, massiveResult, ONE } from './kinematics';

const TWO: DD = [2, 0];

/** A validated motion: |a0|, the distance and the direction, with x = γ − 1 (Infinity beyond the double range). */
export interface DistanceMotion {
  readonly a: number;
  readonly d: number;
  readonly sign: number;
  readonly x: DD;
}

/**
 * Checks a0 (finite, either sign: the direction of the motion) and d (≥ 0, the distance covered from
 * rest along a0); a0 = 0 is refused for d > 0 (a body at rest that does not accelerate never gets there).
 */
export function distanceMotion(fn: string, a0: number, d: number, dName = 'd'): DistanceMotion {
  requireFinite(fn, 'a0', a0);
  requireNonNegative(fn, dName, d, 'm', 'the distance covered from rest');
  const a = Math.abs(a0);
  if (a === 0 && d > 0)
    throw new DomainError(
      `${fn}: a0 must not be 0 when ${dName} > 0 (a body at rest that does not accelerate never covers a distance); got a0 = 0`,
    );
  const sign = a0 < 0 ? -1 : 1;
  // a·d/c² from the exact product where it is representable, otherwise as (a/c²)·d.
  const x = a * d < 1e300 ? div(twoProd(a, d), C_SQUARED) : mul(div(dd(a), C_SQUARED), dd(d));
  return { a, d, sign, x: Number.isFinite(x[0]) ? x : [Infinity, 0] };
}

function finiteX(m: DistanceMotion): boolean {
  return Number.isFinite(m.x[0]);
}

/** βγ = w = √(x(2 + x)), as x·√(1 + 2/x) above x = 1 (no overflow before x itself overflows). */
function betaGammaOf(m: DistanceMotion): DD {
  const x = m.x;
  if (x[0] < 1) return sqrt(mul(x, add(TWO, x)));
  return mul(x, sqrt(add(ONE, div(TWO, x))));
}

/** The speed reached, with its companion: β = w/(1 + x), 1/γ = 1/(1 + x); the sign is a0's. */
export function speedAfter(m: DistanceMotion): PreciseSpeed | number {
  if (!finiteX(m)) return m.sign * BELOW_ONE;
  const onePlusX = add(ONE, m.x);
  const beta = div(betaGammaOf(m), onePlusX);
  return massiveResult(m.sign < 0 ? neg(beta) : beta, div(ONE, onePlusX));
}

/** Coordinate time t = (c/a)·w: √(d/a)·√(2 + x) below x = 1 (no division by a small a), (d/c)·√(1 + 2/x) above. */
export function coordinateTimeAfter(m: DistanceMotion): DD {
  if (m.d === 0) return [0, 0];
  if (!finiteX(m)) return div(dd(m.d), C_DD);
  if (m.x[0] < 1) return mul(div(sqrt(dd(m.d)), sqrt(dd(m.a))), sqrt(add(TWO, m.x)));
  return mul(div(dd(m.d), C_DD), sqrt(add(ONE, div(TWO, m.x))));
}

/**
 * Proper time τ = (c/a) acosh(1 + x) = (c/a) asinh(w): t·asinh(w)/w for w ≤ 1 (which tends to t and
 * never divides by a small a), (c/a)·ln(1 + x + w) above, and (c/a)(ln(2a/c²) + ln d) where x
 * itself is beyond the double range (acosh(1 + x) = ln 2x + O(1/x) there).
 */
export function properTimeAfter(m: DistanceMotion): DD {
  if (m.d === 0) return [0, 0];
  const cOverA = div(C_DD, dd(m.a));
  if (!finiteX(m)) return mul(cOverA, add(log(div(dd(2 * m.a), C_SQUARED)), log(dd(m.d))));
  const w = betaGammaOf(m);
  const t = coordinateTimeAfter(m);
  if (w[0] === 0) return t;
  if (w[0] <= 1) return div(mul(t, asinh(w)), w);
  return mul(cOverA, log(add(add(ONE, m.x), w)));
}

/** Half of a distance, as the trip functions use it (exact in binary unless d is subnormal). */
export function half(d: number): number {
  return d / 2;
}

/** Twice a double-double, rounded once (exact scaling). */
export function twiceRounded(x: DD): number {
  return round(x) * 2;
}
