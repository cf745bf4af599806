// Propagation of measurement uncertainty through a model y = f(x₁, …, x_N) over SI numbers, the two
// ways a checker expects to see it:
//
// - firstOrder: the law of propagation of uncertainty of JCGM 100:2008 (the GUM), eq. (10), or eq. (13)
//   when the inputs are correlated, with sensitivity coefficients c_i = ∂f/∂x_i taken by central
//   differences on the model itself, the budget (c_i u_i and each one's share of u_c²), and a flag
//   saying whether the linearisation is good enough to trust (see NON_LINEAR_THRESHOLD).
// - monteCarlo: the propagation of distributions of JCGM 101:2008 (normal or rectangular inputs,
//   correlated normals through a Cholesky factor), with the probabilistically symmetric coverage
//   interval of its 7.7 and standard errors of every figure from independent blocks of trials (7.9.4);
//   validateAgainstMonteCarlo then applies the comparison of its 8.2.
//
// The module is pure arithmetic: the model is a plain function of a number array that throws (or
// returns a non-finite number) outside its domain, so the sheet engine can hand in a compiled sheet and
// the tests a one-line lambda. Nothing here is random unless seeded: createRandom is xoshiro128**
// seeded through splitmix64, uses only 32-bit integer arithmetic, Math.log and Math.sqrt (V8 computes
// Math.log with its own port of fdlibm, not the platform's libm), so a seed gives the same draws on
// every machine and an issued sheet's Monte Carlo figures can be reproduced exactly.

type Distribution = 'normal' | 'rectangular';

/** value and standard uncertainty u (for 'rectangular', the half-width is u·√3). */
export interface UncertainInput {
  value: number;
  u: number;
  distribution?: Distribution;
}

export interface FirstOrder {
  /** model(values). */
  y: number;
  /** Combined standard uncertainty, JCGM 100:2008 eq. (10), or (13) with correlation. */
  uc: number;
  /** c_i = ∂f/∂x_i at the estimates; NaN for an input with u = 0 (the model is not differentiated there). */
  sensitivities: number[];
  /** c_i·u_i (signed); 0 for an input with u = 0. */
  contributions: number[];
  /** (c_i u_i)²/uc² (uncorrelated part; sum 1 when uncorrelated); all 0 when uc = 0. */
  shares: number[];
  /** First order poor: second-order terms above NON_LINEAR_THRESHOLD·uc², the model fails within ±2u_i, or uc = 0 with some u_i > 0. */
  nonLinear: boolean;
}

export interface MonteCarloOptions {
  trials: number;
  seed: number;
  /** Blocks the trials are split into for the standard errors (JCGM 101:2008, 7.9.4); default 10. */
  blocks?: number;
  /** Coverage probability of the interval; default 0.9545, as k = 2 for a normal distribution. */
  coverage?: number;
  /** Correlation matrix of the inputs (Pearson coefficients of the inputs themselves, as for firstOrder). */
  correlation?: readonly (readonly number[])[];
}

export interface MonteCarloResult {
  trials: number;
  /** Trials the model could evaluate; the statistics are over these only. */
  valid: number;
  /** Trials whose draws the model refused (threw or returned a non-finite number). */
  outOfDomain: number;
  mean: number;
  /** Standard deviation of the valid values (divisor valid − 1). */
  u: number;
  /** Probabilistically symmetric coverage interval (JCGM 101:2008, 7.7). */
  low: number;
  high: number;
  /* standard errors from the block spread, JCGM 101:2008 7.9 */
  meanSe: number;
  uSe: number;
  lowSe: number;
  highSe: number;
}

export interface Random {
  /** Uniform on [0, 1) with 53 random bits. */
  uniform(): number;
  /** Standard normal, by Marsaglia's polar method. */
  normal(): number;
  /** The generator's raw 32-bit output. */
  nextUint32(): number;
}

/** Thrown when the model cannot be evaluated on either side of an input's estimate (a domain boundary). */
export class UncertaintyDomainError extends Error {
  readonly inputIndex: number;
  constructor(inputIndex: number, message: string) {
    super(message);
    this.name = 'UncertaintyDomainError';
    this.inputIndex = inputIndex;
  }
}

