// Shared double-double building blocks of the kernels: everything derived from β, and rest energies.
//
// The key quantity is 1 − β², formed exactly: β² = p + e exactly (Dekker's product), and
// 1 − p is exact by TwoSum, so no digit of 1 − β is lost however close β is to 1 — where the
// textbook 1 − β*β in doubles keeps none of them at 1 − β ≈ 1e-16. The rest follows without
// cancellation: 1/γ = √(1 − β²), γ − 1 = β²/(s(1 + s)), 1/γ − 1 = −β²/(1 + s) with s = 1/γ.
import { C } from '../../constants';
import { DomainError, type KernelArgument, type PreciseSpeed } from '../types';
import { keepBelowLight, requireFinite, requireMassiveSpeed } from './domain';
import { atanhSeries, hypotOne, log1p } from './elementary';
import {
  add,
  type DD,
  dd,
  div,
  fromDecimal,
  mul,
  mulNum,
  round,
  scale,
  sqrt,
  sub,
  twoProd,
  twoSum,
} from './double-double';

/** c², exact (c is an integer below 2^53, so Dekker's product is exact). */
export const C_SQUARED: DD = twoProd(C, C);
export const C_DD: DD = [C, 0];
export const ONE: DD = [1, 0];

/** 1 − β², exact to about 2^-106 relative. */
function oneMinusBetaSquared(beta: number): DD {
  const [p, e] = twoProd(beta, beta);
  return sub(twoSum(1, -p), [e, 0]);
}

