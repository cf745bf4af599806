// 50-digit reference implementations of the relativistic library (decimal.js), the error measure in
// ulp, and the accuracy survey over log-spaced grids that the tests assert on and the benchmark prints.
//
// Each reference evaluates the TEXTBOOK formula (not the kernel's rearrangement) at 50 significant
// digits, on the same double inputs as the kernel, converted to decimal exactly: `exact(x)` expands
// the binary value of a double digit by digit. (`new Decimal(x)` is NOT exact: it goes through the
// shortest decimal string, so new Decimal(0.1) is 0.1, not 0.1000000000000000055511151231257827…;
// near c that difference is amplified by γ² and would swamp the comparison.)
//
// The worst cancellation in these formulas (γ − 1 at β = 1e-12, √(1 + w²) − 1 at w = 1e-12) leaves
// about 25 of the 50 digits, far more than the 17 the comparison needs.
import Decimal from 'decimal.js';
import { LIBRARY } from '../../lib/calc/functions';

export const D = Decimal.clone({ precision: 50, rounding: Decimal.ROUND_HALF_EVEN, toExpNeg: -400, toExpPos: 400 });
export type Dec = InstanceType<typeof D>;

/** The exact decimal value of a double. */
export function exact(x: number): Dec {
  if (!Number.isFinite(x)) throw new Error(`exact: not a finite double: ${x}`);
  if (x === 0) return new D(0);
  const view = new DataView(new ArrayBuffer(8));
  view.setFloat64(0, x);
  const bits = view.getBigUint64(0);
  const negative = bits >> 63n === 1n;
  const biased = Number((bits >> 52n) & 0x7ffn);
  let mantissa = bits & ((1n << 52n) - 1n);
  let exponent: number;
  if (biased === 0) {
    exponent = -1074;
  } else {
    mantissa |= 1n << 52n;
    exponent = biased - 1075;
  }
  // x = mantissa · 2^exponent = mantissa · 5^−exponent · 10^exponent when exponent < 0.
  const text =
    exponent >= 0
      ? (mantissa << BigInt(exponent)).toString()
      : `${(mantissa * 5n ** BigInt(-exponent)).toString()}e${exponent}`;
  return new D(negative ? `-${text}` : text);
}

// Constants at their defined or recommended decimal values.
export const REF_C = new D('299792458'); // SI Brochure, 9th ed. (2019): c exact
export const REF_E = new D('1.602176634e-19'); // SI Brochure, 9th ed. (2019): e exact
export const REF_H = new D('6.62607015e-34'); // SI Brochure, 9th ed. (2019): h exact
export const REF_ME = new D('9.1093837139e-31'); // CODATA 2022: electron mass, kg
export const REF_EPSILON_0 = new D('8.8541878188e-12'); // CODATA 2022: vacuum electric permittivity, F/m
const C2 = REF_C.mul(REF_C);
const ONE = new D(1);
const TWO = new D(2);

function gammaOf(beta: Dec): Dec {
  return ONE.div(ONE.minus(beta.mul(beta)).sqrt());
}

function betaFromKinetic(T: Dec, m: Dec): Dec {
  const gamma = ONE.plus(T.div(m.mul(C2)));
  return ONE.minus(ONE.div(gamma.mul(gamma))).sqrt();
}

type Ref = (...args: number[]) => Dec | [Dec, Dec];

