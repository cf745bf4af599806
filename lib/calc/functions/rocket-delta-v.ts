import { BELOW_ONE, requireFinite } from './support/domain';
import { add, div, dd, mul, round, scale, sqrt, twoSum } from './support/double-double';
import { expm1, log1p } from './support/elementary';
import { isPrecise, massiveResult, speedValue } from './support/kinematics';
import { type CalcFunction, DomainError, type KernelArgument, type PreciseSpeed } from './types';

function precise(veArg: KernelArgument, RArg: KernelArgument): PreciseSpeed | number {
  const veDD = isPrecise(veArg) ? veArg.beta : dd(veArg);
  const ve = requireFinite(FN, 've', round(veDD));
  const R = requireFinite(FN, 'R', RArg as number);
  if (!(ve >= 0 && ve <= 1)) {
    throw new DomainError(`${FN}: the exhaust speed must satisfy 0 ≤ β_e ≤ 1; got β_e = ${ve}`);
  }
  if (!(R >= 1)) {
    throw new DomainError(`${FN}: the mass ratio R = initial/final mass must be at least 1; got R = ${R}`);
  }
  if (ve === 0 || R === 1) return 0;
  const twiceRapidity = scale(mul(log1p(twoSum(R, -1)), veDD), 2);
  // Beyond 2η = 700, e^(2η) leaves the double range: β is returned as the largest double below 1
  // (beyond 2η = 40 it rounds there anyway), without a companion.
  if (twiceRapidity[0] > 700) return BELOW_ONE;
  const E = expm1(twiceRapidity);
  const E2 = add(E, dd(2));
  // Δβ = tanh η = E/(E + 2) and 1/γ = 1/cosh η = 2√(E + 1)/(E + 2), E = e^(2η) − 1: no subtraction.
  return massiveResult(div(E, E2), div(scale(sqrt(add(E, dd(1))), 2), E2));
}

const FN = 'rocketDeltaV';

/**
 * rocketDeltaV(ve, R) — the speed gained, from rest, by a rocket of exhaust speed ve (relative to the
 * rocket) whose mass drops by the ratio R = initial mass / final mass (the relativistic rocket
 * equation).
 *
 * Formula: Δβ = tanh(β_e ln R) = E/(E + 2) with E = expm1(2 β_e ln R) = R^{2β_e} − 1.
 *
 * Domain: 0 ≤ β_e ≤ 1 (β_e = 1 is a photon rocket: Δβ = (R² − 1)/(R² + 1)); R ≥ 1; NaN and
 * ±Infinity are refused. The result stays below c: when it rounds to c the largest double below 1 is
 * returned.
 *
 * Example: `rocketDeltaV(0.1, 10)` → 0.22627 (a plain β, as ve is one); `rocketDeltaV(0.1 c, 10)` →
 * 6.7835e7 m/s.
 *
 * Result: a plain β when ve is a plain number (β), otherwise a velocity in m/s.
 *
 * Source: J. Ackeret, "Zur Theorie der Raketen", Helvetica Physica Acta 19 (1946) 103; W. Rindler,
 * Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 6 (the relativistic rocket).
 *
 * Numerics: ln R = log1p(R − 1) with R − 1 exact, the product and expm1 in double-double, then
 * E/(E + 2), which does not cancel at small speeds as tanh's (e^x − e^−x) would; rounded once.
 */
export const rocketDeltaV: CalcFunction = {
  name: FN,
  params: [
    {
      name: 've',
      kind: 'speed',
      description: 'exhaust speed relative to the rocket (a velocity, or β); c for a photon rocket',
    },
    { name: 'R', kind: 'number', description: 'mass ratio: initial mass / final mass, ≥ 1' },
  ],
  returns: 'speed',
  doc: {
    summary: 'Speed gained from rest by a rocket of exhaust speed ve and mass ratio R (relativistic rocket equation).',
    formula: '\\Delta\\beta = \\tanh(\\beta_e \\ln R) = \\frac{E}{E+2},\\ E = R^{2\\beta_e} - 1',
    domain:
      '0 ≤ β_e ≤ 1 (1: a photon rocket, Δβ = (R² − 1)/(R² + 1)); R ≥ 1 (initial mass / final mass). NaN and ±Infinity are refused. The result stays below c: when it rounds to c the largest double below 1 is returned. The result is a plain β when ve is a plain number (β), as speeds read plain numbers; with ve a velocity it is a velocity.',
    example: 'rocketDeltaV(0.1, 10)',
    exampleResult: '0.22627 (a plain β, as ve is one; rocketDeltaV(0.1 c, 10) gives 6.7835e7 m/s)',
    source:
      'J. Ackeret, "Zur Theorie der Raketen", Helvetica Physica Acta 19 (1946) 103; W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 6.',
    numerics:
      'ln R = log1p(R − 1) with R − 1 formed exactly, times β_e, and expm1 of twice that, all in double-double (Taylor series and doublings that keep relative accuracy near 0); Δβ = E/(E + 2) has no subtraction. Rounded once (within about half an ulp).',
  },
  kernel: (ve: KernelArgument, R: KernelArgument): number => speedValue(precise(ve, R)),
  preciseKernel: precise,
};
