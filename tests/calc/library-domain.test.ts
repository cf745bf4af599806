// Domain checks of the relativistic library: every input a function must refuse throws a DomainError
// whose message names the function, the parameter and the offending value; inputs at the edge of the
// domain that make physical sense are accepted.
import { describe, expect, it } from 'vitest';
import { C, G_N, M_E, M_MU, M_N, M_P } from '../../lib/calc/constants';
import { type CalcFunction, DomainError, LIBRARY } from '../../lib/calc/functions';

const MeV = 1.602176634e-13;
const BELOW_ONE = 1 - 2 ** -53;

function fn(name: string): CalcFunction {
  const found = LIBRARY.find((f) => f.name === name);
  if (!found) throw new Error(`no library function ${name}`);
  return found;
}
const call = (name: string, ...args: number[]) => fn(name).kernel(...args);

/** A valid call of every function, from which the refusals below are derived. */
const VALID: Record<string, number[]> = {
  lorentzFactor: [0.5],
  gammaMinusOne: [0.5],
  rapidity: [0.5],
  addVelocities: [0.5, 0.5],
  timeDilation: [1e-6, 0.5],
  lengthContraction: [1, 0.5],
  kineticEnergy: [M_P, 0.5],
  speedFromKinetic: [250 * MeV, M_P],
  momentumFromKinetic: [250 * MeV, M_P],
  magneticRigidity: [1e-18, 1.602176634e-19],
  decayLength: [1e-19, M_MU, 2.1969811e-6],
  electronWavelength: [200e3],
  dopplerFactor: [0.5],
  properToCoordinateAcceleration: [G_N, 0.5],
  hyperbolicSpeed: [G_N, 1e7],
  hyperbolicDistance: [G_N, 1e7],
  hyperbolicProperTime: [G_N, 1e7],
  rocketDeltaV: [0.1, 10],
  clockRateOffset: [1e-5],
  invariantMass: [1e-9, 1e-18],
  sqrtSFixedTarget: [1e-8, M_P, M_P],
  sqrtSCollider: [1e-6, 1e-6, M_P, M_P],
  thresholdKinetic: [M_P, M_P, 4 * M_P],
  timeOfFlight: [10, 250 * MeV, M_P],
  transverseCoordinateAcceleration: [G_N, 0.5],
  aberrationAngle: [1, 0.5],
  lorentzBoost: [1, 1e8, 0.5],
  rindlerHorizonDistance: [G_N],
  synchrotronLossPerTurn: [3e9 * 1.602176634e-19, 7, M_E],
  betaGamma: [0.5],
  gammaFromKinetic: [250 * MeV, M_P],
  betaGammaFromMomentum: [1e-18, M_P],
  speedFromMomentum: [1e-18, M_P],
  kineticFromMomentum: [1e-18, M_P],
  kineticFromRigidity: [3.3356, M_P, 1.602176634e-19],
  ionMass: [1.992646882704e-26, 6, 6 * 1.602176634e-19],
  gammaFromKineticPerNucleon: [430 * MeV, 12, 1.9921005e-26],
  speedFromKineticPerNucleon: [430 * MeV, 12, 1.9921005e-26],
  momentumFromKineticPerNucleon: [430 * MeV, 12, 1.9921005e-26],
  rigidityFromKineticPerNucleon: [430 * MeV, 12, 1.9921005e-26, 6 * 1.602176634e-19],
  kineticPerNucleonFromRigidity: [6.6, 12, 1.9921005e-26, 6 * 1.602176634e-19],
  kineticPerNucleonFromMomentum: [6.4e-18, 12, 1.9921005e-26],
  gravitationalRateOffset: [3.986004418e14, 26_561_750, 6_378_137],
  orbitClockRateOffset: [26_561_750],
  eccentricityClockCorrection: [26_561_750, 0.01, 1],
  sagnacDelay: [1e12],
  shapiroDelay: [3.986004418e14, 26_561_750, 6_378_137, 20_183_613],
  massRatio: [0.5, 0.5],
  relativisticVoltage: [200e3],
  interactionConstant: [200e3],
  wavelengthFromKinetic: [4.05e-21, M_N],
  wavelengthFromMomentum: [1e-24],
  synchrotronCriticalEnergy: [3e9 * 1.602176634e-19, 7, M_E],
  twoBodyDecayMomentum: [2.488e-28, 1.884e-28, 0],
  revolutionFrequency: [0.5, 100],
  cyclotronFrequency: [1.602176634e-19, 1, M_P, 1e-12],
  momentumSpreadFromEnergySpread: [1e-3, 0.5],
  energySpreadFromMomentumSpread: [1e-3, 0.5],
  hyperbolicSpeedFromDistance: [G_N, 1e15],
  hyperbolicCoordinateTimeFromDistance: [G_N, 1e15],
  hyperbolicProperTimeFromDistance: [G_N, 1e15],
  hyperbolicTripCoordinateTime: [8e-4, 4.5e11],
  hyperbolicTripProperTime: [8e-4, 4.5e11],
  hyperbolicTripPeakSpeed: [8e-4, 4.5e11],
  hyperbolicSpeedAtProperTime: [8e-4, 3.456e7],
  hyperbolicCoordinateTimeAtProperTime: [8e-4, 3.456e7],
  hyperbolicDistanceAtProperTime: [8e-4, 3.456e7],
  slipFactor: [3.225e-4, 479.6],
  transitionGamma: [3.225e-4],
};