/** Textbook formulas, 50 digits, exact inputs. */
export const REFERENCES: Record<string, Ref> = {
  lorentzFactor: (v) => gammaOf(exact(v)),
  gammaMinusOne: (v) => gammaOf(exact(v)).minus(1),
  rapidity: (v) => D.atanh(exact(v)),
  addVelocities: (u, v) => {
    const [a, b] = [exact(u), exact(v)];
    return a.plus(b).div(ONE.plus(a.mul(b)));
  },
  timeDilation: (dtau, v) => exact(dtau).mul(gammaOf(exact(v))),
  lengthContraction: (L0, v) => exact(L0).div(gammaOf(exact(v))),
  kineticEnergy: (m, v) => gammaOf(exact(v)).minus(1).mul(exact(m)).mul(C2),
  speedFromKinetic: (T, m) => betaFromKinetic(exact(T), exact(m)),
  momentumFromKinetic: (T, m) => {
    const rest = exact(m).mul(C2);
    const E = exact(T).plus(rest);
    return E.mul(E).minus(rest.mul(rest)).sqrt().div(REF_C);
  },
  magneticRigidity: (p, q) => exact(p).div(exact(q)),
  decayLength: (p, m, tau) => exact(p).mul(exact(tau)).div(exact(m)),
  electronWavelength: (U) => {
    const eU = REF_E.mul(exact(U));
    return REF_H.div(
      TWO.mul(REF_ME)
        .mul(eU)
        .mul(ONE.plus(eU.div(TWO.mul(REF_ME).mul(C2))))
        .sqrt(),
    );
  },
  dopplerFactor: (v) => {
    const b = exact(v);
    return ONE.plus(b).div(ONE.minus(b)).sqrt();
  },
  properToCoordinateAcceleration: (a0, v) => exact(a0).div(gammaOf(exact(v)).pow(3)),
  hyperbolicSpeed: (a0, t) => {
    const w = exact(a0).mul(exact(t)).div(REF_C);
    return w.div(ONE.plus(w.mul(w)).sqrt());
  },
  hyperbolicDistance: (a0, t) => {
    const a = exact(a0);
    const w = a.mul(exact(t)).div(REF_C);
    return C2.div(a).mul(ONE.plus(w.mul(w)).sqrt().minus(1));
  },
  hyperbolicProperTime: (a0, t) => {
    const a = exact(a0);
    return REF_C.div(a).mul(D.asinh(a.mul(exact(t)).div(REF_C)));
  },
  rocketDeltaV: (ve, R) => D.tanh(exact(ve).mul(D.ln(exact(R)))),
  clockRateOffset: (v) => ONE.div(gammaOf(exact(v))).minus(1),
  invariantMass: (E, p) => {
    const e = exact(E);
    const pc = exact(p).mul(REF_C);
    return e.mul(e).minus(pc.mul(pc)).sqrt().div(C2);
  },
  sqrtSFixedTarget: (T, mBeam, mTarget) => {
    const Ma = exact(mBeam).mul(C2);
    const Mb = exact(mTarget).mul(C2);
    const Ea = exact(T).plus(Ma);
    return Ma.mul(Ma).plus(Mb.mul(Mb)).plus(TWO.mul(Ea).mul(Mb)).sqrt();
  },
  sqrtSCollider: (E1, E2, m1, m2) => {
    const [e1, e2] = [exact(E1), exact(E2)];
    const [M1, M2] = [exact(m1).mul(C2), exact(m2).mul(C2)];
    const p1c = e1.mul(e1).minus(M1.mul(M1)).sqrt();
    const p2c = e2.mul(e2).minus(M2.mul(M2)).sqrt();
    const total = e1.plus(e2);
    const net = p1c.minus(p2c);
    return total.mul(total).minus(net.mul(net)).sqrt();
  },
  thresholdKinetic: (mBeam, mTarget, mProducts) => {
    const sumInitial = exact(mBeam).plus(exact(mTarget));
    const mf = exact(mProducts);
    const T = mf
      .mul(mf)
      .minus(sumInitial.mul(sumInitial))
      .mul(C2)
      .div(TWO.mul(exact(mTarget)));
    return T.isNegative() ? new D(0) : T;
  },
  timeOfFlight: (L, T, m) => exact(L).div(betaFromKinetic(exact(T), exact(m)).mul(REF_C)),
  transverseCoordinateAcceleration: (a0, v) => exact(a0).div(gammaOf(exact(v)).pow(2)),
  aberrationAngle: (theta, v) => {
    // Independent of the kernel's half-angle form: sin θ′ = sin θ/(γ(1 − β cos θ)) and
    // cos θ′ = (cos θ − β)/(1 − β cos θ), whose common positive factor atan2 ignores.
    const [th, b] = [exact(theta), exact(v)];
    return D.atan2(D.sin(th).div(gammaOf(b)), D.cos(th).minus(b));
  },
  lorentzBoost: (t, x, v) => {
    const [tt, xx, b] = [exact(t), exact(x), exact(v)];
    const g = gammaOf(b);
    return [g.mul(tt.minus(b.mul(xx).div(REF_C))), g.mul(xx.minus(b.mul(REF_C).mul(tt)))];
  },
  rindlerHorizonDistance: (a0) => C2.div(exact(a0)),
  synchrotronLossPerTurn: (E, rho, m) => {
    const gamma = exact(E).div(exact(m).mul(C2));
    const beta = ONE.minus(ONE.div(gamma.mul(gamma))).sqrt();
    return REF_E.mul(REF_E)
      .mul(beta.pow(3))
      .mul(gamma.pow(4))
      .div(new D(3).mul(REF_EPSILON_0).mul(exact(rho)));
  },
  betaGamma: (v) => {
    const b = exact(v);
    return b.mul(gammaOf(b));
  },
  gammaFromKinetic: (T, m) => ONE.plus(exact(T).div(exact(m).mul(C2))),
  betaGammaFromMomentum: (p, m) => exact(p).div(exact(m).mul(REF_C)),
  speedFromMomentum: (p, m) => speedFromMomentumRef(exact(p), exact(m)),
  kineticFromMomentum: (p, m) => kineticFromMomentumRef(exact(p), exact(m)),
  kineticFromRigidity: (Brho, m, q) => kineticFromMomentumRef(exact(Brho).mul(exact(q)).abs(), exact(m)),
  // Ion beams: the ion's mass (AME convention, Lunney et al. 2003 eq. A4 for the fully stripped ion) and
  // the kinematics of T = A·Tn (per nucleon), textbook forms.
  ionMass: (M, Z, q) => {
    const n = exact(q).div(REF_E).round();
    const stripped = exact(M).minus(n.mul(REF_ME));
    if (!n.eq(Z)) return stripped;
    const eV = new D('14.4381').mul(new D(Z).pow('2.39')).plus(new D('1.55468e-6').mul(new D(Z).pow('5.35')));
    return stripped.plus(eV.mul(REF_E).div(C2));
  },
  gammaFromKineticPerNucleon: (Tn, A, m) => ONE.plus(exact(Tn).mul(A).div(exact(m).mul(C2))),
  speedFromKineticPerNucleon: (Tn, A, m) => betaFromKinetic(exact(Tn).mul(A), exact(m)),
  momentumFromKineticPerNucleon: (Tn, A, m) => momentumFromKineticRef(exact(Tn).mul(A), exact(m)),
  rigidityFromKineticPerNucleon: (Tn, A, m, q) => momentumFromKineticRef(exact(Tn).mul(A), exact(m)).div(exact(q)),
  kineticPerNucleonFromRigidity: (Brho, A, m, q) =>
    kineticFromMomentumRef(exact(Brho).mul(exact(q)).abs(), exact(m)).div(A),
  kineticPerNucleonFromMomentum: (p, A, m) => kineticFromMomentumRef(exact(p), exact(m)).div(A),
  // Satellite timing and spaceflight. GM_E (IERS 2010) is an integer, exact as a double; L_G (IAU 2000
  // B1.9) and ω_E (IS-GPS-200) are taken as their decimal values.
  gravitationalRateOffset: (GM, r, ref) =>
    exact(GM)
      .div(C2)
      .mul(ONE.div(exact(ref)).minus(ONE.div(exact(r)))),
  orbitClockRateOffset: (a) => {
    const x = new D('3.986004418e14').div(exact(a).mul(C2));
    return new D('6.969290134e-10').minus(x).plus(ONE.minus(x).sqrt().minus(1));
  },
  eccentricityClockCorrection: (a, e, E) =>
    new D('3.986004418e14')
      .sqrt()
      .mul(-2)
      .div(C2)
      .mul(exact(e))
      .mul(exact(a).sqrt())
      .mul(D.sin(exact(E))),
  sagnacDelay: (A) => new D('7.2921151467e-5').mul(2).mul(exact(A)).div(C2),
  shapiroDelay: (GM, r1, r2, r12) => {
    const s = exact(r1).plus(exact(r2));
    return exact(GM)
      .mul(2)
      .div(C2.mul(REF_C))
      .mul(D.ln(s.plus(exact(r12)).div(s.minus(exact(r12)))));
  },
  massRatio: (dv, ve) => D.exp(D.atanh(exact(dv)).div(exact(ve))),
  relativisticVoltage: (U) => exact(U).mul(ONE.plus(REF_E.mul(exact(U)).div(TWO.mul(REF_ME).mul(C2)))),
  interactionConstant: (U) => {
    const T = REF_E.mul(exact(U));
    const rest = REF_ME.mul(C2);
    const pc = T.mul(T.plus(TWO.mul(rest))).sqrt();
    return TWO.mul(D.acos(-1)).mul(REF_E).mul(rest.plus(T)).div(REF_H.mul(REF_C).mul(pc));
  },
  wavelengthFromKinetic: (T, m) =>
    REF_H.mul(REF_C).div(
      exact(T)
        .mul(exact(T).plus(TWO.mul(exact(m)).mul(C2)))
        .sqrt(),
    ),
  wavelengthFromMomentum: (p) => REF_H.div(exact(p)),
  synchrotronCriticalEnergy: (E, rho, m) => {
    const gamma = exact(E).div(exact(m).mul(C2));
    return new D(3)
      .mul(REF_H)
      .mul(REF_C)
      .div(new D(4).mul(D.acos(-1)))
      .mul(gamma.pow(3))
      .div(exact(rho));
  },
  revolutionFrequency: (v, L) => exact(v).abs().mul(REF_C).div(exact(L)),
  cyclotronFrequency: (q, B, m, T) =>
    exact(q)
      .abs()
      .mul(exact(B).abs())
      .mul(C2)
      .div(TWO.mul(D.acos(-1)).mul(exact(m).mul(C2).plus(exact(T)))),
  momentumSpreadFromEnergySpread: (x, v) => exact(x).div(exact(v).pow(2)),
  energySpreadFromMomentumSpread: (x, v) => exact(x).mul(exact(v).pow(2)),
  twoBodyDecayMomentum: (M, m1, m2) => {
    const [a, b, c] = [exact(M), exact(m1), exact(m2)];
    return a
      .mul(a)
      .minus(b.plus(c).pow(2))
      .mul(a.mul(a).minus(b.minus(c).pow(2)))
      .sqrt()
      .mul(REF_C)
      .div(TWO.mul(a));
  },
  // Constant proper acceleration by distance (Rindler 2006, ch. 3): γ = 1 + |a|d/c², textbook forms.
  hyperbolicSpeedFromDistance: (a0, d) => fromDistanceRef(a0, d).beta,
  hyperbolicCoordinateTimeFromDistance: (a0, d) => fromDistanceRef(a0, d).t,
  hyperbolicProperTimeFromDistance: (a0, d) => fromDistanceRef(a0, d).tau,
  hyperbolicTripCoordinateTime: (a0, d) => fromDistanceRef(a0, exact(d).div(2)).t.mul(2),
  hyperbolicTripProperTime: (a0, d) => fromDistanceRef(a0, exact(d).div(2)).tau.mul(2),
  hyperbolicTripPeakSpeed: (a0, d) => fromDistanceRef(a0, exact(d).div(2)).beta,
  // Constant proper acceleration by proper time (Rindler 2006, ch. 3): u = a0τ/c, textbook forms.
  hyperbolicSpeedAtProperTime: (a0, tau) => D.tanh(exact(a0).mul(exact(tau)).div(REF_C)),
  hyperbolicCoordinateTimeAtProperTime: (a0, tau) => {
    const a = exact(a0);
    return a.isZero() ? exact(tau) : REF_C.div(a).mul(D.sinh(a.mul(exact(tau)).div(REF_C)));
  },
  hyperbolicDistanceAtProperTime: (a0, tau) => {
    const a = exact(a0);
    return a.isZero() ? new D(0) : C2.div(a).mul(D.cosh(a.mul(exact(tau)).div(REF_C)).minus(1));
  },
  // Rings (S. Y. Lee, Accelerator Physics, ch. 3): η = α_c − 1/γ², γ_t = 1/√α_c.
  slipFactor: (alpha, gamma) => exact(alpha).minus(ONE.div(exact(gamma).pow(2))),
  transitionGamma: (alpha) => ONE.div(exact(alpha).sqrt()),
};

