// Binds the relativistic library's numeric kernels to mathjs: converts each argument (a mathjs Unit
// or a plain number) to the SI number the kernel expects, checks its dimension, and wraps the
// kernel's result as a mathjs value with its unit.
import type { MathJsInstance, Unit } from 'mathjs';
import { C, E_CHARGE, M_U } from './constants';
import { withArgumentEcho } from './functions/support/domain';
import { speedValue } from './functions/support/kinematics';
import { formatNumberText } from './format';
import { unitLabel } from './unit-label';
import {
  DomainError,
  type CalcFunction,
  type KernelArgument,
  type ParamKind,
  type PreciseSpeed,
  type ReturnKind,
} from './functions/types';
import type { LibraryBinding } from './math-instance';

/** SI base unit of each physical kind, and the alternative dimension it accepts. */
const KIND_UNITS: Record<
  Exclude<ParamKind, 'number'>,
  {
    si: string;
    label: string;
    alt?: { si: string; label: string; toSi: (x: number) => number; written?: (unit: Unit) => boolean };
  }
> = {
  speed: { si: 'm/s', label: 'a speed' },
  mass: { si: 'kg', label: 'a mass', alt: { si: 'J', label: 'an energy (read as mc²)', toSi: (x) => x / (C * C) } },
  energy: { si: 'J', label: 'an energy' },
  momentum: {
    si: 'kg m/s',
    label: 'a momentum',
    alt: { si: 'J', label: 'an energy (read as pc)', toSi: (x) => x / C },
  },
  time: { si: 's', label: 'a time' },
  length: { si: 'm', label: 'a length' },
  acceleration: { si: 'm/s^2', label: 'an acceleration' },
  voltage: { si: 'V', label: 'a voltage' },
  charge: { si: 'C', label: 'a charge' },
  angle: { si: 'rad', label: 'an angle' },
  rigidity: { si: 'T m', label: 'a magnetic rigidity (T m)' },
  'gravitational-parameter': { si: 'm^3/s^2', label: 'a gravitational parameter GM (m³/s², e.g. GM_E)' },
  area: { si: 'm^2', label: 'an area' },
  'magnetic-field': { si: 'T', label: 'a magnetic flux density (T)' },
  // 430 MeV/u as the therapy trade writes it: per nucleon, so the energy per mass times one u (m_u).
  'energy-per-nucleon': {
    si: 'J',
    label: 'a kinetic energy per nucleon (an energy, e.g. 430 MeV)',
    // Only a unit written per u (or Da): 430 MeV/kg, or an m²/s² that happens to share the dimension, is refused.
    alt: {
      si: 'J/kg',
      label: 'an energy per nucleon written as MeV/u',
      toSi: (x) => x * M_U,
      written: (unit) => unit.units.some((u) => ['u', 'Da'].includes(u.unit.name) && u.power === -1),
    },
  },
};

const RETURN_UNITS: Record<
  Exclude<ReturnKind, 'number' | 'speed' | 'pair-time-length' | 'energy-per-nucleon'>,
  string
> = {
  energy: 'J',
  momentum: 'kg m/s',
  time: 's',
  length: 'm',
  acceleration: 'm/s^2',
  rigidity: 'T m',
  mass: 'kg',
  angle: 'rad',
  voltage: 'V',
  frequency: 'Hz',
  'interaction-constant': 'V^-1 m^-1',
};

class ArgumentError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ArgumentError';
  }
}

/** Which argument a message is about; written only for a message (toNumber runs on every call). */
function where(fn: CalcFunction, index: number): string {
  return `${fn.name}: argument ${index + 1} (${fn.params[index].name})`;
}

/**
 * A plain number given for a charge is a charge number (6 for C⁶⁺, −1 for an electron), so it must be
 * an integer. Euler's number (a sheet's bare `e`) is the likely slip for the elementary charge and is
 * named as such: before this check, `magneticRigidity(p, e)` was read as 2.718 elementary charges.
 */