/** Runs the call and returns the DomainError it must throw. */
function refusal(name: string, args: number[]): DomainError {
  try {
    call(name, ...args);
  } catch (error) {
    expect(error, `${name}(${args.join(', ')})`).toBeInstanceOf(DomainError);
    expect((error as Error).name).toBe('DomainError');
    return error as DomainError;
  }
  throw new Error(`${name}(${args.join(', ')}) was accepted but must be refused`);
}

describe('valid calls', () => {
  it('every function has a valid call giving finite numbers', () => {
    expect(Object.keys(VALID).sort()).toEqual(LIBRARY.map((f) => f.name).sort());
    for (const f of LIBRARY) {
      const result = f.kernel(...VALID[f.name]);
      for (const x of Array.isArray(result) ? result : [result]) expect(Number.isFinite(x), f.name).toBe(true);
    }
  });
});

describe('NaN and ±Infinity', () => {
  it('are refused in every parameter of every function, naming the function, the parameter and the value', () => {
    for (const f of LIBRARY) {
      f.params.forEach((param, i) => {
        for (const bad of [NaN, Infinity, -Infinity]) {
          const args = [...VALID[f.name]];
          args[i] = bad;
          const error = refusal(f.name, args);
          expect(error.message.startsWith(`${f.name}: `), error.message).toBe(true);
          expect(error.message).toContain(param.name);
          expect(error.message).toContain(String(bad));
        }
      });
    }
  });
});

describe('speeds of massive bodies', () => {
  it('says exactly what is wrong with β = 1', () => {
    expect(refusal('lorentzFactor', [1]).message).toBe(
      'lorentzFactor: |β| must be below 1 for a massive body; got β = 1',
    );
  });

  it('refuses |β| ≥ 1 wherever the body is massive', () => {
    const speedPositions: Array<[string, number]> = [];
    for (const f of LIBRARY) {
      if (f.name === 'addVelocities' || f.name === 'rocketDeltaV' || f.name === 'massRatio') continue; // they accept light (|β| = 1)
      f.params.forEach((p, i) => {
        if (p.kind === 'speed') speedPositions.push([f.name, i]);
      });
    }
    expect(speedPositions.length).toBe(16);
    for (const [name, i] of speedPositions) {
      for (const bad of [1, -1, 1.5, -2, 1 + 2 ** -52]) {
        const args = [...VALID[name]];
        args[i] = bad;
        const message = refusal(name, args).message;
        expect(message.startsWith(`${name}: |β|`), message).toBe(true);
        expect(message).toContain('must be below 1 for a massive body');
        expect(message).toContain(`got β = ${bad}`);
      }
    }
  });

  it('accepts the largest double below 1, and zero', () => {
    for (const name of [
      'lorentzFactor',
      'gammaMinusOne',
      'rapidity',
      'dopplerFactor',
      'clockRateOffset',
      'betaGamma',
    ]) {
      expect(Number.isFinite(call(name, BELOW_ONE) as number), name).toBe(true);
      expect(Number.isFinite(call(name, -BELOW_ONE) as number), name).toBe(true);
      expect(Number.isFinite(call(name, 0) as number), name).toBe(true);
    }
  });
});

