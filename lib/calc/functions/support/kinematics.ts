// Shared double-double building blocks of the kernels: everything derived from β, and rest energies.
//
// The key quantity is 1 − β², formed exactly: β² = p + e exactly (Dekker's product), and
// 1 − p is exact by TwoSum, so no digit of 1 − β is lost however close β is to 1 — where the
// textbook 1 − β*β in doubles keeps none of them at 1 − β ≈ 1e-16. The rest follows without
// cancellation: 1/γ = √(1 − β²), γ − 1 = β²/(s(1 + s)), 1/γ − 1 = −β²/(1 + s) with s = 1/γ.
import { C } from '../../constants';
import { add, type DD, dd, div, fromDecimal, mul, mulNum, sqrt, sub, twoProd, twoSum } from './double-double';

/** c², exact (c is an integer below 2^53, so Dekker's product is exact). */
export const C_SQUARED: DD = twoProd(C, C);
export const C_DD: DD = [C, 0];
export const ONE: DD = [1, 0];

/** 1 − β², exact to about 2^-106 relative. */
export function oneMinusBetaSquared(beta: number): DD {
  const [p, e] = twoProd(beta, beta);
  return sub(twoSum(1, -p), [e, 0]);
}

/** s = 1/γ = √(1 − β²). */
export function inverseGamma(beta: number): DD {
  return sqrt(oneMinusBetaSquared(beta));
}

export function gamma(beta: number): DD {
  return div(ONE, inverseGamma(beta));
}

/** γ − 1 = β² / (s(1 + s)), s = 1/γ: no cancellation at small β. */
export function gammaMinusOne(beta: number): DD {
  const s = inverseGamma(beta);
  return div(twoProd(beta, beta), mul(s, add(ONE, s)));
}

/** Rest energy mc² in joules. */
export function restEnergy(mass: number): DD {
  return mulNum(C_SQUARED, mass);
}

/** A constant given in decimal (SI-exact or CODATA), as a double-double of its decimal value. */
export function decimalConstant(value: number): DD {
  return fromDecimal(String(value));
}

/** β = √(x(x + 2)) / (x + 1) for the ratio x = T/(mc²) ≥ 0, as a double-double. */
export function betaFromKineticRatio(x: DD): DD {
  if (x[0] > 2 ** 500) return ONE;
  return div(sqrt(mul(x, add(x, dd(2)))), add(x, ONE));
}

/** w = a t / c, the dimensionless parameter of hyperbolic motion (sinh of the rapidity reached). */
export function hyperbolicParameter(a0: number, t: number): DD {
  return div(twoProd(a0, t), C_DD);
}