function chargeNumber(argument: string, value: number): number {
  if (!Number.isFinite(value)) return value; // refused below as not finite
  if (value === Math.E) {
    throw new ArgumentError(
      `${argument}: \`e\` is Euler's number 2.718…; the elementary charge is \`q_e\` (or give the charge number, e.g. 1)`,
    );
  }
  if (!Number.isInteger(value)) {
    throw new ArgumentError(
      `${argument} must be a charge (e.g. 2 q_e, or in C) or an integer charge number (e.g. 6 for C⁶⁺, −1 for an electron); a charge number must be an integer, got the plain number ${value}`,
    );
  }
  return value;
}

/**
 * An argument as the sheet wrote it, for messages: a quantity in its own unit (−5 MeV, not
 * −8.01e-13 J), the number formatted as results are (lib/calc/format.ts), a plain number as is.
 */
function asWritten(value: unknown): string {
  if (typeof value === 'number') return String(value);
  const unit = value as Unit;
  if (value && typeof value === 'object' && typeof unit.formatUnits === 'function' && typeof unit.value === 'number') {
    const units = unit.formatUnits();
    try {
      const number = units ? unit.toNumber(units) : (unit.value as number);
      return `${formatNumberText(number, 12, { trailingZeros: false })}${units ? ` ${unitLabel(units)}` : ''}`;
    } catch {
      return describe(value);
    }
  }
  return describe(value);
}

function describe(value: unknown): string {
  if (typeof value === 'number') return String(value);
  if (value && typeof value === 'object' && 'toString' in value) return String(value);
  return typeof value;
}