/**
 * Second-order variance, as a fraction of uc², above which firstOrder reports nonLinear.
 *
 * Why 0.1 % and not 1 %: the flag decides whether the Monte Carlo check runs, and that check (JCGM 101,
 * 8.2, ndig = 2) allows the end points of y ± 2u_c to move by only 1 % to 10 % of u_c. A quadratic term
 * whose variance is 1 % of u_c² already moves them by about 20 % of u_c (f = x² at x = 10, u = 1:
 * GUM [59.9, 140.1], true [64, 144]); at 0.1 % the shift is about 5 % of u_c (x = 20: [320, 480] against
 * [324, 484]), where the validation itself starts to fail, and at 0.05 % (x = 30) it passes.
 */
const NON_LINEAR_THRESHOLD = 1e-3;

const EPS = Number.EPSILON;
const SQRT3 = Math.sqrt(3);

// Evaluates the model, returning undefined where it throws or gives a non-finite number.
function tryModel(model: (x: readonly number[]) => number, x: readonly number[]): number | undefined {
  try {
    const v = model(x);
    return typeof v === 'number' && Number.isFinite(v) ? v : undefined;
  } catch {
    return undefined;
  }
}

function withShift(values: readonly number[], i: number, di: number, j = -1, dj = 0): number[] {
  const x = values.slice();
  x[i] = values[i] + di;
  if (j >= 0) x[j] = values[j] + dj;
  return x;
}

function checkInputs(inputs: readonly UncertainInput[]): void {
  inputs.forEach((input, i) => {
    if (!Number.isFinite(input.value)) throw new RangeError(`input ${i}: the value must be a finite number`);
    if (!Number.isFinite(input.u) || input.u < 0)
      throw new RangeError(`input ${i}: the standard uncertainty must be a finite number ≥ 0`);
    const d = input.distribution ?? 'normal';
    if (d !== 'normal' && d !== 'rectangular') throw new RangeError(`input ${i}: unknown distribution "${String(d)}"`);
  });
}

function checkCorrelation(correlation: readonly (readonly number[])[], n: number): void {
  if (correlation.length !== n) throw new RangeError(`the correlation matrix must be ${n}×${n}`);
  for (let i = 0; i < n; i++) {
    const row = correlation[i];
    if (!row || row.length !== n) throw new RangeError(`the correlation matrix must be ${n}×${n}`);
    for (let j = 0; j < n; j++) {
      const r = row[j];
      if (!Number.isFinite(r) || Math.abs(r) > 1) throw new RangeError(`correlation (${i}, ${j}) must lie in [−1, 1]`);
      if (i === j && Math.abs(r - 1) > 1e-12) throw new RangeError(`correlation (${i}, ${i}) must be 1`);
      if (Math.abs(r - correlation[j][i]) > 1e-12)
        throw new RangeError(`the correlation matrix must be symmetric: (${i}, ${j}) ≠ (${j}, ${i})`);
    }
  }
}

/**
 * Lower-triangular L with L·Lᵀ = A for a positive semi-definite A (a correlation of ±1 gives a zero
 * pivot, which is allowed); throws when A is not positive semi-definite.
 */
function cholesky(a: readonly (readonly number[])[]): Float64Array[] {
  const m = a.length;
  const tol = 1e-10;
  const l = Array.from({ length: m }, () => new Float64Array(m));
  for (let j = 0; j < m; j++) {
    let d = a[j][j];
    for (let k = 0; k < j; k++) d -= l[j][k] * l[j][k];
    if (d < -tol) throw new RangeError('the correlation matrix is not positive semi-definite');
    const pivot = d > tol ? Math.sqrt(d) : 0;
    l[j][j] = pivot;
    for (let i = j + 1; i < m; i++) {
      let s = a[i][j];
      for (let k = 0; k < j; k++) s -= l[i][k] * l[j][k];
      if (pivot === 0) {
        if (Math.abs(s) > 1e-8) throw new RangeError('the correlation matrix is not positive semi-definite');
        l[i][j] = 0;
      } else {
        l[i][j] = s / pivot;
      }
    }
  }
  return l;
}

