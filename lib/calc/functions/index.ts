// The relativistic function library: every function the engine registers, in reference order.
import { aberrationAngle } from './aberration-angle';
import { addVelocities } from './add-velocities';
import { betaGamma } from './beta-gamma';
import { betaGammaFromMomentum } from './beta-gamma-from-momentum';
import { clockRateOffset } from './clock-rate-offset';
import { cyclotronFrequency } from './cyclotron-frequency';
import { energySpreadFromMomentumSpread } from './energy-spread-from-momentum-spread';
import { momentumSpreadFromEnergySpread } from './momentum-spread-from-energy-spread';
import { revolutionFrequency } from './revolution-frequency';
import { synchrotronCriticalEnergy } from './synchrotron-critical-energy';
import { twoBodyDecayMomentum } from './two-body-decay-momentum';
import { ionMass } from './ion-mass';
import { gammaFromKineticPerNucleon } from './gamma-from-kinetic-per-nucleon';
import { speedFromKineticPerNucleon } from './speed-from-kinetic-per-nucleon';
import { momentumFromKineticPerNucleon } from './momentum-from-kinetic-per-nucleon';
import { rigidityFromKineticPerNucleon } from './rigidity-from-kinetic-per-nucleon';
import { kineticPerNucleonFromRigidity } from './kinetic-per-nucleon-from-rigidity';
import { kineticPerNucleonFromMomentum } from './kinetic-per-nucleon-from-momentum';
import { interactionConstant } from './interaction-constant';
import { relativisticVoltage } from './relativistic-voltage';
import { wavelengthFromKinetic } from './wavelength-from-kinetic';
import { wavelengthFromMomentum } from './wavelength-from-momentum';
import { eccentricityClockCorrection } from './eccentricity-clock-correction';
import { gravitationalRateOffset } from './gravitational-rate-offset';
import { massRatio } from './mass-ratio';
import { orbitClockRateOffset } from './orbit-clock-rate-offset';
import { sagnacDelay } from './sagnac-delay';
import { shapiroDelay } from './shapiro-delay';
import { decayLength } from './decay-length';
import { dopplerFactor } from './doppler-factor';
import { electronWavelength } from './electron-wavelength';
import { gammaFromKinetic } from './gamma-from-kinetic';
import { gammaMinusOne } from './gamma-minus-one';
import { hyperbolicDistance } from './hyperbolic-distance';
import { hyperbolicProperTime } from './hyperbolic-proper-time';
import { hyperbolicSpeed } from './hyperbolic-speed';
import { hyperbolicCoordinateTimeFromDistance } from './hyperbolic-coordinate-time-from-distance';
import { hyperbolicProperTimeFromDistance } from './hyperbolic-proper-time-from-distance';
import { hyperbolicSpeedFromDistance } from './hyperbolic-speed-from-distance';
import { hyperbolicCoordinateTimeAtProperTime } from './hyperbolic-coordinate-time-at-proper-time';
import { hyperbolicDistanceAtProperTime } from './hyperbolic-distance-at-proper-time';
import { hyperbolicSpeedAtProperTime } from './hyperbolic-speed-at-proper-time';
import { hyperbolicTripCoordinateTime } from './hyperbolic-trip-coordinate-time';
import { hyperbolicTripPeakSpeed } from './hyperbolic-trip-peak-speed';
import { hyperbolicTripProperTime } from './hyperbolic-trip-proper-time';
import { slipFactor } from './slip-factor';
import { transitionGamma } from './transition-gamma';
import { invariantMass } from './invariant-mass';
import { kineticEnergy } from './kinetic-energy';
import { kineticFromMomentum } from './kinetic-from-momentum';
import { kineticFromRigidity } from './kinetic-from-rigidity';
import { lengthContraction } from './length-contraction';
import { lorentzBoost } from './lorentz-boost';
import { lorentzFactor } from './lorentz-factor';
import { magneticRigidity } from './magnetic-rigidity';
import { momentumFromKinetic } from './momentum-from-kinetic';
import { properToCoordinateAcceleration } from './proper-to-coordinate-acceleration';
import { rapidity } from './rapidity';
import { rindlerHorizonDistance } from './rindler-horizon-distance';
import { rocketDeltaV } from './rocket-delta-v';
import { speedFromKinetic } from './speed-from-kinetic';
import { speedFromMomentum } from './speed-from-momentum';
import { sqrtSCollider } from './sqrt-s-collider';
import { sqrtSFixedTarget } from './sqrt-s-fixed-target';
import { synchrotronLossPerTurn } from './synchrotron-loss-per-turn';
import { thresholdKinetic } from './threshold-kinetic';
import { timeDilation } from './time-dilation';
import { timeOfFlight } from './time-of-flight';
import { transverseCoordinateAcceleration } from './transverse-coordinate-acceleration';
import type { CalcFunction } from './types';