export function bindLibrary(math: MathJsInstance, library: readonly CalcFunction[]): LibraryBinding[] {
  const reference = new Map<string, Unit>();
  const baseOf = (si: string): Unit => {
    let u = reference.get(si);
    if (!u) {
      u = math.unit(si);
      reference.set(si, u);
    }
    return u;
  };

  // The precise-speed companions (functions/types.ts, PreciseSpeed) of the speeds this binding has
  // returned, keyed by the very mathjs object returned, with the SI value it was returned with. The
  // same object passed back to a speed parameter (directly, or through a sheet's scope or cell cache,
  // which hold the object itself) reaches the kernel as its companion instead of the rounded β. Any
  // arithmetic on it (−v, 2v, v to km/s) makes a new object, which has no companion.
  const companions = new WeakMap<object, { si: number; speed: PreciseSpeed }>();
  const companionOf = (value: Unit): PreciseSpeed | null => {
    const entry = companions.get(value);
    return entry && entry.si === value.value ? entry.speed : null;
  };

  const toArgument = (fn: CalcFunction, index: number, value: unknown): KernelArgument => {
    if (fn.params[index].kind === 'speed' && math.isUnit(value)) {
      const speed = companionOf(value as Unit);
      if (speed) return speed;
    }
    return toNumber(fn, index, value);
  };

  const toNumber = (fn: CalcFunction, index: number, value: unknown): number => {
    const param = fn.params[index];
    if (typeof value === 'number') {
      if (param.kind === 'number' || param.kind === 'speed' || param.kind === 'angle') return value;
      if (param.kind === 'charge') return chargeNumber(where(fn, index), value) * E_CHARGE;
      throw new ArgumentError(
        `${where(fn, index)} must be ${KIND_UNITS[param.kind].label} with a unit; got the plain number ${value}`,
      );
    }
    if (math.isUnit(value)) {
      const unit = value as Unit;
      if (param.kind === 'number') {
        throw new ArgumentError(`${where(fn, index)} must be a plain number; got ${describe(unit)}`);
      }
      const spec = KIND_UNITS[param.kind];
      if (unit.value === null)
        throw new ArgumentError(`${where(fn, index)} needs a value, not the bare unit ${describe(unit)}`);
      // mathjs keeps a unit's value normalised to coherent SI units, so for these kinds (none has
      // an offset, as temperatures do) `value` is already the SI number.
      if (unit.equalBase(baseOf(spec.si))) {
        const si = unit.value as number;
        return param.kind === 'speed' ? si / C : si;
      }
      if (spec.alt && unit.equalBase(baseOf(spec.alt.si)) && (spec.alt.written?.(unit) ?? true))
        return spec.alt.toSi(unit.value as number);
      throw new ArgumentError(
        `${where(fn, index)} must be ${spec.label}${spec.alt ? ` or ${spec.alt.label}` : ''}${param.kind === 'speed' ? ' or a plain β' : ''}; got ${describe(unit)}`,
      );
    }
    throw new ArgumentError(
      `${where(fn, index)} must be ${param.kind === 'number' ? 'a number' : KIND_UNITS[param.kind].label}; got ${describe(value)}`,
    );
  };

  // Results are made by cloning a parsed template and setting its SI value: parsing the unit
  // string on every call costs more than the kernel itself.
  const templates = new Map<string, Unit>();
  const siUnit = (value: number, unit: string): Unit => {
    let t = templates.get(unit);
    if (!t) {
      t = math.unit(1, unit);
      templates.set(unit, t);
    }
    const u = t.clone();
    (u as unknown as { value: number }).value = value;
    return u;
  };
  const speedResult = (result: PreciseSpeed | number): Unit => {
    const beta = speedValue(result);
    const unit = siUnit(beta * C, 'm/s');
    if (typeof result !== 'number') companions.set(unit, { si: unit.value as number, speed: result });
    return unit;
  };

  const wrap = (fn: CalcFunction, result: number | [number, number]): unknown => {
    if (fn.returns === 'pair-time-length') {
      const [t, x] = result as [number, number];
      return math.matrix([siUnit(t, 's'), siUnit(x, 'm')]);
    }
    const r = result as number;
    if (fn.returns === 'number') return r;
    if (fn.returns === 'speed') return siUnit(r * C, 'm/s');
    // Per nucleon, shown as the trade writes it (MeV/u, one u per nucleon): an energy per mass, so it can
    // never be read, converted or added as a total kinetic energy.
    if (fn.returns === 'energy-per-nucleon') return siUnit(r / M_U, 'MeV/u');
    return siUnit(r, RETURN_UNITS[fn.returns]);
  };

  // A speed function whose speed arguments are all plain numbers (β) answers a plain β, as the
  // speed parameters read plain numbers: addVelocities(0.5, 0.5) is 0.8. With any velocity given,
  // or with no speed parameter at all (speedFromKinetic), the result is a velocity.
  const plainSpeeds = (fn: CalcFunction, args: unknown[]): boolean => {
    let any = false;
    for (const [i, p] of fn.params.entries()) {
      if (p.kind !== 'speed') continue;
      if (typeof args[i] !== 'number') return false;
      any = true;
    }
    return any;
  };

  // The last guard against a silent NaN or infinity: a kernel's result that is not finite (the
  // kernels refuse those themselves; tests/calc/library-extremes.test.ts surveys them) is refused here,
  // naming the function and its arguments.
  const finite = <R extends number | [number, number]>(fn: CalcFunction, args: unknown[], result: R): R => {
    const values = Array.isArray(result) ? result : [result];
    if (values.every((x) => typeof x === 'number' && Number.isFinite(x))) return result;
    throw new DomainError(
      `${fn.name}(${args.map(asWritten).join(', ')}): the result is not a finite number (${values.map(String).join(', ')}); the inputs are outside the range where it can be computed`,
    );
  };

  const names = new Map<CalcFunction, readonly string[]>();
  const paramNames = (fn: CalcFunction): readonly string[] => {
    let n = names.get(fn);
    if (!n) names.set(fn, (n = fn.params.map((p) => p.name)));
    return n;
  };

  const scalar = (fn: CalcFunction, args: unknown[]): unknown => {
    const numbers = args.map((a, i) => toArgument(fn, i, a));
    for (const [i, n] of numbers.entries()) {
      if (typeof n === 'number' && !Number.isFinite(n))
        throw new DomainError(`${fn.name}: argument ${i + 1} (${fn.params[i].name}) must be finite; got ${n}`);
    }
    // Domain messages echo an argument as the sheet wrote it (functions/support/domain.ts).
    const echo = {
      names: paramNames(fn),
      values: numbers.map((n) => (typeof n === 'number' ? n : speedValue(n))),
      text: (i: number) => asWritten(args[i]),
    };
    return withArgumentEcho(echo, () => call(fn, args, numbers));
  };

  const call = (fn: CalcFunction, args: unknown[], numbers: KernelArgument[]): unknown => {
    if (fn.returns === 'speed' && plainSpeeds(fn, args)) return finite(fn, args, fn.kernel(...numbers));
    if (fn.returns === 'speed' && fn.preciseKernel) {
      const precise = fn.preciseKernel(...numbers);
      finite(fn, args, speedValue(precise));
      return speedResult(precise);
    }
    return wrap(fn, finite(fn, args, fn.kernel(...numbers)));
  };

  // A vector argument (a column of an input table, or [a, b, c]) applies the function to each
  // element; several vectors must have the same length, and plain values are used for every element.
  const elementwise = (fn: CalcFunction, args: unknown[]): unknown => {
    // valueOf() gives a matrix's own elements (toArray() would clone them and lose their companions).
    const lists = args.map((a) =>
      math.isMatrix(a) ? (a as { valueOf(): unknown[] }).valueOf() : Array.isArray(a) ? a : null,
    );
    let length = -1;
    for (const [i, list] of lists.entries()) {
      if (!list) continue;
      if (list.some((x) => Array.isArray(x) || math.isMatrix(x))) {
        throw new ArgumentError(
          `${fn.name}: argument ${i + 1} (${fn.params[i].name}) must be a value or a list of values, not a table of several dimensions`,
        );
      }
      if (length >= 0 && list.length !== length) {
        throw new ArgumentError(`${fn.name}: the lists given have different lengths (${length} and ${list.length})`);
      }
      length = list.length;
    }
    const out: unknown[] = [];
    for (let k = 0; k < length; k++) {
      try {
        out.push(
          scalar(
            fn,
            args.map((a, i) => (lists[i] ? lists[i]![k] : a)),
          ),
        );
      } catch (error) {
        if (error instanceof Error) error.message = `${error.message} (element ${k + 1})`;
        throw error;
      }
    }
    return math.matrix(out as never[]);
  };

  return library.map((fn) => ({
    name: fn.name,
    fn: (...args: unknown[]) => {
      if (args.length !== fn.params.length) {
        throw new ArgumentError(
          `${fn.name} takes ${fn.params.length} argument${fn.params.length === 1 ? '' : 's'} (${fn.params.map((p) => p.name).join(', ')}); got ${args.length}`,
        );
      }
      if (args.some((a) => Array.isArray(a) || math.isMatrix(a))) return elementwise(fn, args);
      return scalar(fn, args);
    },
  }));
}

