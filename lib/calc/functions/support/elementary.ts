// Elementary functions in double-double, for the few kernels whose formula is transcendental
// (rapidity, proper time of hyperbolic motion, the rocket equation, aberration). Each is accurate to
// far better than a double, so the kernel's single final rounding dominates its error.
//
// Methods: exp by reduction to r = z − k ln 2, Taylor series of expm1(r/2^10) and ten doublings
// s ← s(s + 2) (which keep expm1's relative accuracy); log by one Newton step on exp from the
// double estimate; log1p, atanh and asinh by their series near 0; sin and cos by Taylor series
// on [0, π/4] with the complement on [π/4, π/2]; atan2 by one correction of the double estimate,
// i.e. by rotating (x, y) back by the estimate. (Brent & Zimmermann, "Modern Computer Arithmetic",
// 2010, ch. 4; Muller, "Elementary Functions", 3rd ed., 2016.)
import { add, div, type DD, dd, fastTwoSum, mul, mulNum, neg, scale, sqrt, sub, twoSum } from './double-double';

/** ln 2 to 106 bits (QD library constant). */
const LN2: DD = [6.931471805599452862e-1, 2.319046813846299558e-17];
/** π/2 to 106 bits (QD library constant). */
const HALF_PI: DD = [1.570796326794896558, 6.123233995736766036e-17];

const ONE: DD = [1, 0];
const TWO: DD = [2, 0];

/** 1/n! for n = 0…31 and 1/(2k + 1) for k = 0…15, in double-double, for the series below. */
const INVERSE_FACTORIAL: DD[] = [ONE];
for (let n = 1; n <= 31; n++) INVERSE_FACTORIAL.push(div(INVERSE_FACTORIAL[n - 1], dd(n)));
const INVERSE_ODD: DD[] = Array.from({ length: 16 }, (_, k) => div(ONE, dd(2 * k + 1)));

/** Relative size below which a further series term cannot change a double-double sum. */
const NEGLIGIBLE = 2 ** -110;

/** e^r − 1 for |r| ≤ ln 2 / 2, with full relative accuracy. */
function expm1Reduced(r: DD): DD {
  const x = scale(r, 2 ** -10);
  // Taylor series of expm1(x), |x| < 3.4e-4: ten terms reach 1e-40 relative.
  let power = x;
  let sum = x;
  for (let n = 2; n <= 12; n++) {
    power = mul(power, x);
    const term = mul(power, INVERSE_FACTORIAL[n]);
    sum = add(sum, term);
    if (Math.abs(term[0]) < NEGLIGIBLE * Math.abs(sum[0])) break;
  }
  for (let i = 0; i < 10; i++) sum = mul(sum, add(sum, TWO));
  return sum;
}

export function exp(z: DD): DD {
  if (z[0] > 709.8) return [Infinity, 0];
  if (z[0] < -745.2) return [0, 0];
  const k = Math.round(z[0] / LN2[0]);
  const r = sub(z, mulNum(LN2, k));
  return scale(add(expm1Reduced(r), ONE), 2 ** k);
}

export function expm1(z: DD): DD {
  if (Math.abs(z[0]) <= 0.34) return expm1Reduced(z);
  return sub(exp(z), ONE);
}

/** Natural logarithm of x > 0: Newton's step y + x·e^−y − 1 from the double estimate. */
export function log(x: DD): DD {
  const y0 = Math.log(x[0]);
  return add(dd(y0), sub(mul(x, exp(dd(-y0))), ONE));
}

/** ln(1 + u) for u > −1, accurate relative to the result also for tiny u. */
export function log1p(u: DD): DD {
  if (Math.abs(u[0]) < 0.01) {
    // ln(1 + u) = 2 atanh(z), z = u/(2 + u), |z| < 0.005.
    return scale(atanhSeries(div(u, add(TWO, u))), 2);
  }
  return log(add(ONE, u));
}

