import { GM_EARTH, R_EARTH } from '../constants';
import { add, dd, div, fromDecimal, mul, neg, round, sqrt, sub } from './support/double-double';
import { requireFinite } from './support/domain';
import { C_SQUARED, ONE } from './support/kinematics';
import { type CalcFunction, DomainError, type KernelArgument } from './types';

const FN = 'orbitClockRateOffset';
/** About the radius of the Earth's Hill sphere, m: beyond it an orbit is about the Sun. */
const HILL_RADIUS = 1.5e9;
/** L_G as defined (IAU 2000 B1.9), in double-double: its nearest double is 1e-17 of itself off. */
const L_G_DD = fromDecimal('6.969290134e-10');

/**
 * orbitClockRateOffset(a) — the net fractional rate of a clock on a circular Earth orbit of radius a
 * relative to a clock on the geoid (Terrestrial Time): the gravitational and the velocity terms
 * together. Positive: the orbiting clock runs fast (a GPS clock by 4.4647e-10, 38.6 µs a day).
 *
 * Formula: Δf/f = L_G − GM_E/(a c²) + (1/γ − 1), with v² = GM_E/a (circular orbit) and
 * L_G = W₀/c² = 6.969 290 134 × 10⁻¹⁰ (the geoid's potential, rotation included).
 *
 * Domain: R_E ≤ a ≤ 1.5 × 10⁹ m (the WGS 84 equatorial radius to about the Earth's Hill sphere);
 * NaN and ±Infinity are refused. The Earth's
 * oblateness (J2) and an orbit's eccentricity are left out: eccentricityClockCorrection gives the
 * periodic term of an eccentric orbit.
 *
 * Example: `orbitClockRateOffset(26561.75 km)` → 4.4647e-10 (IS-GPS-200 §3.3.1.1: the satellite
 * clock's 10.23 MHz is set to 10.229 999 995 43 MHz so that it reads 10.23 MHz on the ground).
 *
 * Source: IS-GPS-200, §3.3.1.1; N. Ashby, Living Reviews in Relativity 6 (2003) 1, §5; IAU 2000
 * Resolution B1.9 (L_G); IERS Conventions (2010), table 1.1 (GM_E).
 *
 * Numerics: β² = GM_E/(a c²) and the velocity term −β²/(1 + √(1 − β²)) (no cancellation) in
 * double-double, L_G from its decimal, the three terms summed in double-double: the result keeps
 * its digits though the terms (7e-10, 5e-10, 8e-11) cancel, down to the radius where it is zero.
 */
export const orbitClockRateOffset: CalcFunction = {
  name: FN,
  params: [{ name: 'a', kind: 'length', description: 'radius of the circular orbit (from the centre of the Earth)' }],
  returns: 'number',
  doc: {
    summary:
      'Net fractional rate of a clock on a circular Earth orbit of radius a relative to a clock on the geoid (gravitational and velocity terms): positive when it runs fast.',
    formula:
      '\\frac{\\Delta f}{f} = L_{\\mathrm{G}} - \\frac{GM_{\\mathrm{E}}}{a c^2} + \\left(\\frac{1}{\\gamma} - 1\\right),\\quad v^2 = \\frac{GM_{\\mathrm{E}}}{a}',
    domain:
      "R_E (6378.137 km) ≤ a ≤ 1.5 × 10⁹ m (about the Earth's Hill sphere; beyond it an orbit is about the Sun). NaN and ±Infinity are refused. Circular orbit: the Earth's oblateness (J2) and an orbit's eccentricity are not included (eccentricityClockCorrection gives the periodic term of an eccentric orbit).",
    example: 'orbitClockRateOffset(26561.75 km)',
    exampleResult: '4.4647e-10 (a GPS clock: 10.23 MHz is set to 10.229 999 995 43 MHz, IS-GPS-200 §3.3.1.1)',
    source:
      'IS-GPS-200, §3.3.1.1; N. Ashby, "Relativity in the Global Positioning System", Living Reviews in Relativity 6 (2003) 1, §5; IAU 2000 Resolution B1.9 (L_G); IERS Conventions (2010), table 1.1 (GM_E).',
    numerics:
      'The three terms (7e-10, 5e-10 and 8e-11) are summed in double-double; the velocity term is −β²/(1 + 1/γ), which has no cancellation. Rounded once.',
  },
  kernel: (aArg: KernelArgument): number => {
    const a = requireFinite(FN, 'a', aArg as number);
    if (!(a >= R_EARTH))
      throw new DomainError(
        `${FN}: the orbit radius a is measured from the centre of the Earth and must be at least R_E = 6378.137 km; got a = ${a} m`,
      );
    if (!(a <= HILL_RADIUS))
      throw new DomainError(
        `${FN}: a = ${a} m is beyond the Earth's Hill sphere (about 1.5 million km): not an orbit about the Earth`,
      );
    // β² = GM/(a c²) on a circular orbit, the same number as the potential term.
    const potential = div(dd(GM_EARTH), mul(dd(a), C_SQUARED));
    const velocityTerm = neg(div(potential, add(ONE, sqrt(sub(ONE, potential)))));
    return round(add(sub(L_G_DD, potential), velocityTerm));
  },
};
