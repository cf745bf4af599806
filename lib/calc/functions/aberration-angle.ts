import { requireFinite } from './support/domain';
import { dd, mul, mulNum, round, scale } from './support/double-double';
import { atan2FirstQuadrant, sinCos } from './support/elementary';
import { dopplerOf, massiveSpeed } from './support/kinematics';
import { type CalcFunction, DomainError, type KernelArgument } from './types';

const FN = 'aberrationAngle';

/** Angles up to this far beyond π (a few ulp, e.g. 180° converted to radians) are read as π. */
const PI_ALLOWANCE = 4 * 2 ** -51;

/**
 * aberrationAngle(theta, v) — relativistic aberration of light: the direction of a light ray seen in a
 * frame S′ moving at v along +x, given its direction θ in the frame S.
 *
 * Convention: θ is the angle between the ray's direction of PROPAGATION and the +x axis (the direction
 * of v) in S; the result θ′ is the same angle in S′. A ray crossing at 90° in S is seen in S′ at
 * cos θ′ = −β, tilted backwards. For the apparent direction of a source (the opposite of the
 * propagation direction) use −v.
 *
 * Formula: tan(θ′/2) = √((1 + β)/(1 − β)) · tan(θ/2), equivalent to cos θ′ = (cos θ − β)/(1 − β cos θ).
 *
 * Domain: −π ≤ θ ≤ π (a signed angle in the plane of x and the ray gives a signed result; a few ulp
 * beyond ±π are read as ±π); |β| < 1; NaN and ±Infinity are refused.
 *
 * Example: `aberrationAngle(90 deg, 0.6) to deg` → 126.87 deg.
 *
 * Source: Einstein, Annalen der Physik 17 (1905), §7; Jackson, Classical Electrodynamics, 3rd ed.
 * (1999), ch. 11; W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 4.
 *
 * Numerics: the half-angle form is well conditioned at all angles, where acos of the cosine form loses
 * digits near 0 and π. θ′/2 = atan2(D sin(θ/2), cos(θ/2)) with the Doppler factor D, sin and cos in
 * double-double and the atan2 corrected to double-double; rounded once.
 */
export const aberrationAngle: CalcFunction = {
  name: FN,
  params: [
    {
      name: 'theta',
      kind: 'angle',
      description: 'angle between the ray’s propagation direction and the direction of v, in S',
    },
    { name: 'v', kind: 'speed', description: 'speed of frame S′ relative to S along +x (a velocity, or β)' },
  ],
  returns: 'angle',
  doc: {
    summary:
      'Aberration of light: the angle θ′ in a frame moving at v along +x of a ray whose propagation direction makes the angle θ with +x in the rest frame.',
    formula:
      "\\tan\\frac{\\theta'}{2} = \\sqrt{\\frac{1+\\beta}{1-\\beta}}\\,\\tan\\frac{\\theta}{2} \\quad\\left(\\cos\\theta' = \\frac{\\cos\\theta - \\beta}{1 - \\beta\\cos\\theta}\\right)",
    domain:
      'θ is the angle of the ray’s direction of propagation (not the direction towards the source) from +x, the direction of v; −π ≤ θ ≤ π (signed angles give signed results; a few ulp beyond ±π are read as ±π). |β| < 1. NaN and ±Infinity are refused. A ray at 90° in S appears at cos θ′ = −β in S′; for the apparent direction of a source use −v.',
    example: 'aberrationAngle(90 deg, 0.6) to deg',
    exampleResult: '126.8699 deg (cos θ′ = −0.6)',
    source:
      'A. Einstein, "Zur Elektrodynamik bewegter Körper", Annalen der Physik 17 (1905), §7; J. D. Jackson, Classical Electrodynamics, 3rd ed. (1999), ch. 11; W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 4.',
    numerics:
      'The half-angle form is well conditioned at every angle (acos of the cosine form loses digits near 0 and π). θ′/2 = atan2(D·sin(θ/2), cos(θ/2)) with D = √((1 + β)/(1 − β)) from exact 1 ± β, sin and cos by double-double series, and atan2 corrected to double-double; rounded once (within about half an ulp).',
  },
  kernel: (thetaArg: KernelArgument, v: KernelArgument): number => {
    const theta = requireFinite(FN, 'theta', thetaArg as number);
    const speed = massiveSpeed(FN, 'v', v);
    let magnitude = Math.abs(theta);
    if (magnitude > Math.PI) {
      if (magnitude > Math.PI * (1 + PI_ALLOWANCE)) {
        throw new DomainError(`${FN}: theta must lie between −π and π (−180° to 180°); got theta = ${theta} rad`);
      }
      magnitude = Math.PI;
    }
    const doppler = dopplerOf(speed);
    let result: number;
    if (magnitude < 2 ** -500) {
      // θ′ = Dθ(1 + O(θ²)): exact to far below an ulp, and safe for subnormal angles, whose half
      // would underflow.
      result = round(mulNum(doppler, magnitude));
    } else {
      const [s, c] = sinCos(dd(magnitude / 2));
      result = round(scale(atan2FirstQuadrant(mul(doppler, s), c), 2));
    }
    return theta < 0 ? -result : result;
  },
};