// ∂f/∂x_i by a central difference, falling back to a second-order one-sided difference where one side
// is outside the model's domain. The step is 10⁻³·u_i, but never below √ε·|x_i| (below that rounding in
// x_i + h spoils the difference, e.g. for a constant known to 10⁻¹⁰) nor above u_i.
function sensitivity(
  model: (x: readonly number[]) => number,
  values: readonly number[],
  i: number,
  u: number,
  y: number,
): number {
  const x = values[i];
  let step = Math.min(u, Math.max(1e-3 * u, Math.sqrt(EPS) * Math.abs(x)));
  // A u below the spacing of doubles near x would give a zero step.
  if (x + step === x || x - step === x) step = Math.sqrt(EPS) * Math.abs(x);
  const hp = x + step - x;
  const hm = x - (x - step);
  const fp = tryModel(model, withShift(values, i, hp));
  const fm = tryModel(model, withShift(values, i, -hm));
  if (fp !== undefined && fm !== undefined) return (fp - fm) / (hp + hm);
  if (fp === undefined && fm === undefined) {
    throw new UncertaintyDomainError(
      i,
      `input ${i}: the model cannot be evaluated on either side of the estimate ${x} (step ${step}); it is at the boundary of the model's domain`,
    );
  }
  const dir = fp !== undefined ? 1 : -1;
  const h = fp !== undefined ? hp : hm;
  const f1 = (fp ?? fm) as number;
  const f2 = tryModel(model, withShift(values, i, 2 * dir * h));
  if (f2 === undefined) return (dir * (f1 - y)) / h;
  return (dir * (-3 * y + 4 * f1 - f2)) / (2 * h);
}

/** Combined standard uncertainty and budget by the GUM's law of propagation (JCGM 100:2008, 5.1 and 5.2). */
export function firstOrder(
  model: (x: readonly number[]) => number,
  inputs: readonly UncertainInput[],
  options?: { correlation?: readonly (readonly number[])[] },
): FirstOrder {
  checkInputs(inputs);
  const n = inputs.length;
  const correlation = options?.correlation;
  if (correlation) checkCorrelation(correlation, n);
  const values = inputs.map((input) => input.value);
  let y: number;
  try {
    y = model(values);
  } catch (cause) {
    throw new Error(
      `the model cannot be evaluated at the input estimates: ${cause instanceof Error ? cause.message : String(cause)}`,
      { cause },
    );
  }
  if (!Number.isFinite(y)) throw new Error(`the model gives ${y} at the input estimates`);

  const active: number[] = [];
  for (let i = 0; i < n; i++) if (inputs[i].u > 0) active.push(i);
  const sensitivities = new Array<number>(n).fill(Number.NaN);
  const contributions = new Array<number>(n).fill(0);
  for (const i of active) {
    sensitivities[i] = sensitivity(model, values, i, inputs[i].u, y);
    contributions[i] = sensitivities[i] * inputs[i].u;
  }

  let variance = 0;
  for (const i of active) variance += contributions[i] * contributions[i];
  if (correlation) {
    const sub = active.map((i) => active.map((j) => correlation[i][j]));
    cholesky(sub);
    for (let a = 0; a < active.length; a++) {
      for (let b = a + 1; b < active.length; b++) {
        const i = active[a];
        const j = active[b];
        variance += 2 * contributions[i] * contributions[j] * correlation[i][j];
      }
    }
  }
  const uc = Math.sqrt(Math.max(0, variance));
  const shares = contributions.map((c) => (uc > 0 ? (c * c) / (uc * uc) : 0));
  const nonLinear =
    active.length > 0 &&
    (uc === 0 || secondOrderExceeds(model, values, inputs, active, contributions, y, NON_LINEAR_THRESHOLD * uc * uc));
  return { y, uc, sensitivities, contributions, shares, nonLinear };
}

