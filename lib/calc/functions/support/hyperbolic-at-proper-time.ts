// Hyperbolic motion given by the proper time τ elapsed since the start from rest: the shared
// double-double core of hyperbolicSpeedAtProperTime, hyperbolicCoordinateTimeAtProperTime and
// hyperbolicDistanceAtProperTime.
//
// Everything follows from the rapidity reached, u = |a0|τ/c (formed from the exact product):
// β = tanh u, t = (c/a) sinh u, x = (c²/a)(cosh u − 1) (Rindler, Relativity: Special, General, and
// Cosmological, 2nd ed., 2006, ch. 3). For u ≤ 1 the even series sinh(u)/u and 2(cosh u − 1)/u² are
// summed in double-double, so t = τ·sinh(u)/u and x = ½aτ²·2(cosh u − 1)/u² neither cancel (the
// textbook cosh u − 1 keeps nothing at u = 1e-9) nor divide by a small a0; above, e^u in
// double-double; above u = 700 (where e^u nears the double range) t and x are e^(u + ln(c/2a)) and
// e^(u + ln(c²/2a)), which stay finite as long as the result does.
import { BELOW_ONE, requireFinite, requireNonNegative } from './domain';
import { add, type DD, dd, div, mul, neg, scale, sub, twoProd } from './double-double';
import { exp, log } from './elementary';
import { C_DD, C_SQUARED, massiveResult, ONE } from './kinematics';
import type { PreciseSpeed } from '../types';

/** A validated motion: |a0|, τ, the direction, and u = |a0|τ/c (Infinity beyond the double range). */
export interface ProperTimeMotion {
  readonly a: number;
  readonly tau: number;
  readonly sign: number;
  readonly u: DD;
}

/** Above this rapidity the speed is returned as the largest double below 1 without its companion (1/γ below 1e-299). */
const SPEED_LIMIT = 690;
/** Above this rapidity e^u is taken through logarithms (e^700 ≈ 1e304). */
const EXP_LIMIT = 700;

export function properTimeMotion(fn: string, a0: number, tau: number): ProperTimeMotion {
  requireFinite(fn, 'a0', a0);
  requireNonNegative(fn, 'tau', tau, 's', 'proper time since the start from rest');
  const a = Math.abs(a0);
  const product = a * tau;
  const u: DD = product < 1e300 ? div(twoProd(a, tau), C_DD) : [Infinity, 0];
  return { a, tau, sign: a0 < 0 ? -1 : 1, u };
}

/** Σ c_k z^k for z = u² ≤ 1, the coefficients in double-double (16 terms reach 2^-110 relative). */
function evenSeries(coefficients: readonly DD[], u: DD): DD {
  const z = mul(u, u);
  let power: DD = ONE;
  let sum: DD = coefficients[0];
  for (let k = 1; k < coefficients.length; k++) {
    power = mul(power, z);
    const term = mul(power, coefficients[k]);
    sum = add(sum, term);
    if (Math.abs(term[0]) < 2 ** -110 * Math.abs(sum[0])) break;
  }
  return sum;
}

/** 1/n! for n = 0 … 35. */
const INVERSE_FACTORIAL: DD[] = [ONE];
for (let n = 1; n <= 35; n++) INVERSE_FACTORIAL.push(div(INVERSE_FACTORIAL[n - 1], dd(n)));
/** sinh(u)/u = Σ u^(2k)/(2k + 1)!. */
const SINHC: DD[] = Array.from({ length: 17 }, (_, k) => INVERSE_FACTORIAL[2 * k + 1]);
/** 2(cosh u − 1)/u² = Σ 2u^(2k)/(2k + 2)!. */
const COSHC: DD[] = Array.from({ length: 17 }, (_, k) => scale(INVERSE_FACTORIAL[2 * k + 2], 2));

/** The speed reached, with its companion: β = tanh u, 1/γ = 1/cosh u; the sign is a0's. */
export function speedAtProperTime(m: ProperTimeMotion): PreciseSpeed | number {
  const u = m.u;
  if (!(u[0] <= SPEED_LIMIT)) return m.sign * BELOW_ONE;
  let beta: DD;
  let s: DD;
  if (u[0] <= 1) {
    // sinh u = u·S(u), cosh u = 1 + ½u²·K(u): no cancellation, nothing lost at tiny u.
    const sinh = mul(u, evenSeries(SINHC, u));
    const cosh = add(ONE, scale(mul(mul(u, u), evenSeries(COSHC, u)), 0.5));
    beta = div(sinh, cosh);
    s = div(ONE, cosh);
  } else {
    // e = e^−u ≤ 0.37: β = (1 − e²)/(1 + e²), 1/γ = 2e/(1 + e²).
    const e = exp(neg(u));
    const e2 = mul(e, e);
    const denominator = add(ONE, e2);
    beta = div(sub(ONE, e2), denominator);
    s = div(scale(e, 2), denominator);
  }
  return massiveResult(m.sign < 0 ? neg(beta) : beta, s);
}

/** ln(k/(2a)) for k = c or c² (as the difference of logarithms: k/(2a) itself may overflow). */
function logOver2a(k: DD, a: number): DD {
  return sub(log(k), log(dd(2 * a)));
}

/** Coordinate time t = (c/a) sinh u: τ·sinh(u)/u (series for u ≤ 1), e^(u + ln(c/2a)) above u = 700. */
export function coordinateTimeAtProperTime(m: ProperTimeMotion): DD {
  const u = m.u;
  if (m.tau === 0 || m.a === 0) return dd(m.tau);
  if (!Number.isFinite(u[0])) return [Infinity, 0];
  if (u[0] <= 1) return mul(dd(m.tau), evenSeries(SINHC, u));
  if (u[0] > EXP_LIMIT) return exp(add(u, logOver2a(C_DD, m.a)));
  const E = exp(u);
  const sinh = scale(sub(E, div(ONE, E)), 0.5);
  return mul(dd(m.tau), div(sinh, u));
}

/**
 * Distance x = (c²/a)(cosh u − 1), unsigned: ½aτ²·2(cosh u − 1)/u² for u ≤ 1, cτ·(e^u − 1)²/(2e^u u)
 * above, e^(u + ln(c²/2a)) above u = 700.
 */
export function distanceAtProperTime(m: ProperTimeMotion): DD {
  const u = m.u;
  if (m.tau === 0 || m.a === 0) return [0, 0];
  if (!Number.isFinite(u[0])) return [Infinity, 0];
  if (u[0] <= 1) {
    // aτ² as (aτ)·τ, or (τ·τ)·a where aτ is so small that its exact product would lose digits.
    const aTau2 = m.a * m.tau >= 1e-280 ? mul(twoProd(m.a, m.tau), dd(m.tau)) : mul(twoProd(m.tau, m.tau), dd(m.a));
    return mul(scale(aTau2, 0.5), evenSeries(COSHC, u));
  }
  if (u[0] > EXP_LIMIT) return exp(add(u, logOver2a(C_SQUARED, m.a)));
  const E = exp(u);
  const eMinusOne = sub(E, ONE);
  // (e^u − 1)·((e^u − 1)/(2e^u)): the square of e^u − 1 itself would overflow above u ≈ 355.
  const coshMinusOne = mul(eMinusOne, div(eMinusOne, scale(E, 2)));
  return mul(twoProd(299_792_458, m.tau), div(coshMinusOne, u));
}
