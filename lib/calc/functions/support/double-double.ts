// Double-double arithmetic: a value is the unevaluated sum hi + lo of two doubles with
// |lo| ≤ ulp(hi)/2, which carries about 106 bits. The kernels evaluate their (stable) formulas in it
// and round once at the end, so each result is within about half an ulp of the exact value of the
// formula for the given double inputs, whatever cancellation hides inside (1 − β² near c,
// 1 + uv for opposite speeds near c, t − βx/c in a boost).
//
// Algorithms: Dekker, "A floating-point technique for extending the available precision",
// Numerische Mathematik 18 (1971); Knuth, TAOCP vol. 2, §4.2.2 (TwoSum); Hida, Li, Bailey,
// "Library for double-double and quad-double arithmetic" (QD, 2007) for the add, divide and square root.
// The error-free transformations are exact as long as nothing overflows and no product falls into
// the subnormal range; the kernels scale their operands where squares could leave the double range.

export type DD = readonly [hi: number, lo: number];

/** 2^27 + 1, Veltkamp's splitting constant for 53-bit doubles. */
const SPLITTER = 134_217_729;

/** a + b = s + e exactly (Knuth). */
export function twoSum(a: number, b: number): DD {
  const s = a + b;
  const bb = s - a;
  return [s, a - (s - bb) + (b - bb)];
}

/** a + b = s + e exactly, when |a| ≥ |b| or a = 0 (Dekker). */
export function fastTwoSum(a: number, b: number): DD {
  const s = a + b;
  return [s, b - (s - a)];
}

/** Veltkamp's split of a into two 26-bit halves; beyond 2^996, SPLITTER·a would overflow, so a is
 * split at a scale 2^-28 lower and the halves scaled back (exact: powers of two). */
function split(a: number): DD {
  if ((a > 6.69692879491417e299 || a < -6.69692879491417e299) && Number.isFinite(a)) {
    const [h, l] = split(a * 3.725290298461914e-9);
    return [h * 268435456, l * 268435456];
  }
  const t = SPLITTER * a;
  const hi = t - (t - a);
  return [hi, a - hi];
}

// The operations below are written out on plain doubles, with the two halves of an intermediate
// double-double held in H and L, rather than made of twoSum, twoProd and fastTwoSum: the same
// operations in the same order (so the same bits), without a two-element array per step. Each kernel
// makes thousands of these steps per first-order propagation, and the arrays were most of its garbage.
let H = 0;
let L = 0;

function isLarge(a: number): boolean {
  return (a > 6.69692879491417e299 || a < -6.69692879491417e299) && Number.isFinite(a);
}

/** The error e of the product p = fl(a · b): a · b = p + e exactly (Dekker, Veltkamp; split as in split()). */
function productError(a: number, b: number, p: number): number {
  if (isLarge(a) || isLarge(b)) {
    const [ah, al] = split(a);
    const [bh, bl] = split(b);
    return ah * bh - p + ah * bl + al * bh + al * bl;
  }
  let t = SPLITTER * a;
  const ah = t - (t - a);
  const al = a - ah;
  t = SPLITTER * b;
  const bh = t - (t - b);
  const bl = b - bh;
  return ah * bh - p + ah * bl + al * bh + al * bl;
}

/** (a0 + a1) + (b0 + b1) into H, L: add() below. */
function addInto(a0: number, a1: number, b0: number, b1: number): void {
  // twoSum(a0, b0)
  const s1 = a0 + b0;
  let bb = s1 - a0;
  const s2 = a0 - (s1 - bb) + (b0 - bb);
  // twoSum(a1, b1)
  const t1 = a1 + b1;
  bb = t1 - a1;
  const t2 = a1 - (t1 - bb) + (b1 - bb);
  // fastTwoSum(s1, s2 + t1)
  const v = s2 + t1;
  const u1 = s1 + v;
  const u2 = v - (u1 - s1);
  // fastTwoSum(u1, u2 + t2)
  const w = u2 + t2;
  H = u1 + w;
  L = w - (H - u1);
}

/** (b0 + b1) · q into H, L: mulNum() below. */
function mulNumInto(b0: number, b1: number, q: number): void {
  const p = b0 * q;
  const v = productError(b0, q, p) + b1 * q;
  H = p + v;
  L = v - (H - p);
}

/** a · b = p + e exactly (Dekker, Veltkamp). */
export function twoProd(a: number, b: number): DD {
  const p = a * b;
  return [p, productError(a, b, p)];
}

export function dd(x: number): DD {
  return [x, 0];
}

export function neg(a: DD): DD {
  return [-a[0], -a[1]];
}

export function add(a: DD, b: DD): DD {
  addInto(a[0], a[1], b[0], b[1]);
  return [H, L];
}

/** a − b, as a + (−b) (IEEE x + (−y) is x − y, signed zeros included). */
export function sub(a: DD, b: DD): DD {
  addInto(a[0], a[1], -b[0], -b[1]);
  return [H, L];
}