describe('velocity composition with light', () => {
  it('accepts light: c ⊕ v = c, −c ⊕ v = −c, c ⊕ c = c', () => {
    expect(call('addVelocities', 1, 0.5)).toBe(1);
    expect(call('addVelocities', 0.5, 1)).toBe(1);
    expect(call('addVelocities', 1, -0.99)).toBe(1);
    expect(call('addVelocities', -1, 0.99)).toBe(-1);
    expect(call('addVelocities', 1, 1)).toBe(1);
    expect(call('addVelocities', -1, -1)).toBe(-1);
  });

  it('refuses light against light and anything faster than light', () => {
    expect(refusal('addVelocities', [1, -1]).message).toMatch(
      /^addVelocities: light composed with light .*β_u = 1, β_v = -1/,
    );
    expect(refusal('addVelocities', [-1, 1]).message).toMatch(/^addVelocities: light composed with light/);
    expect(refusal('addVelocities', [1 + 2 ** -52, 0]).message).toBe(
      'addVelocities: |β| of u must not exceed 1 (1 is light); got β = 1.0000000000000002',
    );
    expect(refusal('addVelocities', [0, -1.5]).message).toBe(
      'addVelocities: |β| of v must not exceed 1 (1 is light); got β = -1.5',
    );
  });
});