// Whether the second-order terms of JCGM 100:2008, 5.1.2 note,
//   Σ_i Σ_j [½(∂²f/∂x_i∂x_j)² + ∂f/∂x_i·∂³f/∂x_i∂x_j²] u²(x_i) u²(x_j),
// exceed `limit`, or the model cannot be evaluated somewhere in x ± 2u. The cross terms matter: in the
// mass calibration of JCGM 101:2008, 9.3, every f_ii vanishes and the whole effect is ∂²f/∂ρa∂ρW.
// The derivatives are divided differences with steps u_i (and 2u_i), so they measure the curvature over
// the region the uncertainty covers, kinks included, not at a point; |·| on the product terms keeps
// a negative one from hiding a positive one. Costs 4 evaluations per input and 4 per pair of inputs,
// and stops as soon as the answer is known.
function secondOrderExceeds(
  model: (x: readonly number[]) => number,
  values: readonly number[],
  inputs: readonly UncertainInput[],
  active: readonly number[],
  contributions: readonly number[],
  y: number,
  limit: number,
): boolean {
  const noise = (d: number, ...fs: number[]) =>
    Math.abs(d) <= 64 * EPS * Math.max(Math.abs(y), ...fs.map(Math.abs)) ? 0 : d;
  const plus = new Map<number, number>();
  const minus = new Map<number, number>();
  let total = 0;
  for (const i of active) {
    const u = inputs[i].u;
    const p1 = tryModel(model, withShift(values, i, u));
    const m1 = tryModel(model, withShift(values, i, -u));
    const p2 = tryModel(model, withShift(values, i, 2 * u));
    const m2 = tryModel(model, withShift(values, i, -2 * u));
    if (p1 === undefined || m1 === undefined || p2 === undefined || m2 === undefined) return true;
    plus.set(i, p1);
    minus.set(i, m1);
    const dii = noise(p1 - 2 * y + m1, p1, m1);
    const tiii = noise((p2 - 2 * p1 + 2 * m1 - m2) / 2, p1, m1, p2, m2);
    total += 0.5 * dii * dii + Math.abs(contributions[i] * tiii);
    if (total > limit) return true;
  }
  for (let a = 0; a < active.length; a++) {
    for (let b = a + 1; b < active.length; b++) {
      const i = active[a];
      const j = active[b];
      const ui = inputs[i].u;
      const uj = inputs[j].u;
      const pp = tryModel(model, withShift(values, i, ui, j, uj));
      const pm = tryModel(model, withShift(values, i, ui, j, -uj));
      const mp = tryModel(model, withShift(values, i, -ui, j, uj));
      const mm = tryModel(model, withShift(values, i, -ui, j, -uj));
      if (pp === undefined || pm === undefined || mp === undefined || mm === undefined) return true;
      const pi = plus.get(i) as number;
      const mi = minus.get(i) as number;
      const pj = plus.get(j) as number;
      const mj = minus.get(j) as number;
      const dij = noise((pp - pm - mp + mm) / 4, pp, pm, mp, mm);
      const tijj = noise((pp - 2 * pi + pm - (mp - 2 * mi + mm)) / 2, pp, pm, mp, mm, pi, mi);
      const tjii = noise((pp - 2 * pj + mp - (pm - 2 * mj + mm)) / 2, pp, pm, mp, mm, pj, mj);
      total += dij * dij + Math.abs(contributions[i] * tijj) + Math.abs(contributions[j] * tjii);
      if (total > limit) return true;
    }
  }
  return false;
}