const numericBases = new WeakMap<MathJsInstance, Map<string, Unit>>();

/**
 * A library function on SI numbers, for the statements a propagation re-evaluates (numeric-chain.ts):
 * given the arguments at the sheet's values (which fix each argument's kind and dimension), a function
 * of the arguments' SI numbers that gives the SI value of what the bound function returns, with the
 * same kernel on the same doubles (so the same bits), without making a mathjs Unit. It throws where
 * the bound function throws (a message without the argument echo: a draw's message is not shown).
 * Null where the arguments or the result are of a form it does not take (a list, a pair, a unit of
 * neither the kind's dimension nor its alternative's).
 */
export function numericLibraryCall(
  math: MathJsInstance,
  fn: CalcFunction,
  nominal: readonly unknown[],
): ((args: readonly number[]) => number) | null {
  if (fn.returns === 'pair-time-length' || nominal.length !== fn.params.length) return null;
  let bases = numericBases.get(math);
  if (!bases) numericBases.set(math, (bases = new Map()));
  const baseOf = (si: string): Unit => {
    let u = bases!.get(si);
    if (!u) bases!.set(si, (u = math.unit(si)));
    return u;
  };
  // Each argument's conversion to the kernel's number, by a letter: n a plain number (or a plain
  // β, P), q a charge number, u a unit of the kind's SI dimension (s for a speed: ÷ c), a the kind's
  // alternative. The function on SI numbers depends on nothing else, so it is made once per letters.
  let letters = '';
  for (let i = 0; i < fn.params.length; i++) {
    const param = fn.params[i];
    const value = nominal[i];
    if (typeof value === 'number') {
      if (param.kind === 'speed') letters += 'P';
      else if (param.kind === 'number' || param.kind === 'angle') letters += 'n';
      else if (param.kind === 'charge') letters += 'q';
      else return null;
      continue;
    }
    if (!math.isUnit(value) || param.kind === 'number') return null;
    const unit = value as Unit;
    if (typeof unit.value !== 'number') return null;
    const spec = KIND_UNITS[param.kind];
    if (unit.equalBase(baseOf(spec.si))) letters += param.kind === 'speed' ? 's' : 'u';
    else if (spec.alt && unit.equalBase(baseOf(spec.alt.si)) && (spec.alt.written?.(unit) ?? true)) letters += 'a';
    else return null;
  }
  let made = numericCalls.get(fn);
  if (!made) numericCalls.set(fn, (made = new Map()));
  let call = made.get(letters);
  if (!call) made.set(letters, (call = numericCallOf(fn, letters)));
  return call;
}