/** s = 1/γ = √(1 − β²). */
function inverseGamma(beta: number): DD {
  return sqrt(oneMinusBetaSquared(beta));
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
function betaFromKineticRatio(x: DD): DD {
  if (x[0] > 2 ** 500) return ONE;
  return div(sqrt(mul(x, add(x, dd(2)))), add(x, ONE));
}

/** w = a t / c, the dimensionless parameter of hyperbolic motion (sinh of the rapidity reached). */
export function hyperbolicParameter(a0: number, t: number): DD {
  return div(twoProd(a0, t), C_DD);
}

// ---------------------------------------------------------------------------------------------
// Precise speeds (types.ts, PreciseSpeed): β and s = 1/γ in double-double. Every quantity a kernel
// derives from a speed is formed from s without cancellation, so a speed produced by another
// kernel (whose s is exact to about 2^-106 however close to c it is) loses nothing when composed,
// and a plain double β gives the same results as before (s from the exact 1 − β²).

/** A plain β as a precise speed: s = √(1 − β²) with 1 − β² exact. */
export function preciseFromBeta(beta: number): PreciseSpeed {
  return { beta: [beta, 0], inverseGamma: Math.abs(beta) >= 1 ? [0, 0] : inverseGamma(beta) };
}

/** True for a PreciseSpeed argument (as opposed to a plain β). */
export function isPrecise(v: KernelArgument): v is PreciseSpeed {
  return typeof v === 'object' && v !== null;
}

/** The double β of a speed argument. */
export function betaOf(v: KernelArgument): number {
  return isPrecise(v) ? round(v.beta) : v;
}

/**
 * A massive body's speed (|β| < 1), validated, as a PreciseSpeed. A plain β is checked as before
 * (finite, |β| < 1); a precise one must have s > 0 (a speed whose s underflowed is too close to c
 * for anything derived from it to be represented).
 */
export function massiveSpeed(fn: string, name: string, v: KernelArgument): PreciseSpeed {
  if (!isPrecise(v)) return preciseFromBeta(requireMassiveSpeed(fn, name, v));
  const b = round(v.beta);
  if (!Number.isFinite(b) || !Number.isFinite(v.inverseGamma[0])) requireFinite(fn, name, Number.NaN);
  if (!(v.inverseGamma[0] > 0)) {
    if (Math.abs(b) >= 1 && v.inverseGamma[0] === 0) requireMassiveSpeed(fn, name, b);
    throw new DomainError(
      `${fn}: ${name} is so close to c that 1/γ = √(1 − β²) is below the smallest double; use energies or momenta for such beams`,
    );
  }
  return v;
}

/** γ = 1/s. */
export function gammaOfSpeed(v: PreciseSpeed): DD {
  return div(ONE, v.inverseGamma);
}

/** 1 − β² = s². */
export function oneMinusBetaSquaredOf(v: PreciseSpeed): DD {
  return mul(v.inverseGamma, v.inverseGamma);
}

/** γ − 1 = β²/(s(1 + s)): no cancellation at small β. */
export function gammaMinusOneOf(v: PreciseSpeed): DD {
  const s = v.inverseGamma;
  return div(mul(v.beta, v.beta), mul(s, add(ONE, s)));
}

/** 1 − |β|: formed directly below |β| = 1/2, as s²/(1 + |β|) above it (no cancellation near c). */
export function oneMinusAbsBeta(v: PreciseSpeed): DD {
  const a = absDD(v.beta);
  if (a[0] < 0.5) return sub(ONE, a);
  return div(oneMinusBetaSquaredOf(v), add(ONE, a));
}

/** The Doppler factor √((1 + β)/(1 − β)) = (1 + β)/s for β ≥ 0, s/(1 + |β|) for β < 0. */
export function dopplerOf(v: PreciseSpeed): DD {
  const s = v.inverseGamma;
  if (v.beta[0] >= 0) return div(add(ONE, v.beta), s);
  return div(s, sub(ONE, v.beta));
}

export function absDD(a: readonly [number, number]): DD {
  return a[0] < 0 || (a[0] === 0 && a[1] < 0) ? [-a[0], -a[1]] : [a[0], a[1]];
}

/** The double β a speed kernel returns for a precise result: below 1 unless it is light (s = 0, |β| = 1). */
export function speedValue(result: PreciseSpeed | number): number {
  if (typeof result === 'number') return result;
  const b = round(result.beta);
  if (result.inverseGamma[0] === 0 && Math.abs(b) === 1) return b;
  return keepBelowLight(b);
}

/**
 * A massive result: s = 0 or a non-finite part means the speed is beyond what a double-double
 * can carry (γ above about 1e308); it is then returned as the largest double below ±1, without
 * a companion, as the kernels did before companions existed.
 */
export function massiveResult(beta: DD, s: DD): PreciseSpeed | number {
  if (
    !(s[0] > 0) ||
    !Number.isFinite(s[0]) ||
    !Number.isFinite(beta[0]) ||
    !Number.isFinite(beta[1]) ||
    !Number.isFinite(s[1])
  ) {
    return keepBelowLight(round(beta));
  }
  return { beta, inverseGamma: s };
}

/** atanh β (the rapidity): the odd series below |β| = 0.01, ½ log1p(2|β|/(1 − |β|)) above, 1 − |β| from s. */
export function rapidityOf(v: PreciseSpeed): DD {
  const a = absDD(v.beta);
  const result: DD = a[0] < 0.01 ? atanhSeries(a) : scale(log1p(div(scale(a, 2), oneMinusAbsBeta(v))), 0.5);
  return v.beta[0] < 0 ? [-result[0], -result[1]] : result;
}

/**
 * Kinetic energy from momentum: T = pc · y/(√(1 + y²) + 1) with y = βγ = p/(mc), the same as
 * p²c²/(E + mc²) and as E − mc², without E − mc²'s cancellation at small p, and without squaring
 * p or m (so nothing leaves the double range that the result does not). m = 0 gives pc.
 */
export function kineticFromMomentumDD(p: DD, m: number): DD {
  const pc = mulNum(p, C);
  if (m === 0) return pc;
  const y = div(div(p, dd(m)), C_DD);
  return mul(pc, div(y, add(hypotOne(y), ONE)));
}

// ---------------------------------------------------------------------------------------------
// From a kinetic energy given in double-double (so that T = A·(T/A), an exact product, loses
// nothing before the kinematics): the numerics of gammaFromKinetic, momentumFromKinetic and
// speedFromKinetic, shared with their per-nucleon forms.

/** γ = 1 + T/(mc²), m > 0. */
export function gammaFromKineticDD(T: DD, m: number): DD {
  return add(div(T, restEnergy(m)), ONE);
}

/** pc = √T·√(T + 2mc²) (no E² − m²c⁴ cancellation; no square leaves the double range); p = pc/c. */
export function momentumFromKineticDD(T: DD, m: number): DD {
  return div(mul(sqrt(T), sqrt(add(T, scale(restEnergy(m), 2)))), C_DD);
}

/**
 * β = √(x(x + 2))/(x + 1) and 1/γ = 1/(1 + x), x = (T/m)/c² (not T/(mc²): mc² overflows for m above
 * 2e291 kg, where T/m may not), for m > 0.
 */
export function speedFromKineticDD(T: DD, m: number): PreciseSpeed | number {
  const x = div(div(T, dd(m)), C_SQUARED);
  // T/m beyond the double range (x not finite): β rounds to 1 and γ is not representable.
  if (!(x[0] <= 2 ** 500)) return massiveResult([1, 0], Number.isFinite(x[0]) ? div(ONE, x) : [0, 0]);
  return massiveResult(betaFromKineticRatio(x), div(ONE, add(x, ONE)));
}

/**
 * p = |qBρ| as an exact (Dekker) product, for Bρ and q already finite: q ≠ 0 and Bρ of the sign of q
 * (Bρ = p/q with p ≥ 0; 0 allowed), refused otherwise naming the function.
 */
export function momentumFromRigidityDD(fn: string, Brho: number, q: number): DD {
  if (q === 0) throw new DomainError(`${fn}: q must not be zero (a neutral particle has no rigidity); got q = 0 C`);
  if (Brho !== 0 && Math.sign(Brho) !== Math.sign(q)) {
    throw new DomainError(
      `${fn}: Brho must have the sign of q (Bρ = p/q with p ≥ 0); got Brho = ${Brho} T m, q = ${q} C`,
    );
  }
  const qBrho = twoProd(Brho, q);
  return qBrho[0] < 0 ? [-qBrho[0], -qBrho[1]] : qBrho;
}