/** z + z³/3 + z⁵/5 + … for |z| ≤ 0.01 (at most 12 terms reach 1e-48 relative). */
export function atanhSeries(z: DD): DD {
  const z2 = mul(z, z);
  let power = z;
  let sum = z;
  for (let k = 1; k <= 12; k++) {
    power = mul(power, z2);
    const term = mul(power, INVERSE_ODD[k]);
    sum = add(sum, term);
    if (Math.abs(term[0]) < NEGLIGIBLE * Math.abs(sum[0])) break;
  }
  return sum;
}

/** atanh(b) for a double |b| < 1. */
export function atanh(b: number): DD {
  const a = Math.abs(b);
  let result: DD;
  if (a < 0.01) {
    result = atanhSeries(dd(a));
  } else {
    // ½ ln((1 + a)/(1 − a)) = ½ log1p(2a/(1 − a)); 1 − a is formed exactly.
    result = scale(log1p(div(dd(2 * a), twoSum(1, -a))), 0.5);
  }
  return b < 0 ? neg(result) : result;
}

/** √(1 + w²) without overflow. */
export function hypotOne(w: DD): DD {
  const a: DD = w[0] < 0 ? neg(w) : w;
  if (a[0] <= 1) return sqrt(add(ONE, mul(a, a)));
  const inv = div(ONE, a);
  return mul(a, sqrt(add(ONE, mul(inv, inv))));
}

/** asinh(w). */
export function asinh(w: DD): DD {
  const a: DD = w[0] < 0 ? neg(w) : w;
  let result: DD;
  if (a[0] < 0.01) {
    // Σ (−1)^n (2n)! / (4^n (n!)² (2n + 1)) a^(2n+1); a² < 1e-4, 12 terms reach 1e-48 relative.
    const a2 = mul(a, a);
    let coefficient = 1;
    let power = a;
    let sum = a;
    for (let n = 1; n <= 12; n++) {
      coefficient *= -((2 * n - 1) * (2 * n)) / (4 * n * n);
      power = mul(power, a2);
      const term = mulNum(mul(power, INVERSE_ODD[n]), coefficient);
      sum = add(sum, term);
      if (Math.abs(term[0]) < NEGLIGIBLE * Math.abs(sum[0])) break;
    }
    result = sum;
  } else {
    result = log(add(a, hypotOne(a)));
  }
  return w[0] < 0 ? neg(result) : result;
}

/** Taylor series of sin and cos for 0 ≤ r ≤ π/4 (the 30th-order term is below 1e-40). */
function sinCosReduced(r: DD): [DD, DD] {
  const r2 = mul(r, r);
  let power: DD = ONE; // r^(2n)
  let sinSum = r;
  let cosSum: DD = ONE;
  for (let n = 1; n <= 15; n++) {
    power = mul(power, r2);
    const sign = n % 2 === 1 ? -1 : 1;
    const cosTerm = mulNum(mul(power, INVERSE_FACTORIAL[2 * n]), sign);
    const sinTerm = mulNum(mul(mul(power, r), INVERSE_FACTORIAL[2 * n + 1]), sign);
    cosSum = add(cosSum, cosTerm);
    sinSum = add(sinSum, sinTerm);
    if (
      Math.abs(cosTerm[0]) < NEGLIGIBLE * Math.abs(cosSum[0]) &&
      Math.abs(sinTerm[0]) < NEGLIGIBLE * Math.abs(sinSum[0])
    )
      break;
  }
  return [sinSum, cosSum];
}

/** [sin x, cos x] for a double-double x in [0, π/2]. */
export function sinCos(x: DD): [DD, DD] {
  if (x[0] <= Math.PI / 4) return sinCosReduced(x);
  const [s, c] = sinCosReduced(sub(HALF_PI, x));
  return [c, s];
}

/** atan2(y, x) for y ≥ 0 and x ≥ 0, not both 0, as a double-double angle in [0, π/2]. */
export function atan2FirstQuadrant(y: DD, x: DD): DD {
  const y0 = Math.atan2(y[0], x[0]);
  const [s, c] = sinCos(dd(y0));
  // Rotate (x, y) by −y0: the remaining angle is tiny, so atan of it is the ratio itself.
  const along = add(mul(x, c), mul(y, s));
  const across = sub(mul(y, c), mul(x, s));
  const [hi, lo] = fastTwoSum(y0, div(across, along)[0]);
  return [hi, lo];
}