/** Deterministic generator: xoshiro128** (Blackman and Vigna, 2018) with its state filled by splitmix64 from the seed. */
export function createRandom(seed: number): Random {
  if (!Number.isSafeInteger(seed)) throw new RangeError(`the seed must be an integer of at most 53 bits, not ${seed}`);
  const mask = (1n << 64n) - 1n;
  let sm = BigInt.asUintN(64, BigInt(seed));
  const splitmix64 = () => {
    sm = (sm + 0x9e3779b97f4a7c15n) & mask;
    let z = sm;
    z = ((z ^ (z >> 30n)) * 0xbf58476d1ce4e5b9n) & mask;
    z = ((z ^ (z >> 27n)) * 0x94d049bb133111ebn) & mask;
    return z ^ (z >> 31n);
  };
  const a = splitmix64();
  const b = splitmix64();
  let s0 = Number(a & 0xffffffffn) | 0;
  let s1 = Number(a >> 32n) | 0;
  let s2 = Number(b & 0xffffffffn) | 0;
  let s3 = Number(b >> 32n) | 0;
  if ((s0 | s1 | s2 | s3) === 0) s0 = 1;

  const next = (): number => {
    const x = Math.imul(s1, 5);
    const result = Math.imul((x << 7) | (x >>> 25), 9) >>> 0;
    const t = s1 << 9;
    s2 ^= s0;
    s3 ^= s1;
    s1 ^= s2;
    s0 ^= s3;
    s2 ^= t;
    s3 = (s3 << 11) | (s3 >>> 21);
    return result;
  };
  const uniform = (): number => ((next() >>> 5) * 67108864 + (next() >>> 6)) / 9007199254740992;
  let spare = 0;
  let hasSpare = false;
  const normal = (): number => {
    if (hasSpare) {
      hasSpare = false;
      return spare;
    }
    let v1: number;
    let v2: number;
    let s: number;
    do {
      v1 = 2 * uniform() - 1;
      v2 = 2 * uniform() - 1;
      s = v1 * v1 + v2 * v2;
    } while (s >= 1 || s === 0);
    const m = Math.sqrt((-2 * Math.log(s)) / s);
    spare = v2 * m;
    hasSpare = true;
    return v1 * m;
  };
  return { uniform, normal, nextUint32: next };
}

// erf(x) by Abramowitz and Stegun 7.1.26 (absolute error below 1.5·10⁻⁷), used only to turn a correlated
// normal into a correlated rectangular draw, where that error is far below the Monte Carlo's resolution.
function erf(x: number): number {
  const ax = Math.abs(x);
  const t = 1 / (1 + 0.3275911 * ax);
  const poly = t * (0.254829592 + t * (-0.284496736 + t * (1.421413741 + t * (-1.453152027 + t * 1.061405429))));
  const r = 1 - poly * Math.exp(-ax * ax);
  return x < 0 ? -r : r;
}

// Correlation of the underlying normals that gives the requested correlation r between the inputs
// themselves (a Gaussian copula, "NORTA"): normal–normal r; rectangular–rectangular 2 sin(πr/6), since two
// uniforms made from normals of correlation ρ have correlation (6/π) arcsin(ρ/2); normal–rectangular
// r·√(π/3), since corr(Z₁, Φ(Z₂)) = ρ·√(3/π).
function latentCorrelation(r: number, a: Distribution, b: Distribution, i: number, j: number): number {
  if (r === 0 || i === j) return i === j ? 1 : 0;
  if (a === 'normal' && b === 'normal') return r;
  if (a === 'rectangular' && b === 'rectangular') return 2 * Math.sin((Math.PI * r) / 6);
  const rho = r * Math.sqrt(Math.PI / 3);
  if (Math.abs(rho) > 1 + 1e-12) {
    throw new RangeError(
      `inputs ${i} and ${j}: a normal and a rectangular input cannot have a correlation beyond ±${Math.sqrt(3 / Math.PI).toFixed(4)}`,
    );
  }
  return Math.max(-1, Math.min(1, rho));
}

// Probabilistically symmetric interval of JCGM 101:2008, 7.7.2, from `m` sorted values starting at `start`.
function symmetricInterval(sorted: Float64Array, start: number, m: number, p: number): [number, number] {
  if (m === 0) return [Number.NaN, Number.NaN];
  const pm = p * m;
  const q = Math.abs(pm - Math.round(pm)) < 1e-9 * m ? Math.round(pm) : Math.floor(pm + 0.5);
  const r = (m - q) % 2 === 0 ? (m - q) / 2 : (m - q + 1) / 2;
  const lo = Math.min(m - 1, Math.max(0, r - 1));
  const hi = Math.min(m - 1, Math.max(0, r + q - 1));
  return [sorted[start + lo], sorted[start + hi]];
}

