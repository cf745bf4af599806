import { finiteResult, requireNonNegative, ROUNDING_ALLOWANCE } from './support/domain';
import { add, div, dd, mul, mulNum, round, sqrt, sub } from './support/double-double';
import { C_SQUARED } from './support/kinematics';
import { C } from '../constants';
import { type CalcFunction, DomainError } from './types';

const FN = 'invariantMass';

/**
 * invariantMass(E, p) — the invariant (rest) mass of a particle or system of total energy E and total
 * momentum magnitude p.
 *
 * Formula: m = √(E − pc)·√(E + pc)/c²; textbook m = √(E² − p²c²)/c².
 *
 * Domain: E ≥ 0, p ≥ 0 and E ≥ pc (a time-like or light-like four-momentum). A shortfall of E below
 * pc smaller than 2^-50·E (four ulp) is taken as rounding in the inputs of a massless system and
 * gives 0; a larger one is refused, as are NaN and ±Infinity.
 *
 * Example: `invariantMass(10 GeV, 9.9 GeV)` → 2.5148e-27 kg (1.41067 GeV/c² = √(10² − 9.9²) GeV/c²).
 *
 * Source: Particle Data Group, Review of Particle Physics (2024), review "Kinematics"
 * (E² = p²c² + m²c⁴).
 *
 * Numerics: E − pc and E + pc are formed in double-double (pc by Dekker's exact product), so the
 * cancellation of E² − p²c² in a highly relativistic system costs nothing; the two square roots keep
 * intermediates in range; rounded once.
 */
export const invariantMass: CalcFunction = {
  name: FN,
  params: [
    { name: 'E', kind: 'energy', description: 'total energy (rest energy included)' },
    { name: 'p', kind: 'momentum', description: 'magnitude of the total momentum (a momentum, or pc as an energy)' },
  ],
  returns: 'mass',
  doc: {
    summary: 'Invariant mass of a particle or system of total energy E and total momentum p.',
    formula:
      'm = \\frac{\\sqrt{E - pc}\\,\\sqrt{E + pc}}{c^2} \\quad\\left(= \\frac{\\sqrt{E^2 - p^2c^2}}{c^2}\\right)',
    domain:
      'E ≥ 0, p ≥ 0 and E ≥ pc. A shortfall of E below pc of less than 2^-50·E (about four ulp) is taken as rounding in the inputs of a massless system and gives 0; a larger one is refused (space-like), as are NaN and ±Infinity.',
    example: 'invariantMass(10 GeV, 9.9 GeV)',
    exampleResult: '2.5148e-27 kg (1.41067 GeV/c²)',
    source: 'Particle Data Group, Review of Particle Physics (2024), review "Kinematics" (E² = p²c² + m²c⁴).',
    numerics:
      'E − pc and E + pc are formed in double-double with pc an exact (Dekker) product, so the cancellation of E² − p²c² in a fast system costs no digit; √(E − pc)·√(E + pc) keeps intermediates in range; divided by the exact c² and rounded once (within about half an ulp).',
  },
  kernel: (E: number, p: number): number => {
    requireNonNegative(FN, 'E', E, 'J', 'a total energy');
    requireNonNegative(FN, 'p', p, 'kg m/s', 'a momentum magnitude');
    const pc = mulNum(dd(p), C);
    const deficit = sub(dd(E), pc);
    if (deficit[0] < 0) {
      if (-deficit[0] <= ROUNDING_ALLOWANCE * E) return 0;
      throw new DomainError(
        `${FN}: the energy must be at least pc (a space-like four-momentum has no mass); got E = ${E} J, pc = ${round(pc)} J`,
      );
    }
    return finiteResult(FN, round(div(mul(sqrt(deficit), sqrt(add(dd(E), pc))), C_SQUARED)));
  },
};