export function mul(a: DD, b: DD): DD {
  const p = a[0] * b[0];
  const v = productError(a[0], b[0], p) + (a[0] * b[1] + a[1] * b[0]);
  const s = p + v;
  return [s, v - (s - p)];
}

export function mulNum(a: DD, b: number): DD {
  mulNumInto(a[0], a[1], b);
  return [H, L];
}

/** Exact scaling by a power of two (no rounding unless the result under- or overflows). */
export function scale(a: DD, powerOfTwo: number): DD {
  return [a[0] * powerOfTwo, a[1] * powerOfTwo];
}

export function div(a: DD, b: DD): DD {
  const b0 = b[0];
  const b1 = b[1];
  const q1 = a[0] / b0;
  // r = a − b·q1
  mulNumInto(b0, b1, q1);
  addInto(a[0], a[1], -H, -L);
  const q2 = H / b0;
  // r = r − b·q2
  const r0 = H;
  const r1 = L;
  mulNumInto(b0, b1, q2);
  addInto(r0, r1, -H, -L);
  const q3 = H / b0;
  // fastTwoSum(q1, q2), then + [q3, 0]
  const s = q1 + q2;
  const e = q2 - (s - q1);
  addInto(s, e, q3, 0);
  return [H, L];
}

export function sqrt(a: DD): DD {
  if (a[0] <= 0) return [0, 0];
  const x = Math.sqrt(a[0]);
  // residual = a − x·x
  const p = x * x;
  addInto(a[0], a[1], -p, -productError(x, x, p));
  const d = H / (2 * x);
  const s = x + d;
  return [s, d - (s - x)];
}

/** The double nearest to the double-double value. */
export function round(a: DD): number {
  return a[0] + a[1];
}

/** 2^k with k = the binary exponent of |x| (x finite, non-zero): |x| / 2^k lies in [1, 2). */
export function binade(x: number): number {
  let k = Math.floor(Math.log2(Math.abs(x)));
  // log2 can round across a power of two; settle it with exact comparisons.
  if (Math.abs(x) < 2 ** k) k -= 1;
  else if (Math.abs(x) >= 2 ** (k + 1)) k += 1;
  return 2 ** Math.max(-1022, Math.min(1023, k));
}

/**
 * The double-double nearest to the value of a decimal literal, e.g. "6.62607015e-34", so that a
 * constant defined exactly in decimal (SI 2019) or quoted in decimal (CODATA) enters the kernels
 * with its decimal value rather than its nearest double. Exact rational arithmetic on BigInt.
 */
export function fromDecimal(literal: string): DD {
  const match = /^([+-]?)(\d+)(?:\.(\d*))?(?:[eE]([+-]?\d+))?$/.exec(literal.trim());
  if (!match) throw new Error(`fromDecimal: not a decimal literal: ${literal}`);
  const [, sign, intPart, fracPart = '', expPart = '0'] = match;
  const digits = BigInt(intPart + fracPart);
  const exp10 = Number(expPart) - fracPart.length;
  const hi = Number(`${sign}${intPart}.${fracPart}e${expPart}`);
  if (hi === 0 || digits === 0n) return [hi, 0];
  // hi = m · 2^e2 exactly, with m an integer.
  const unit = binade(hi) / 2 ** 52;
  const m = BigInt(Math.abs(hi) / unit);
  const e2 = Math.round(Math.log2(unit));
  // value − |hi| = digits·10^exp10 − m·2^e2, as a rational num / den.
  let num: bigint;
  let den: bigint;
  const pow10 = 10n ** BigInt(Math.abs(exp10));
  const pow2 = 2n ** BigInt(Math.abs(e2));
  if (exp10 >= 0 && e2 >= 0) {
    num = digits * pow10 - m * pow2;
    den = 1n;
  } else if (exp10 >= 0) {
    num = digits * pow10 * pow2 - m;
    den = pow2;
  } else if (e2 >= 0) {
    num = digits - m * pow2 * pow10;
    den = pow10;
  } else {
    num = digits * pow2 - m * pow10;
    den = pow10 * pow2;
  }
  const lo = ratioToNumber(num, den);
  return sign === '-' ? [hi, -lo] : [hi, lo];
}

/** num/den to within a few ulp, for |num/den| in the normal range, num and den possibly huge. */
function ratioToNumber(num: bigint, den: bigint): number {
  if (num === 0n) return 0;
  const negative = num < 0n;
  const n = negative ? -num : num;
  // Keep 64 significant bits of each before converting.
  const shiftN = Math.max(0, n.toString(2).length - 64);
  const shiftD = Math.max(0, den.toString(2).length - 64);
  const value = (Number(n >> BigInt(shiftN)) / Number(den >> BigInt(shiftD))) * 2 ** (shiftN - shiftD);
  return negative ? -value : value;
}
