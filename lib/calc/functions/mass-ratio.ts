import { requireFinite } from './support/domain';
import { div, dd, round } from './support/double-double';
import { atanh, exp } from './support/elementary';
import { betaOf } from './support/kinematics';
import { type CalcFunction, DomainError, type KernelArgument } from './types';

const FN = 'massRatio';

/**
 * massRatio(dv, ve) — the mass ratio R = initial mass / final mass a rocket of exhaust speed ve
 * (relative to the rocket) needs to gain the speed dv from rest: the inverse of rocketDeltaV.
 *
 * Formula: R = exp(atanh(Δβ)/β_e) = ((1 + Δβ)/(1 − Δβ))^(1/(2β_e)); the classical
 * R = exp(Δv/v_e) at low speed; R = √((1 + Δβ)/(1 − Δβ)) for a photon rocket (β_e = 1).
 *
 * Domain: 0 ≤ Δβ < 1; 0 < β_e ≤ 1; a ratio beyond the double range (about 1.8e308) is refused;
 * NaN and ±Infinity are refused.
 *
 * Example: `massRatio(0.8 c, c)` → 3 (a photon rocket reaching 0.8 c).
 *
 * Source: J. Ackeret, "Zur Theorie der Raketen", Helvetica Physica Acta 19 (1946) 103; W. Rindler,
 * Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 6 (the relativistic rocket).
 *
 * Numerics: atanh(Δβ) as ½ log1p(2Δβ/(1 − Δβ)) (a series near 0) in double-double, divided by
 * β_e and exponentiated in double-double; rounded once. A velocity argument from rocketDeltaV's
 * result reaches it with its precise-speed companion, so massRatio(rocketDeltaV(ve, R), ve) gives R
 * back to the last digits.
 */
export const massRatio: CalcFunction = {
  name: FN,
  params: [
    { name: 'dv', kind: 'speed', description: 'speed to be gained from rest (a velocity, or β)' },
    {
      name: 've',
      kind: 'speed',
      description: 'exhaust speed relative to the rocket (a velocity, or β); c for a photon rocket',
    },
  ],
  returns: 'number',
  doc: {
    summary:
      'Mass ratio (initial / final mass) a rocket of exhaust speed ve needs to gain dv from rest: the inverse of rocketDeltaV.',
    formula:
      'R = \\exp\\!\\left(\\frac{\\operatorname{artanh}\\Delta\\beta}{\\beta_e}\\right) = \\left(\\frac{1+\\Delta\\beta}{1-\\Delta\\beta}\\right)^{1/(2\\beta_e)}',
    domain:
      '0 ≤ Δβ < 1; 0 < β_e ≤ 1 (1: a photon rocket). A ratio beyond about 1.8e308 is refused. NaN and ±Infinity are refused.',
    example: 'massRatio(0.8 c, c)',
    exampleResult: '3 (a photon rocket reaching 0.8 c: √((1 + 0.8)/(1 − 0.8)))',
    source:
      'J. Ackeret, "Zur Theorie der Raketen", Helvetica Physica Acta 19 (1946) 103; W. Rindler, Relativity: Special, General, and Cosmological, 2nd ed. (2006), ch. 6.',
    numerics:
      'artanh Δβ = ½ log1p(2Δβ/(1 − Δβ)) with 1 − Δβ exact (a series near 0), divided by β_e and exponentiated, all in double-double; rounded once.',
  },
  kernel: (dvArg: KernelArgument, veArg: KernelArgument): number => {
    const dv = requireFinite(FN, 'dv', betaOf(dvArg));
    const ve = requireFinite(FN, 've', betaOf(veArg));
    if (!(dv >= 0 && dv < 1)) throw new DomainError(`${FN}: the speed to gain must satisfy 0 ≤ Δβ < 1; got Δβ = ${dv}`);
    if (!(ve > 0 && ve <= 1))
      throw new DomainError(`${FN}: the exhaust speed must satisfy 0 < β_e ≤ 1; got β_e = ${ve}`);
    const exponent = div(atanh(dv), dd(ve));
    if (exponent[0] > 709.78)
      throw new DomainError(
        `${FN}: the mass ratio exceeds the largest number (about 1.8e308): ln R = ${exponent[0].toPrecision(4)}`,
      );
    return round(exp(exponent));
  },
};