/**
 * Hyperbolic motion from rest over the distance d (a Dec, or a double taken exactly), textbook forms at
 * 50 digits: γ = 1 + |a|d/c², β = ±√(1 − 1/γ²) (the sign of a), t = (c/|a|)√(γ² − 1), τ = (c/|a|) acosh γ.
 */
function fromDistanceRef(a0: number, d: number | Dec): { beta: Dec; t: Dec; tau: Dec } {
  const a = exact(a0).abs();
  const dist = typeof d === 'number' ? exact(d) : d;
  const gamma = ONE.plus(a.mul(dist).div(C2));
  const beta = ONE.minus(ONE.div(gamma.mul(gamma))).sqrt();
  return {
    beta: a0 < 0 ? beta.neg() : beta,
    t: REF_C.div(a).mul(gamma.mul(gamma).minus(1).sqrt()),
    tau: REF_C.div(a).mul(D.acosh(gamma)),
  };
}

/** p = √(E² − m²c⁴)/c, E = T + mc² (PDG RPP 2024, "Kinematics"), 50 digits. */
function momentumFromKineticRef(T: Dec, m: Dec): Dec {
  const rest = m.mul(C2);
  const E = T.plus(rest);
  return E.mul(E).minus(rest.mul(rest)).sqrt().div(REF_C);
}