export { DomainError } from './types';
export type { CalcFunction, ParamKind } from './types';
export {
  aberrationAngle,
  addVelocities,
  betaGamma,
  clockRateOffset,
  decayLength,
  cyclotronFrequency,
  energySpreadFromMomentumSpread,
  momentumSpreadFromEnergySpread,
  revolutionFrequency,
  synchrotronCriticalEnergy,
  twoBodyDecayMomentum,
  ionMass,
  gammaFromKineticPerNucleon,
  speedFromKineticPerNucleon,
  momentumFromKineticPerNucleon,
  rigidityFromKineticPerNucleon,
  kineticPerNucleonFromRigidity,
  kineticPerNucleonFromMomentum,
  interactionConstant,
  relativisticVoltage,
  wavelengthFromKinetic,
  wavelengthFromMomentum,
  eccentricityClockCorrection,
  gravitationalRateOffset,
  massRatio,
  orbitClockRateOffset,
  sagnacDelay,
  shapiroDelay,
  dopplerFactor,
  electronWavelength,
  gammaMinusOne,
  hyperbolicDistance,
  hyperbolicProperTime,
  hyperbolicSpeed,
  hyperbolicCoordinateTimeFromDistance,
  hyperbolicProperTimeFromDistance,
  hyperbolicSpeedFromDistance,
  hyperbolicTripCoordinateTime,
  hyperbolicTripPeakSpeed,
  hyperbolicTripProperTime,
  hyperbolicSpeedAtProperTime,
  hyperbolicCoordinateTimeAtProperTime,
  hyperbolicDistanceAtProperTime,
  slipFactor,
  transitionGamma,
  invariantMass,
  kineticEnergy,
  lengthContraction,
  lorentzBoost,
  lorentzFactor,
  magneticRigidity,
  momentumFromKinetic,
  properToCoordinateAcceleration,
  rapidity,
  rindlerHorizonDistance,
  rocketDeltaV,
  speedFromKinetic,
  sqrtSCollider,
  sqrtSFixedTarget,
  synchrotronLossPerTurn,
  thresholdKinetic,
  timeDilation,
  timeOfFlight,
  transverseCoordinateAcceleration,
};

export const LIBRARY: readonly CalcFunction[] = Object.freeze([
  lorentzFactor,
  gammaMinusOne,
  rapidity,
  addVelocities,
  timeDilation,
  lengthContraction,
  kineticEnergy,
  speedFromKinetic,
  momentumFromKinetic,
  magneticRigidity,
  decayLength,
  electronWavelength,
  dopplerFactor,
  properToCoordinateAcceleration,
  hyperbolicSpeed,
  hyperbolicDistance,
  hyperbolicProperTime,
  rocketDeltaV,
  clockRateOffset,
  invariantMass,
  sqrtSFixedTarget,
  sqrtSCollider,
  thresholdKinetic,
  timeOfFlight,
  transverseCoordinateAcceleration,
  aberrationAngle,
  lorentzBoost,
  rindlerHorizonDistance,
  synchrotronLossPerTurn,
  betaGamma,
  // Direct routes from energies, momenta and rigidities (issue 15): exact where composing through a
  // rounded β would not be (the precise-speed companion makes the compositions exact too).
  gammaFromKinetic,
  speedFromMomentum,
  betaGammaFromMomentum,
  kineticFromMomentum,
  kineticFromRigidity,
  // Ion beams (issue 17): the ion's mass from the atomic mass, and kinematics from the kinetic
  // energy per nucleon (T/A, the trade's MeV/u) and back.
  ionMass,
  gammaFromKineticPerNucleon,
  speedFromKineticPerNucleon,
  momentumFromKineticPerNucleon,
  rigidityFromKineticPerNucleon,
  kineticPerNucleonFromRigidity,
  kineticPerNucleonFromMomentum,
  // Satellite timing and spaceflight (issue 17).
  gravitationalRateOffset,
  orbitClockRateOffset,
  eccentricityClockCorrection,
  sagnacDelay,
  shapiroDelay,
  massRatio,
  // Electron optics and matter waves (issue 17).
  relativisticVoltage,
  interactionConstant,
  wavelengthFromKinetic,
  wavelengthFromMomentum,
  // Rings and decays (issue 17).
  synchrotronCriticalEnergy,
  twoBodyDecayMomentum,
  revolutionFrequency,
  cyclotronFrequency,
  momentumSpreadFromEnergySpread,
  energySpreadFromMomentumSpread,
  // Constant proper acceleration given by distance, and accelerate-then-decelerate trips (issue 17).
  hyperbolicSpeedFromDistance,
  hyperbolicCoordinateTimeFromDistance,
  hyperbolicProperTimeFromDistance,
  hyperbolicTripCoordinateTime,
  hyperbolicTripProperTime,
  hyperbolicTripPeakSpeed,
  // Constant proper acceleration given by the proper time τ on the body's own clock (issue 17).
  hyperbolicSpeedAtProperTime,
  hyperbolicCoordinateTimeAtProperTime,
  hyperbolicDistanceAtProperTime,
  // Longitudinal motion in rings (issue 17).
  slipFactor,
  transitionGamma,
]);