function meanAndSd(a: Float64Array, start: number, m: number): [number, number] {
  if (m === 0) return [Number.NaN, Number.NaN];
  let s = 0;
  for (let k = start; k < start + m; k++) s += a[k];
  const mean = s / m;
  if (m < 2) return [mean, Number.NaN];
  let ss = 0;
  for (let k = start; k < start + m; k++) {
    const d = a[k] - mean;
    ss += d * d;
  }
  return [mean, Math.sqrt(ss / (m - 1))];
}

// Standard error of the mean of block estimates (JCGM 101:2008, 7.9.4): their standard deviation / √h.
function blockSe(estimates: readonly number[]): number {
  const h = estimates.length;
  if (h < 2) return Number.NaN;
  const mean = estimates.reduce((s, v) => s + v, 0) / h;
  const ss = estimates.reduce((s, v) => s + (v - mean) * (v - mean), 0);
  return Math.sqrt(ss / (h * (h - 1)));
}

// Merges the sorted runs a[bounds[k]..bounds[k+1]) into one sorted array, pairwise (O(M log h)).
function mergeRuns(a: Float64Array, bounds: number[]): Float64Array {
  let src = a.slice();
  let dst = new Float64Array(a.length);
  let runs = bounds.slice();
  while (runs.length > 2) {
    const nextRuns = [0];
    for (let k = 0; k + 1 < runs.length; k += 2) {
      const lo = runs[k];
      const mid = runs[k + 1];
      const hi = k + 2 < runs.length ? runs[k + 2] : mid;
      let i = lo;
      let j = mid;
      let o = lo;
      while (i < mid && j < hi) dst[o++] = src[i] <= src[j] ? src[i++] : src[j++];
      while (i < mid) dst[o++] = src[i++];
      while (j < hi) dst[o++] = src[j++];
      nextRuns.push(hi);
    }
    [src, dst] = [dst, src];
    runs = nextRuns;
  }
  return src;
}

/** Propagation of distributions (JCGM 101:2008, 7), one model call per trial; the array passed to the model is reused, so copy it to keep it. */
export function monteCarlo(
  model: (x: readonly number[]) => number,
  inputs: readonly UncertainInput[],
  options: MonteCarloOptions,
): MonteCarloResult {
  checkInputs(inputs);
  const n = inputs.length;
  const trials = options.trials;
  const blocks = options.blocks ?? 10;
  const coverage = options.coverage ?? 0.9545;
  if (!Number.isSafeInteger(trials) || trials < 1) throw new RangeError('trials must be a positive integer');
  if (!Number.isSafeInteger(blocks) || blocks < 1 || blocks > trials)
    throw new RangeError('blocks must be an integer from 1 to trials');
  if (!(coverage > 0 && coverage < 1)) throw new RangeError('coverage must lie strictly between 0 and 1');
  const correlation = options.correlation;
  if (correlation) checkCorrelation(correlation, n);
  const rng = createRandom(options.seed);

  const active: number[] = [];
  for (let i = 0; i < n; i++) if (inputs[i].u > 0) active.push(i);
  const m = active.length;
  const value = Float64Array.from(active, (i) => inputs[i].value);
  const u = Float64Array.from(active, (i) => inputs[i].u);
  const halfWidth = Float64Array.from(active, (i) => inputs[i].u * SQRT3);
  const rectangular = active.map((i) => inputs[i].distribution === 'rectangular');
  const correlated = !!correlation && active.some((i) => active.some((j) => i !== j && correlation[i][j] !== 0));
  let factor: Float64Array[] = [];
  if (correlated && correlation) {
    const dist = (i: number): Distribution => inputs[i].distribution ?? 'normal';
    factor = cholesky(
      active.map((i) => active.map((j) => latentCorrelation(correlation[i][j], dist(i), dist(j), i, j))),
    );
  }
  const z = new Float64Array(m);

  const x = inputs.map((input) => input.value);
  const ys = new Float64Array(trials);
  const blockEnds: number[] = [];
  let valid = 0;
  let outOfDomain = 0;
  let nextBoundary = Math.floor(trials / blocks);
  for (let t = 0; t < trials; t++) {
    if (correlated) {
      for (let k = 0; k < m; k++) z[k] = rng.normal();
      for (let k = m - 1; k >= 0; k--) {
        const row = factor[k];
        let w = 0;
        for (let l = 0; l <= k; l++) w += row[l] * z[l];
        x[active[k]] = rectangular[k] ? value[k] + halfWidth[k] * erf(w / Math.SQRT2) : value[k] + u[k] * w;
      }
    } else {
      for (let k = 0; k < m; k++) {
        x[active[k]] = rectangular[k]
          ? value[k] + halfWidth[k] * (2 * rng.uniform() - 1)
          : value[k] + u[k] * rng.normal();
      }
    }
    let v: number;
    try {
      v = model(x);
    } catch {
      v = Number.NaN;
    }
    if (typeof v === 'number' && Number.isFinite(v)) ys[valid++] = v;
    else outOfDomain++;
    if (t + 1 === nextBoundary) {
      blockEnds.push(valid);
      nextBoundary = Math.floor(((blockEnds.length + 1) * trials) / blocks);
    }
  }

  const bounds = [0, ...blockEnds];
  const means: number[] = [];
  const sds: number[] = [];
  const lows: number[] = [];
  const highs: number[] = [];
  for (let k = 0; k < blocks; k++) {
    const start = bounds[k];
    const count = bounds[k + 1] - start;
    ys.subarray(start, start + count).sort();
    if (count < 2) continue;
    const [bm, bs] = meanAndSd(ys, start, count);
    const [bl, bh] = symmetricInterval(ys, start, count, coverage);
    means.push(bm);
    sds.push(bs);
    lows.push(bl);
    highs.push(bh);
  }
  const all = ys.subarray(0, valid);
  const [mean, sd] = meanAndSd(all, 0, valid);
  const sorted = mergeRuns(all, bounds);
  const [low, high] = symmetricInterval(sorted, 0, valid, coverage);
  return {
    trials,
    valid,
    outOfDomain,
    mean,
    u: sd,
    low,
    high,
    meanSe: blockSe(means),
    uSe: blockSe(sds),
    lowSe: blockSe(lows),
    highSe: blockSe(highs),
  };
}

