// Domain checks shared by the kernels. Every message names the function, the parameter and the
// offending value (in the SI unit the kernel received), so a sheet author can act on it.
import { DomainError } from '../types';

/**
 * How far (as a fraction of the value) an energy may fall short of a bound it must reach, such as
 * E ≥ mc² or E ≥ pc, and still be read as equal to it: 2^-50, about four ulp. An energy entered as
 * m·c² or p·c in a sheet is rounded, and may land an ulp below the exact product the kernel forms.
 */
export const ROUNDING_ALLOWANCE = 2 ** -50;

/** The largest double below 1: what a speed that is below c but rounds to c is returned as. */
export const BELOW_ONE = 1 - 2 ** -53;

export function requireFinite(fn: string, name: string, x: number): number {
  if (typeof x !== 'number' || !Number.isFinite(x)) {
    throw new DomainError(`${fn}: ${name} must be a finite number; got ${String(x)}`);
  }
  return x;
}

/** A massive body's speed as β: finite and |β| < 1. */
export function requireMassiveSpeed(fn: string, name: string, beta: number): number {
  requireFinite(fn, name, beta);
  if (!(Math.abs(beta) < 1)) {
    const which = name === 'v' ? '|β|' : `|β| of ${name}`;
    const written = asWritten(name, beta);
    throw new DomainError(
      `${fn}: ${which} must be below 1 for a massive body; got β = ${beta}${written && written !== String(beta) ? ` (${name} = ${written})` : ''}`,
    );
  }
  return beta;
}

/**
 * The arguments of the call in progress as the sheet wrote them, set by the adapter around a kernel
 * call (kernels are synchronous, so one slot suffices): a message about a parameter whose value is
 * the argument itself then echoes it in the sheet's units ("got −5 MeV") rather than as the SI number
 * the kernel received ("got T = -8.010883169999999e-13 J"). Called directly (tests, benchmarks), a
 * kernel has no echo and shows the SI value.
 */
export interface ArgumentEcho {
  /** Parameter names, in order. */
  readonly names: readonly string[];
  /** The values the kernel received, in order (to tell the argument from a value derived from it). */
  readonly values: readonly unknown[];
  /** The argument at `index` as written (a unit in the sheet's own unit, or a plain number). */
  text(index: number): string;
}

let echo: ArgumentEcho | null = null;

export function withArgumentEcho<T>(current: ArgumentEcho, run: () => T): T {
  const previous = echo;
  echo = current;
  try {
    return run();
  } finally {
    echo = previous;
  }
}

/** The argument `name` as written, when `x` is that argument's own value. */
function asWritten(name: string, x: number): string | null {
  if (!echo) return null;
  const index = echo.names.indexOf(name);
  if (index < 0 || echo.values[index] !== x) return null;
  return echo.text(index);
}

function show(name: string, x: number, unit: string): string {
  return asWritten(name, x) ?? `${name} = ${x}${unit ? ` ${unit}` : ''}`;
}

export function requirePositive(fn: string, name: string, x: number, unit: string, why = ''): number {
  requireFinite(fn, name, x);
  if (!(x > 0)) {
    throw new DomainError(`${fn}: ${name} must be > 0${why ? ` (${why})` : ''}; got ${show(name, x, unit)}`);
  }
  return x;
}

export function requireNonNegative(fn: string, name: string, x: number, unit: string, why = ''): number {
  requireFinite(fn, name, x);
  if (!(x >= 0)) {
    throw new DomainError(`${fn}: ${name} must be ≥ 0${why ? ` (${why})` : ''}; got ${show(name, x, unit)}`);
  }
  return x;
}

/** A result that left the double range is refused rather than returned as ±Infinity or NaN. */
export function finiteResult(fn: string, x: number): number {
  if (!Number.isFinite(x)) {
    throw new DomainError(
      `${fn}: the result is outside the range of double-precision numbers (got ${x}); rescale the inputs`,
    );
  }
  return x;
}

/** β for a speed that is exactly below 1 in magnitude but may have rounded to ±1. */
export function keepBelowLight(beta: number): number {
  if (beta >= 1) return BELOW_ONE;
  if (beta <= -1) return -BELOW_ONE;
  return beta;
}