/** Library functions on SI numbers, made by numericCallOf, by the conversion letters of their arguments. */
const numericCalls = new WeakMap<CalcFunction, Map<string, (args: readonly number[]) => number>>();

function numericCallOf(fn: CalcFunction, letters: string): (args: readonly number[]) => number {
  const identity = (x: number) => x;
  const convert: Array<(x: number) => number> = [];
  let speeds = 0;
  let plainSpeeds = 0;
  for (let i = 0; i < letters.length; i++) {
    const letter = letters[i];
    if (fn.params[i].kind === 'speed') speeds++;
    if (letter === 'P') plainSpeeds++;
    if (letter === 'q') convert.push((x) => chargeNumber(where(fn, i), x) * E_CHARGE);
    else if (letter === 's') convert.push((x) => x / C);
    else if (letter === 'a') {
      const kind = fn.params[i].kind;
      if (kind === 'number') throw new Error(`${fn.name}: a plain number has no alternative unit`);
      convert.push(KIND_UNITS[kind].alt!.toSi);
    } else convert.push(identity);
  }
  const n = convert.length;
  const numbers = new Array<number>(n);
  const argumentsOf = (args: readonly number[]): number[] => {
    for (let i = 0; i < n; i++) {
      const x = convert[i](args[i]);
      if (!Number.isFinite(x))
        throw new DomainError(`${fn.name}: argument ${i + 1} (${fn.params[i].name}) must be finite; got ${x}`);
      numbers[i] = x;
    }
    return numbers;
  };
  const finiteOf = (x: number): number => {
    if (typeof x === 'number' && Number.isFinite(x)) return x;
    throw new DomainError(`${fn.name}: the result is not a finite number (${String(x)})`);
  };
  const kernel = fn.kernel as (...args: number[]) => number;
  // As `call` above: all speed arguments plain numbers → a plain β; a precise speed → β·c; else `wrap`'s SI value.
  if (fn.returns === 'speed' && speeds > 0 && plainSpeeds === speeds)
    return (args) => finiteOf(kernel(...argumentsOf(args)));
  if (fn.returns === 'speed' && fn.preciseKernel) {
    const precise = fn.preciseKernel as (...args: number[]) => PreciseSpeed | number;
    return (args) => finiteOf(speedValue(precise(...argumentsOf(args)))) * C;
  }
  if (fn.returns === 'number') return (args) => finiteOf(kernel(...argumentsOf(args)));
  if (fn.returns === 'speed') return (args) => finiteOf(kernel(...argumentsOf(args))) * C;
  if (fn.returns === 'energy-per-nucleon') return (args) => finiteOf(kernel(...argumentsOf(args))) / M_U;
  return (args) => finiteOf(kernel(...argumentsOf(args)));
}