describe('masses, energies and other magnitudes', () => {
  const cases: Array<[string, number[], string]> = [
    // negative or zero mass where a body must have one
    ['kineticEnergy', [0, 0.5], 'kineticEnergy: m must be > 0 (a body slower than light has mass); got m = 0 kg'],
    [
      'kineticEnergy',
      [-M_P, 0.5],
      `kineticEnergy: m must be > 0 (a body slower than light has mass); got m = ${-M_P} kg`,
    ],
    ['decayLength', [1e-19, 0, 1e-6], 'decayLength: m must be > 0'],
    ['decayLength', [1e-19, -M_MU, 1e-6], `got m = ${-M_MU} kg`],
    [
      'sqrtSFixedTarget',
      [1e-10, M_P, 0],
      'sqrtSFixedTarget: mTarget must be > 0 (a target at rest has mass); got mTarget = 0 kg',
    ],
    ['thresholdKinetic', [M_P, 0, 3 * M_P], 'thresholdKinetic: mTarget must be > 0'],
    ['synchrotronLossPerTurn', [1e-10, 7, 0], 'synchrotronLossPerTurn: m must be > 0'],
    // negative masses where zero is allowed
    ['speedFromKinetic', [1e-13, -M_P], `speedFromKinetic: m must be ≥ 0 (a rest mass); got m = ${-M_P} kg`],
    ['momentumFromKinetic', [1e-13, -1e-30], 'momentumFromKinetic: m must be ≥ 0 (a rest mass); got m = -1e-30 kg'],
    ['sqrtSFixedTarget', [1e-10, -M_P, M_P], 'sqrtSFixedTarget: mBeam must be ≥ 0'],
    ['sqrtSCollider', [1e-6, 1e-6, M_P, -M_P], 'sqrtSCollider: m2 must be ≥ 0'],
    ['thresholdKinetic', [M_P, M_P, -M_P], 'thresholdKinetic: mProducts must be ≥ 0'],
    ['timeOfFlight', [1, 1e-13, -M_P], 'timeOfFlight: m must be ≥ 0'],
    // negative energies
    ['speedFromKinetic', [-1e-13, M_P], 'speedFromKinetic: T must be ≥ 0 (a kinetic energy); got T = -1e-13 J'],
    ['momentumFromKinetic', [-1e-13, M_P], 'momentumFromKinetic: T must be ≥ 0 (a kinetic energy); got T = -1e-13 J'],
    ['invariantMass', [-1e-10, 0], 'invariantMass: E must be ≥ 0 (a total energy); got E = -1e-10 J'],
    ['sqrtSFixedTarget', [-1e-10, M_P, M_P], 'sqrtSFixedTarget: T must be ≥ 0'],
    ['sqrtSCollider', [-1e-6, 1e-6, M_P, M_P], 'sqrtSCollider: E1 must be ≥ 0'],
    ['timeOfFlight', [1, -1e-13, M_P], 'timeOfFlight: T must be ≥ 0'],
    ['synchrotronLossPerTurn', [-1e-10, 7, M_E], 'synchrotronLossPerTurn: E must be > 0'],
    // total energy below the rest energy, or below pc
    [
      'sqrtSCollider',
      [0.5 * M_P * C * C, 1e-6, M_P, M_P],
      'sqrtSCollider: the total energy E1 must be at least the rest energy mc²',
    ],
    ['sqrtSCollider', [1e-6, 0.9 * M_P * C * C, M_P, M_P], 'the total energy E2 must be at least the rest energy'],
    [
      'synchrotronLossPerTurn',
      [0.5 * M_E * C * C, 7, M_E],
      'synchrotronLossPerTurn: the total energy E must be at least the rest energy mc²',
    ],
    [
      'invariantMass',
      [1e-10, 1e-18],
      'invariantMass: the energy must be at least pc (a space-like four-momentum has no mass); got E = 1e-10 J',
    ],
    // mass ratio and exhaust speed of a rocket
    ['rocketDeltaV', [0.1, 0.5], 'rocketDeltaV: the mass ratio R = initial/final mass must be at least 1; got R = 0.5'],
    ['rocketDeltaV', [0.1, 0], 'got R = 0'],
    ['rocketDeltaV', [0.1, -3], 'got R = -3'],
    ['rocketDeltaV', [-0.1, 3], 'rocketDeltaV: the exhaust speed must satisfy 0 ≤ β_e ≤ 1; got β_e = -0.1'],
    ['rocketDeltaV', [1.5, 3], 'got β_e = 1.5'],
    // intervals, lengths, times, momenta and voltages that cannot be negative
    ['timeDilation', [-1e-6, 0.5], 'timeDilation: dtau must be ≥ 0 (an elapsed proper time); got dtau = -0.000001 s'],
    ['lengthContraction', [-1, 0.5], 'lengthContraction: L0 must be ≥ 0 (a proper length); got L0 = -1 m'],
    ['decayLength', [-1e-19, M_MU, 1e-6], 'decayLength: p must be ≥ 0'],
    ['decayLength', [1e-19, M_MU, -1e-6], 'decayLength: tau must be ≥ 0'],
    ['magneticRigidity', [-1e-18, 1.602176634e-19], 'magneticRigidity: p must be ≥ 0'],
    ['invariantMass', [1e-10, -1e-19], 'invariantMass: p must be ≥ 0'],
    ['timeOfFlight', [-10, 1e-13, M_P], 'timeOfFlight: L must be ≥ 0'],
    ['hyperbolicSpeed', [G_N, -1], 'hyperbolicSpeed: t must be ≥ 0 (time since the start from rest); got t = -1 s'],
    ['hyperbolicDistance', [G_N, -1], 'hyperbolicDistance: t must be ≥ 0'],
    ['hyperbolicProperTime', [G_N, -1], 'hyperbolicProperTime: t must be ≥ 0'],
    ['electronWavelength', [0], 'electronWavelength: U must be > 0 (an accelerating voltage); got U = 0 V'],
    ['electronWavelength', [-100], 'got U = -100 V'],
    [
      'rindlerHorizonDistance',
      [0],
      'rindlerHorizonDistance: a0 must be > 0 (the magnitude of the proper acceleration); got a0 = 0 m/s^2',
    ],
    ['rindlerHorizonDistance', [-G_N], `got a0 = ${-G_N} m/s^2`],
    [
      'synchrotronLossPerTurn',
      [1e-10, 0, M_E],
      'synchrotronLossPerTurn: rho must be > 0 (a bending radius); got rho = 0 m',
    ],
    // zero charge, undefined states, angles out of range, results out of range
    [
      'magneticRigidity',
      [1e-18, 0],
      'magneticRigidity: q must not be zero (a neutral particle is not bent); got q = 0 C',
    ],
    ['speedFromKinetic', [0, 0], 'speedFromKinetic: the speed of a massless particle with no energy is undefined'],
    ['timeOfFlight', [10, 0, M_P], 'timeOfFlight: a body at rest (T = 0) never covers the distance; got T = 0 J'],
    ['timeOfFlight', [10, 0, 0], 'timeOfFlight: a massless particle with no energy is undefined'],
    [
      'aberrationAngle',
      [4, 0.5],
      'aberrationAngle: theta must lie between −π and π (−180° to 180°); got theta = 4 rad',
    ],
    ['aberrationAngle', [-3.2, 0.5], 'got theta = -3.2 rad'],
    ['kineticEnergy', [1e300, 0.99], 'kineticEnergy: the result is outside the range of double-precision numbers'],
    ['rindlerHorizonDistance', [1e-300], 'rindlerHorizonDistance: the result is outside the range'],
    // hyperbolic motion by distance, trips, rings
    [
      'hyperbolicSpeedFromDistance',
      [G_N, -1],
      'hyperbolicSpeedFromDistance: d must be ≥ 0 (the distance covered from rest); got d = -1 m',
    ],
    [
      'hyperbolicCoordinateTimeFromDistance',
      [0, 1],
      'hyperbolicCoordinateTimeFromDistance: a0 must not be 0 when d > 0',
    ],
    ['hyperbolicProperTimeFromDistance', [0, 1e-300], 'hyperbolicProperTimeFromDistance: a0 must not be 0 when d > 0'],
    ['hyperbolicTripCoordinateTime', [G_N, -5], 'hyperbolicTripCoordinateTime: d must be ≥ 0'],
    ['hyperbolicTripProperTime', [0, 4.5e11], 'hyperbolicTripProperTime: a0 must not be 0 when d > 0'],
    ['hyperbolicTripPeakSpeed', [8e-4, -4.5e11], 'hyperbolicTripPeakSpeed: d must be ≥ 0'],
    [
      'hyperbolicSpeedAtProperTime',
      [8e-4, -1],
      'hyperbolicSpeedAtProperTime: tau must be ≥ 0 (proper time since the start from rest); got tau = -1 s',
    ],
    [
      'hyperbolicCoordinateTimeAtProperTime',
      [1e20, 1e-6],
      'hyperbolicCoordinateTimeAtProperTime: the result is outside the range',
    ],
    [
      'hyperbolicDistanceAtProperTime',
      [-1e20, 1e-6],
      'hyperbolicDistanceAtProperTime: the result is outside the range',
    ],
    ['slipFactor', [3.225e-4, 0.999], 'slipFactor: gamma must be ≥ 1 (a Lorentz factor); got gamma = 0.999'],
    [
      'transitionGamma',
      [0],
      'transitionGamma: alpha_c must be > 0 (a ring with α_c ≤ 0 has no transition energy); got alpha_c = 0',
    ],
    ['transitionGamma', [-0.01], 'got alpha_c = -0.01'],
  ];

  it.each(cases)('%s(%j) is refused: %s', (name, args, message) => {
    const error = refusal(name, args);
    expect(error.message.startsWith(`${name}: `), error.message).toBe(true);
    expect(error.message).toContain(message);
  });
});