// ½·10^l, where 10^l is the place of the last of `digits` significant digits of x (JCGM 101:2008, 8.2).
function halfUnitInLastDigit(x: number, digits: number): number {
  if (!(x > 0) || !Number.isFinite(x)) return 0;
  const l = Number(x.toExponential(digits - 1).split('e')[1]) - (digits - 1);
  return l < 0 ? 0.5 / 10 ** -l : 0.5 * 10 ** l;
}

/** JCGM 101:2008 §8.2 validation of the GUM interval y ± U against the MC interval, ndig = 2; tolerance widened to 2× the MC's own standard error of the end points when that is larger. */
export function validateAgainstMonteCarlo(
  y: number,
  U: number,
  uc: number,
  mc: MonteCarloResult,
): { tolerance: number; dLow: number; dHigh: number; agrees: boolean } {
  const delta = halfUnitInLastDigit(uc, 2);
  const se = Math.max(Number.isFinite(mc.lowSe) ? mc.lowSe : 0, Number.isFinite(mc.highSe) ? mc.highSe : 0);
  const tolerance = Math.max(delta, 2 * se);
  const dLow = Math.abs(y - U - mc.low);
  const dHigh = Math.abs(y + U - mc.high);
  return { tolerance, dLow, dHigh, agrees: dLow <= tolerance && dHigh <= tolerance };
}

/** Expanded uncertainty rounded to two significant digits (JCGM 100 7.2.6), and the decimal exponent of its last digit so y can be rounded to the same place. */
export function roundExpanded(U: number): { U: number; lastDigitExponent: number } {
  if (!Number.isFinite(U) || U < 0)
    throw new RangeError(`an expanded uncertainty must be a finite number ≥ 0, not ${U}`);
  // Zero has no last digit: nothing to round y to.
  if (U === 0) return { U: 0, lastDigitExponent: Number.NEGATIVE_INFINITY };
  // toExponential rounds the double's exact decimal value, a tie upwards, and carries (0.0996 → "1.0e-1").
  const text = U.toExponential(1);
  return { U: Number(text), lastDigitExponent: Number(text.split('e')[1]) - 1 };
}