/** β = pc/E, E = √(p²c² + m²c⁴) (PDG RPP 2024, "Kinematics"), 50 digits. */
export function speedFromMomentumRef(p: Dec, m: Dec): Dec {
  const pc = p.mul(REF_C);
  const rest = m.mul(C2);
  return pc.div(pc.mul(pc).plus(rest.mul(rest)).sqrt());
}

/** T = E − mc², E = √(p²c² + m²c⁴) (PDG RPP 2024, "Kinematics"), 50 digits (the textbook subtraction). */
function kineticFromMomentumRef(p: Dec, m: Dec): Dec {
  const pc = p.mul(REF_C);
  const rest = m.mul(C2);
  return pc.mul(pc).plus(rest.mul(rest)).sqrt().minus(rest);
}

/** One unit in the last place of a double in the binade of the (exact) reference value. */
export function ulpOf(ref: Dec): Dec {
  const magnitude = ref.abs();
  if (magnitude.isZero()) return exact(2 ** -1074);
  let k = Math.floor(Math.log2(magnitude.toNumber()));
  if (exact(2 ** k).gt(magnitude)) k -= 1;
  else if (exact(2 ** (k + 1)).lte(magnitude)) k += 1;
  return exact(2 ** (Math.max(k, -1022) - 52));
}

/** |result − ref| in ulp of the reference. */
export function ulpError(result: number, ref: Dec): number {
  if (!Number.isFinite(result)) return Infinity;
  return exact(result).minus(ref).abs().div(ulpOf(ref)).toNumber();
}

/** Worst ulp error of a kernel result (a number or a pair) against its reference. */
export function errorOf(result: number | [number, number], ref: Dec | [Dec, Dec]): number {
  if (Array.isArray(result) && Array.isArray(ref))
    return Math.max(ulpError(result[0], ref[0]), ulpError(result[1], ref[1]));
  if (!Array.isArray(result) && !Array.isArray(ref)) return ulpError(result, ref);
  throw new Error('errorOf: result and reference differ in shape');
}

// ---------------------------------------------------------------------------------------------
// Sample grids. Deterministic: a fixed-seed generator, so every run measures the same points.

