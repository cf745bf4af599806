// Kinetic energy per nucleon (the ion-beam trade's MeV/u): T = A·(T/A) with A the mass number, and the
// checks shared by the per-nucleon functions. A is an integer below 2^9, so A·(T/A) is an exact
// (Dekker) product: the kinematics of gammaFromKinetic, momentumFromKinetic, speedFromKinetic and
// kineticFromMomentum then run on it unchanged (support/kinematics.ts).
import { M_U } from '../../constants';
import { DomainError } from '../types';
import { requireFinite, requireNonNegative, requirePositive } from './domain';
import { type DD, dd, div, twoProd } from './double-double';

/** Largest mass number accepted (no known nuclide reaches 300). */
const A_MAX = 300;

/** A: the mass number, an integer 1 … 300. */
export function requireMassNumber(fn: string, A: number): number {
  requireFinite(fn, 'A', A);
  if (!Number.isInteger(A) || A < 1 || A > A_MAX) {
    throw new DomainError(
      `${fn}: A is the mass number (nucleons in the nucleus, 12 for ¹²C), an integer from 1 to ${A_MAX}; got A = ${A}`,
    );
  }
  return A;
}

/**
 * The ion's mass m > 0, checked against its mass number: every nucleus (and every ion or atom) has
 * between 0.99 and 1.02 u per nucleon (⁵⁶Fe 0.9991 u, ¹H 1.0078 u), so a mass outside that range
 * means the arguments are swapped or the mass is not this ion's (e.g. A = 6 for carbon, the charge).
 */
export function requireIonMass(fn: string, m: number, A: number): number {
  requirePositive(fn, 'm', m, 'kg', 'the rest mass of the ion');
  const perNucleon = m / (A * M_U);
  if (!(perNucleon >= 0.99 && perNucleon <= 1.02)) {
    throw new DomainError(
      `${fn}: m = ${m} kg is ${(m / M_U).toPrecision(6)} u, not the mass of an ion of A = ${A} nucleons (about ${A} u): are A (the mass number) and m (the ion's mass) in their places?`,
    );
  }
  return m;
}

/** T = A·(T/A), exact, for a kinetic energy per nucleon T/A ≥ 0. */
export function totalKinetic(fn: string, Tn: number, A: number): DD {
  requireNonNegative(fn, 'Tn', Tn, 'J', 'a kinetic energy per nucleon');
  return twoProd(A, Tn);
}

/** T/A from the total kinetic energy. */
export function perNucleon(T: DD, A: number): DD {
  return div(T, dd(A));
}