describe('edges of the domain that make physical sense are accepted', () => {
  it('massless particles', () => {
    expect(call('speedFromKinetic', 1e-13, 0)).toBe(1);
    expect(call('momentumFromKinetic', 1e-13, 0)).toBe(1e-13 / C);
    expect(call('timeOfFlight', C, 1e-13, 0)).toBe(1);
    expect(call('sqrtSFixedTarget', 1e-10, 0, M_P)).toBeGreaterThan(M_P * C * C);
    expect(call('thresholdKinetic', 0, M_P, 2 * M_P)).toBeGreaterThan(0);
    expect(call('sqrtSCollider', 1e-9, 1e-9, 0, 0)).toBe(2e-9);
  });

  it('energies entered as m·c² or p·c, which may round an ulp below the exact product', () => {
    for (const m of [M_E, M_P, M_N, M_MU, 1, 3.7e-26]) {
      const rest = m * C * C;
      expect(call('sqrtSCollider', rest, rest, m, m) as number).toBeCloseTo(2 * rest, 20);
      expect(call('synchrotronLossPerTurn', rest, 1, m) as number).toBeLessThan(1e-30);
      expect(call('invariantMass', rest, 0) as number).toBeCloseTo(m, 40);
    }
    const p = 1e-18;
    expect(call('invariantMass', p * C * (1 - 2 ** -51), p)).toBe(0); // a photon: E = pc up to rounding
    expect(refusal('invariantMass', [p * C * (1 - 1e-12), p]).message).toContain('at least pc');
  });

  it('bodies at rest, zero lengths and intervals, no acceleration, no fuel burnt', () => {
    expect(call('kineticEnergy', M_P, 0)).toBe(0);
    expect(call('speedFromKinetic', 0, M_P)).toBe(0);
    expect(call('momentumFromKinetic', 0, M_P)).toBe(0);
    expect(call('lengthContraction', 0, 0.5)).toBe(0);
    expect(call('timeDilation', 0, 0.5)).toBe(0);
    expect(call('hyperbolicSpeed', 0, 100)).toBe(0);
    expect(call('hyperbolicDistance', 0, 100)).toBe(0);
    expect(call('hyperbolicProperTime', 0, 100)).toBe(100);
    expect(call('rocketDeltaV', 0.5, 1)).toBe(0);
    expect(call('rocketDeltaV', 0, 10)).toBe(0);
    expect(call('rocketDeltaV', 1, 3)).toBeCloseTo(0.8, 15); // a photon rocket
    expect(call('thresholdKinetic', M_N, M_P, M_P + M_E)).toBe(0); // exothermic: no threshold
    expect(call('magneticRigidity', 1e-18, -1.602176634e-19)).toBeLessThan(0); // negative charges bend the other way
    expect(call('hyperbolicSpeed', -G_N, 1e7)).toBeLessThan(0); // acceleration in the negative direction
    for (const name of [
      'hyperbolicSpeedFromDistance',
      'hyperbolicCoordinateTimeFromDistance',
      'hyperbolicProperTimeFromDistance',
      'hyperbolicTripCoordinateTime',
      'hyperbolicTripProperTime',
      'hyperbolicTripPeakSpeed',
    ]) {
      expect(call(name, 0, 0), name).toBe(0); // no distance: no time, no speed, with or without acceleration
      expect(call(name, G_N, 0), name).toBe(0);
    }
    expect(call('hyperbolicSpeedFromDistance', -G_N, 1e15)).toBeLessThan(0); // acceleration in the negative direction
    expect(call('hyperbolicTripPeakSpeed', -G_N, 1e15)).toBeLessThan(0);
    expect(call('hyperbolicTripProperTime', -G_N, 1e15)).toBe(call('hyperbolicTripProperTime', G_N, 1e15)); // times depend on |a0|
    expect(call('hyperbolicSpeedAtProperTime', 0, 100)).toBe(0);
    expect(call('hyperbolicCoordinateTimeAtProperTime', 0, 100)).toBe(100); // no acceleration: lab time = proper time
    expect(call('hyperbolicDistanceAtProperTime', 0, 100)).toBe(0);
    for (const name of [
      'hyperbolicSpeedAtProperTime',
      'hyperbolicCoordinateTimeAtProperTime',
      'hyperbolicDistanceAtProperTime',
    ])
      expect(call(name, G_N, 0), name).toBe(0);
    expect(call('hyperbolicSpeedAtProperTime', -G_N, 1e7)).toBeLessThan(0); // acceleration in the negative direction
    expect(call('hyperbolicDistanceAtProperTime', -G_N, 1e7)).toBe(-call('hyperbolicDistanceAtProperTime', G_N, 1e7));
    expect(call('hyperbolicCoordinateTimeAtProperTime', -G_N, 1e7)).toBe(
      call('hyperbolicCoordinateTimeAtProperTime', G_N, 1e7),
    ); // times depend on |a0|
    expect(call('slipFactor', -1e-3, 1)).toBe(-1.001); // negative momentum compaction, γ = 1
  });

  it('speeds that round to c are returned as the largest double below 1', () => {
    expect(call('speedFromKinetic', 1e3 * M_E * C * C * 1e6, M_E)).toBe(BELOW_ONE);
    expect(call('hyperbolicSpeed', G_N, 1e20)).toBe(BELOW_ONE);
    expect(call('hyperbolicSpeed', -G_N, 1e20)).toBe(-BELOW_ONE);
    expect(call('hyperbolicSpeedFromDistance', G_N, 1e300)).toBe(BELOW_ONE);
    expect(call('hyperbolicTripPeakSpeed', -1e300, 1e300)).toBe(-BELOW_ONE);
    expect(call('rocketDeltaV', 1, 1e30)).toBe(BELOW_ONE);
    expect(call('hyperbolicSpeedAtProperTime', G_N, 1e10)).toBe(BELOW_ONE); // a0τ/c ≈ 327
    expect(call('hyperbolicSpeedAtProperTime', -1e300, 1e300)).toBe(-BELOW_ONE);
    expect(call('addVelocities', BELOW_ONE, BELOW_ONE)).toBe(BELOW_ONE);
    expect(call('addVelocities', -BELOW_ONE, -BELOW_ONE)).toBe(-BELOW_ONE);
  });

  it('angles of ±π, and a few ulp beyond from a conversion of 180°, are accepted', () => {
    expect(call('aberrationAngle', Math.PI, 0.5)).toBeCloseTo(Math.PI, 15);
    expect(call('aberrationAngle', -Math.PI, 0.5)).toBeCloseTo(-Math.PI, 15);
    expect(call('aberrationAngle', Math.PI * (1 + 2 ** -52), 0.5)).toBeCloseTo(Math.PI, 15);
    expect(call('aberrationAngle', 0, 0.9)).toBe(0);
  });
});