function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** n points log-spaced from 10^lo to 10^hi. */
export function logSpace(lo: number, hi: number, n: number): number[] {
  return Array.from({ length: n }, (_, i) => 10 ** (lo + ((hi - lo) * i) / (n - 1)));
}

const M_E_KG = 9.1093837139e-31; // CODATA 2022: electron mass
const M_P_KG = 1.67262192595e-27; // CODATA 2022: proton mass
const M_MU_KG = 1.883531627e-28; // CODATA 2022: muon mass
const C_NUM = 299_792_458;

/**
 * Positive speeds from 1e-12 to 1 − 1e-15: log-spaced β below 0.5, β = 1 − 10^-k above, random
 * log-uniform points of both kinds between the grid lines, and the largest doubles below 1.
 */
export function betaGrid(perSide = 120, random = 60, seed = 1): number[] {
  const rand = mulberry32(seed);
  const low = logSpace(-12, Math.log10(0.5), perSide);
  const high = logSpace(Math.log10(0.5), -15, perSide).map((d) => 1 - d);
  const lowRandom = Array.from({ length: random }, () => 10 ** (-12 + rand() * (12 + Math.log10(0.5))));
  const highRandom = Array.from(
    { length: random },
    () => 1 - 10 ** (Math.log10(0.5) - rand() * (15 + Math.log10(0.5))),
  );
  const edge = [1 - 2 ** -53, 1 - 2 ** -52, 1 - 3 * 2 ** -53, 1 - 1e-15, 0.6, 0.8, 0.5];
  return [...low, ...high, ...lowRandom, ...highRandom, ...edge];
}

function withNegatives(xs: number[]): number[] {
  return [...xs, ...xs.map((x) => -x)];
}

/** The argument lists each function is surveyed on. */
export function surveyCases(): Record<string, number[][]> {
  const rand = mulberry32(20260101);
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rand() * xs.length)];
  const betas = betaGrid();
  const signedBetas = withNegatives(betas);
  const masses = [M_E_KG, M_P_KG, M_MU_KG, 1, 3.7e-26];
  const scales = [1, 0.37, 2.1969811e-6, 7.3e3, 1e-9, 6.02e23];
  const accelerations = [9.80665, 1e3, 1e-3, 3.3e12, 1.7e20];
  const cases: Record<string, number[][]> = {};

  for (const name of ['lorentzFactor', 'gammaMinusOne', 'rapidity', 'dopplerFactor', 'clockRateOffset', 'betaGamma']) {
    cases[name] = signedBetas.map((b) => [b]);
  }
  cases.timeDilation = signedBetas.map((b) => [pick(scales), b]);
  cases.lengthContraction = signedBetas.map((b) => [pick(scales), b]);
  cases.kineticEnergy = signedBetas.map((b) => [pick(masses), b]);
  cases.properToCoordinateAcceleration = signedBetas.map((b) => [pick(accelerations) * (rand() < 0.5 ? -1 : 1), b]);
  cases.transverseCoordinateAcceleration = signedBetas.map((b) => [pick(accelerations) * (rand() < 0.5 ? -1 : 1), b]);

  // Composition: each speed against a random partner of either sign, both from the grid.
  cases.addVelocities = signedBetas.map((u) => [u, pick(signedBetas)]);

  // Energy-based: x = T/(mc²) from 1e-24 (β ≈ 1.4e-12) to 1e12.
  const ratios = [...logSpace(-24, 12, 240), ...Array.from({ length: 80 }, () => 10 ** (-24 + 36 * rand()))];
  const kinetic = ratios.map((x) => {
    const m = pick(masses);
    return [x * m * C_NUM * C_NUM, m];
  });
  cases.speedFromKinetic = kinetic;
  cases.momentumFromKinetic = kinetic;
  cases.timeOfFlight = kinetic.map(([T, m]) => [pick(scales), T, m]);

  cases.gammaFromKinetic = kinetic.filter(([, m]) => m > 0);
  // Momentum-based: y = βγ = p/(mc) from 1e-12 to 1e12, and massless particles.
  const momenta = [...logSpace(-12, 12, 240), ...Array.from({ length: 80 }, () => 10 ** (-12 + 24 * rand()))].map(
    (y) => {
      const m = pick(masses);
      return [y * m * C_NUM, m];
    },
  );
  cases.betaGammaFromMomentum = momenta;
  cases.speedFromMomentum = momenta;
  cases.kineticFromMomentum = [...momenta, [1e-18, 0], [3.3e-22, 0]];
  cases.kineticFromRigidity = momenta.map(([p, m]) => {
    const z = pick([1, 2, 6, 92, -1, 79]);
    return [p / (z * 1.602176634e-19), m, z * 1.602176634e-19];
  });
  cases.magneticRigidity = logSpace(-30, -10, 60).map((p) => [p, pick([1, 2, 6, 92, -1, 79]) * 1.602176634e-19]);
  cases.decayLength = logSpace(-24, -15, 60).map((p) => [p, pick(masses), pick([2.1969811e-6, 2.6033e-8, 1e-12, 880])]);
  cases.electronWavelength = logSpace(-3, 12, 120).map((U) => [U]);
  cases.rindlerHorizonDistance = logSpace(-12, 25, 80).map((a) => [a]);

  // Hyperbolic motion: a0 t / c from 1e-12 to 1e6, several accelerations, both directions.
  const ws = [...logSpace(-12, 6, 200), ...Array.from({ length: 60 }, () => 10 ** (-12 + 18 * rand()))];
  const hyperbolic = ws.map((w) => {
    const a = pick(accelerations);
    return [rand() < 0.5 ? -a : a, (w * C_NUM) / a];
  });
  cases.hyperbolicSpeed = hyperbolic;
  cases.hyperbolicDistance = hyperbolic;
  cases.hyperbolicProperTime = hyperbolic;

  // Rocket: exhaust speeds over the β grid (and light), mass ratios with R − 1 from 1e-12 to 1e6.
  const ratiosR = [...logSpace(-12, 6, 120).map((d) => 1 + d), 1 + 2 ** -52, 2, 10, 100];
  cases.rocketDeltaV = [...betas, 1, 1, 1].map((ve) => [ve, pick(ratiosR)]);

  // Invariant mass of a particle with the β grid: E = γmc², p = γβmc (skipping any that round space-like).
  cases.invariantMass = betas
    .map((b) => {
      const m = pick(masses);
      const g = 1 / Math.sqrt((1 - b) * (1 + b));
      return [g * m * C_NUM * C_NUM, g * b * m * C_NUM];
    })
    .filter(([E, p]) => exact(E).gte(exact(p).mul(REF_C)));

  const pairs: Array<[number, number]> = [
    [M_P_KG, M_P_KG],
    [M_E_KG, M_P_KG],
    [0, M_P_KG],
    [M_P_KG, M_E_KG],
    [M_MU_KG, 3.7e-26],
  ];
  cases.sqrtSFixedTarget = ratios.map((x) => {
    const [ma, mb] = pick(pairs);
    return [x * (ma || mb) * C_NUM * C_NUM, ma, mb];
  });

  // Colliders: each beam's γ from 1 + 1e-12 to 1e12, masses including 0 (massless beams).
  cases.sqrtSCollider = ratios
    .map((x) => {
      const [m1, m2] = pick(pairs);
      const E1 = (1 + x) * (m1 || M_E_KG) * C_NUM * C_NUM;
      const E2 = (1 + pick(ratios)) * (m2 || M_E_KG) * C_NUM * C_NUM;
      return [E1, E2, m1, m2];
    })
    .filter(([E1, E2, m1, m2]) => exact(E1).gte(exact(m1).mul(C2)) && exact(E2).gte(exact(m2).mul(C2)));

  // Thresholds: product mass excess from 1e-12 to 1e3 of the initial masses.
  cases.thresholdKinetic = logSpace(-12, 3, 120).map((d) => {
    const [ma, mb] = pick(pairs);
    return [ma, mb, (ma + mb) * (1 + d)];
  });

  // Aberration: angles from 1e-12 rad to π (log-spaced, uniform, and π − 10^-k), both signs.
  const angles = [
    ...logSpace(-12, Math.log10(Math.PI), 80),
    ...Array.from({ length: 60 }, () => Math.PI * rand()),
    ...logSpace(-12, 0, 40).map((d) => Math.PI - d),
    Math.PI,
  ].map((th) => Math.min(th, Math.PI));
  cases.aberrationAngle = signedBetas.map((b) => {
    const th = pick(angles);
    return [rand() < 0.5 ? -th : th, b];
  });

  // Lorentz boosts of random events with |x| up to 3c|t|.
  cases.lorentzBoost = signedBetas.map((b) => {
    const t = (rand() - 0.5) * pick([2, 2e-9, 2e6]);
    const x = (rand() - 0.5) * 6 * C_NUM * Math.abs(t);
    return [t, x, b];
  });

  // Synchrotron loss: γ from 1 + 1e-12 to 1e7, electrons, muons and protons.
  cases.synchrotronLossPerTurn = logSpace(-12, 7, 120)
    .map((x) => {
      const m = pick([M_E_KG, M_P_KG, M_MU_KG]);
      return [(1 + x) * m * C_NUM * C_NUM, pick([7, 0.3, 3096.175, 2803.95]), m];
    })
    .filter(([E, , m]) => exact(E).gte(exact(m).mul(C2)));

  // Satellite timing and spaceflight (drawn after every grid above, which therefore stay as they were).
  const bodies = [3.986004418e14, 1.32712440041e20, 4.9028e12, 1e5];
  const weak = (GM: number, r: number) => GM / (C_NUM * C_NUM * r) <= 1e-4;
  cases.gravitationalRateOffset = logSpace(-12, 3, 160)
    .map((d) => {
      const GM = pick(bodies);
      const ref = 10 ** (6 + 7 * rand());
      return [GM, rand() < 0.5 ? ref * (1 + d) : ref / (1 + d), ref];
    })
    .filter(([GM, r, ref]) => weak(GM, r) && weak(GM, ref));
  cases.orbitClockRateOffset = [...logSpace(-9, 2.3, 160), 2.3, 0.49653].map((x) => [6_378_137 * (1 + x)]);
  cases.eccentricityClockCorrection = logSpace(6, 9, 120).map((a) => [
    a,
    pick([1e-6, 0.01, 0.3, 0.9]),
    (rand() - 0.5) * 20,
  ]);
  cases.sagnacDelay = logSpace(0, 15, 60).map((A) => [rand() < 0.5 ? -A : A]);
  cases.shapiroDelay = logSpace(-12, 0, 160)
    .map((d) => {
      const r1 = 10 ** (6 + 6 * rand());
      const r2 = 10 ** (6 + 6 * rand());
      const lo = Math.abs(r1 - r2);
      const hi = r1 + r2;
      // Short paths (near |r1 − r2|) and paths grazing behind the body (near r1 + r2).
      const r12 = rand() < 0.5 ? lo + (hi - lo) * d : hi - (hi - lo) * d;
      return [pick(bodies), r1, r2, r12];
    })
    .filter(([, r1, r2, r12]) => r12 >= Math.abs(r1 - r2) && exact(r12).lt(exact(r1).plus(exact(r2))));
  cases.massRatio = betas
    .map((dv) => [dv, pick([...betas, 1, 1])])
    .filter(([dv, ve]) => dv < 1 && Math.atanh(dv) / ve < 700);
  // Electron optics and matter waves: voltages from 1e-6 V to 1e12 V; kinetic energies T/(mc²) from
  // 1e-24 to 1e12 (the energy grid above), and photons; momenta over 30 decades.
  const volts = logSpace(-6, 12, 160);
  cases.relativisticVoltage = volts.map((U) => [U]);
  cases.interactionConstant = volts.map((U) => [U]);
  cases.wavelengthFromKinetic = [...kinetic, [1.602176634e-19, 0], [3.2e-13, 0]];
  cases.wavelengthFromMomentum = logSpace(-40, -10, 120).map((p) => [p]);
  cases.synchrotronCriticalEnergy = logSpace(-12, 7, 120)
    .map((x) => {
      const m = pick([M_E_KG, M_P_KG, M_MU_KG]);
      return [(1 + x) * m * C_NUM * C_NUM, pick([7, 0.3, 3096.175]), m];
    })
    .filter(([E, , m]) => exact(E).gte(exact(m).mul(C2)));
  cases.revolutionFrequency = signedBetas.filter((b) => b !== 0).map((b) => [b, pick([1, 26_658.883, 0.3, 6.3e3])]);
  cases.cyclotronFrequency = kinetic.map(([T, m]) => [
    pick([1.602176634e-19, -1.602176634e-19, 9.6e-19]),
    pick([1, 0.01, 12, -3]),
    m,
    T,
  ]);
  cases.momentumSpreadFromEnergySpread = signedBetas
    .filter((b) => b !== 0)
    .map((b) => [pick([1e-3, -2.5e-4, 0.1, 3e-7]), b]);
  cases.energySpreadFromMomentumSpread = signedBetas
    .filter((b) => b !== 0)
    .map((b) => [pick([1e-3, -2.5e-4, 0.1, 3e-7]), b]);
  // Two-body decays from just above threshold (M/(m1 + m2) − 1 from 1e-12) to far above, one product massless at times.
  cases.twoBodyDecayMomentum = logSpace(-12, 4, 160)
    .map((x) => {
      const m1 = pick([M_E_KG, M_P_KG, M_MU_KG, 3.7e-26]);
      const m2 = pick([0, M_E_KG, M_P_KG, M_MU_KG]);
      return [(m1 + m2) * (1 + x), m1, m2];
    })
    .filter(([M, m1, m2]) => exact(M).gte(exact(m1).plus(exact(m2))));
  // Hyperbolic motion by distance: x = a0·d/c² = γ − 1 from 1e-12 to 1e6, several accelerations, both
  // directions; the trips cover twice the distance (so γ at the midpoint spans the same range).
  const xs = [...logSpace(-12, 6, 200), ...Array.from({ length: 60 }, () => 10 ** (-12 + 18 * rand()))];
  const byDistance = xs.map((x) => {
    const a = pick(accelerations);
    return [rand() < 0.5 ? -a : a, (x * C_NUM * C_NUM) / a];
  });
  cases.hyperbolicSpeedFromDistance = byDistance;
  cases.hyperbolicCoordinateTimeFromDistance = byDistance;
  cases.hyperbolicProperTimeFromDistance = byDistance;
  cases.hyperbolicTripCoordinateTime = byDistance.map(([a, d]) => [a, 2 * d]);
  cases.hyperbolicTripProperTime = byDistance.map(([a, d]) => [a, 2 * d]);
  cases.hyperbolicTripPeakSpeed = byDistance.map(([a, d]) => [a, 2 * d]);
  // Slip factor: α_c from 1e-5 to 0.1 (both signs), γ from 1 to 1e4 and within 1e-12 … 1e-1 of transition.
  const alphas = logSpace(-5, -1, 40);
  cases.slipFactor = [
    ...alphas.map((al) => [rand() < 0.2 ? -al : al, 10 ** (4 * rand())]),
    ...logSpace(-12, -1, 120)
      .map((eps) => {
        const al = pick(alphas);
        return [al, (1 / Math.sqrt(al)) * (rand() < 0.5 ? 1 + eps : 1 - eps)];
      })
      .filter(([, g]) => g >= 1),
  ];
  cases.transitionGamma = logSpace(-12, 2, 120).map((al) => [al]);

  // Ion beams (drawn after every grid above): atoms from ¹H to ²³⁸U in every charge state class; ions
  // of A = 1 … 238 with T/A from 1e-24 to 1e12 of their rest energy per nucleon, momenta over 24 decades.
  const atoms: Array<[number, number]> = [
    [1.6735328401021743e-27, 1],
    [6.646479080869192e-27, 2],
    [1.992646882704e-26, 6],
    [2.65601806293209e-26, 8],
    [3.319822799562595e-26, 10],
    [3.9529e-25, 92],
  ];
  // Every charge state from −1 to min(Z, 12), and Z: at least 50 samples.
  cases.ionMass = atoms.flatMap(([M, Z]) =>
    [...Array.from({ length: Math.min(Z, 12) + 2 }, (_, i) => i - 1), ...(Z > 12 ? [Z] : [])].map((q) => [
      M,
      Z,
      q * 1.602176634e-19,
    ]),
  );
  const ions: Array<[number, number, number]> = [
    [1, 1.67262192595e-27, 1],
    [4, 6.644657345e-27, 2],
    [12, 1.9921005e-26, 6],
    [12, 1.99221e-26, 4],
    [16, 2.6551e-26, 8],
    [20, 3.3187e-26, 10],
    [238, 3.9516e-25, 92],
  ];
  const perNucleon = ratios.map((x) => {
    const [A, m, z] = pick(ions);
    return [x * (m / A) * C_NUM * C_NUM, A, m, z];
  });
  cases.gammaFromKineticPerNucleon = perNucleon.map(([Tn, A, m]) => [Tn, A, m]);
  cases.speedFromKineticPerNucleon = perNucleon.map(([Tn, A, m]) => [Tn, A, m]);
  cases.momentumFromKineticPerNucleon = perNucleon.map(([Tn, A, m]) => [Tn, A, m]);
  cases.rigidityFromKineticPerNucleon = perNucleon.map(([Tn, A, m, z]) => [
    Tn,
    A,
    m,
    (rand() < 0.5 ? -z : z) * 1.602176634e-19,
  ]);
  const ionMomenta = logSpace(-12, 12, 240).map((y) => {
    const [A, m, z] = pick(ions);
    return [y * m * C_NUM, A, m, z];
  });
  cases.kineticPerNucleonFromMomentum = ionMomenta.map(([p, A, m]) => [p, A, m]);
  cases.kineticPerNucleonFromRigidity = ionMomenta.map(([p, A, m, z]) => {
    const q = (rand() < 0.5 ? -z : z) * 1.602176634e-19;
    return [p / q, A, m, q];
  });

  // Hyperbolic motion by proper time (drawn last, so the grids above keep their points): u = a0τ/c
  // from 1e-12 to 630 (overflow of t and x begins between u ≈ 660 and 720, depending on a0; see
  // support/hyperbolic-at-proper-time.ts), several accelerations, both directions.
  const us = [
    ...logSpace(-12, Math.log10(630), 220),
    ...Array.from({ length: 60 }, () => 10 ** (-12 + (12 + Math.log10(630)) * rand())),
  ];
  const byProperTime = us.map((uu) => {
    const a = pick(accelerations);
    return [rand() < 0.5 ? -a : a, (uu * C_NUM) / a];
  });
  cases.hyperbolicSpeedAtProperTime = byProperTime;
  cases.hyperbolicCoordinateTimeAtProperTime = byProperTime;
  cases.hyperbolicDistanceAtProperTime = byProperTime;

  return cases;
}

export interface SurveyRow {
  name: string;
  worstUlp: number;
  samples: number;
  /** The arguments of the worst sample. */
  worstAt: number[];
}

/** Worst ulp error of every library function over its grid. */
export function accuracySurvey(): SurveyRow[] {
  const cases = surveyCases();
  return LIBRARY.map((fn) => {
    const list = cases[fn.name];
    if (!list) throw new Error(`no survey grid for ${fn.name}`);
    const reference = REFERENCES[fn.name];
    let worstUlp = 0;
    let worstAt: number[] = [];
    for (const args of list) {
      const error = errorOf(fn.kernel(...args), reference(...args));
      if (!(error <= worstUlp)) {
        worstUlp = error;
        worstAt = args;
      }
    }
    return { name: fn.name, worstUlp, samples: list.length, worstAt };
  });
}

/** The table the accuracy test prints and the benchmark reports. */
export function worstUlpTable(): Array<{ name: string; worstUlp: number; samples: number }> {
  return accuracySurvey().map(({ name, worstUlp, samples }) => ({ name, worstUlp, samples }));
}
