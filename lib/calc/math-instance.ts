// The engine's own mathjs instance: units and constants corrected to the SI 2019 and CODATA 2022
// values, the relativistic library registered, and every function that reaches outside a sheet
// disabled for sheet code (mathjs security documentation: import, createUnit, reviver, evaluate,
// parse, simplify, derivative, resolve; also config, compile, parser, help and the rest listed
// below). The engine keeps private references to parse for its own use.
import { all, create, type MathJsInstance, type MathNode, type Unit } from 'mathjs';
import { C, CONSTANTS, E_CHARGE, M_E, M_N, M_P, M_U } from './constants';

export interface EngineMath {
  math: MathJsInstance;
  /** mathjs's parser, kept before it is disabled for sheet code. */
  parse: (expr: string) => MathNode;
  /** Built-in constants of the product brief, as mathjs values (a plain number when dimensionless). */
  constants: ReadonlyMap<string, Unit | number>;
  /** Names a sheet may call as functions (mathjs functions and the relativistic library). */
  isFunctionName: (name: string) => boolean;
  /** True when `name` is a unit, with or without an SI prefix (m, mm, MeV, T, t, h …). */
  isUnitName: (name: string) => boolean;
  /** True for mathjs's own named values: pi, e, i, Infinity, NaN, true, false, null, phi, tau … */
  isMathConstant: (name: string) => boolean;
}

/**
 * Physical constants that mathjs carries at CODATA 2018 values, corrected to CODATA 2022 (masses)
 * or to their SI 2019 exact values. Each entry: mathjs name, value, unit, source.
 */
const MATHJS_CONSTANT_CORRECTIONS: ReadonlyArray<{ name: string; value: number; unit: string; source: string }> = [
  { name: 'electronMass', value: M_E, unit: 'kg', source: 'CODATA 2022' },
  { name: 'protonMass', value: M_P, unit: 'kg', source: 'CODATA 2022' },
  { name: 'neutronMass', value: M_N, unit: 'kg', source: 'CODATA 2022' },
  { name: 'atomicMass', value: M_U, unit: 'kg', source: 'CODATA 2022' },
  // CODATA 2022: ε0 = 8.854 187 8188(14) e-12 F/m; μ0 = 1.256 637 061 27(20) e-6 N/A²; α = 7.297 352 5643(11) e-3
  { name: 'electricConstant', value: 8.8541878188e-12, unit: 'F/m', source: 'CODATA 2022' },
  { name: 'magneticConstant', value: 1.25663706127e-6, unit: 'N/A^2', source: 'CODATA 2022' },
  { name: 'fineStructure', value: 7.2973525643e-3, unit: '', source: 'CODATA 2022' },
];

/**
 * Units whose mathjs definition is not at the current value, and units the trade needs that
 * mathjs lacks. Values in SI base or derived units.
 */
const UNIT_CORRECTIONS: ReadonlyArray<{ name: string; value: number; unit: string; source: string }> = [
  // mathjs 15 builds the electronvolt from e = 1.602176565e-19 C (CODATA 2010).
  {
    name: 'eV',
    value: E_CHARGE,
    unit: 'J',
    source: 'SI Brochure 9th ed., table 8: 1 eV = 1.602 176 634 × 10⁻¹⁹ J exactly',
  },
  { name: 'electronvolt', value: E_CHARGE, unit: 'J', source: 'SI Brochure 9th ed., table 8' },
  // 1 Torr = 101 325/760 Pa by definition; mathjs rounds it to 133.322 Pa.
  {
    name: 'torr',
    value: 101_325 / 760,
    unit: 'Pa',
    source: 'definition of the torr (1/760 of a standard atmosphere, 101 325 Pa)',
  },
];

const NEW_UNITS: ReadonlyArray<{
  name: string;
  definition: string;
  aliases?: string[];
  prefixes?: 'short' | 'long';
  source: string;
}> = [
  {
    name: 'Da',
    definition: `${M_U} kg`,
    aliases: ['dalton'],
    prefixes: 'short',
    source: 'SI Brochure 9th ed., table 8 (dalton = atomic mass constant, CODATA 2022 value)',
  },
  { name: 'au', definition: '149597870700 m', aliases: ['astronomicalunit'], source: 'IAU 2012 Resolution B2 (exact)' },
  {
    name: 'ly',
    definition: `${C * 365.25 * 86400} m`,
    aliases: ['lightyear'],
    source: 'IAU: c × Julian year (365.25 d)',
  },
  {
    name: 'pc',
    definition: `${(149597870700 * 648000) / Math.PI} m`,
    aliases: ['parsec'],
    prefixes: 'short',
    source: 'IAU 2015 Resolution B2: 648 000/π au',
  },
  // The trade's units (lib/calc/README.md, "Units and the display setting").
  {
    name: 'u',
    definition: `${M_U} kg`,
    source:
      'SI Brochure 9th ed., table 8: the unified atomic mass unit u = 1 Da = m_u (CODATA 2022 value); u and a are units only where a sheet does not define them',
  },
  { name: 'yr', definition: `${365.25 * 86400} s`, source: 'IAU: the Julian year, 365.25 d of 86 400 s' },
  {
    name: 'a',
    definition: `${365.25 * 86400} s`,
    source: 'IAU: the Julian year (annum), 365.25 d; mathjs has no are, so `a` is free',
  },
  { name: 'ppm', definition: '1e-6', source: 'parts per million, 10⁻⁶ (dimensionless; common practice)' },
  { name: 'ppb', definition: '1e-9', source: 'parts per billion, 10⁻⁹ (dimensionless; common practice)' },
  // The speed of light as a unit, only so that MeV/c and MeV/c² (momentum and mass, PDG RPP
  // conventions) can be written after a number, after `to` and in number(x, "MeV/c"), and read back
  // from a result's unit string. A bare `c` is still the constant (isUnitName says no).
  { name: 'c', definition: `${C} m/s`, source: 'SI 2019: c = 299 792 458 m/s exactly' },
];

/** Names that are units only in unit positions: a bare `c` in a formula is the constant. */
const UNIT_POSITION_ONLY = new Set(['c']);

/** Functions sheet code must never reach (mathjs security documentation, and more). */
const DISABLED_FUNCTIONS = [
  'import',
  'createUnit',
  'reviver',
  'replacer',
  'evaluate',
  'parse',
  'compile',
  'parser',
  'simplify',
  'simplifyConstant',
  'simplifyCore',
  'rationalize',
  'derivative',
  'resolve',
  'leafCount',
  'symbolicEqual',
  'config',
  'help',
  'chain',
  'print',
] as const;

/**
 * Names refused where a sheet mentions them, before evaluation: mathjs needs them internally, so
 * they cannot be replaced in the instance itself.
 */
export const REFUSED_NAMES = new Set<string>([
  ...DISABLED_FUNCTIONS,
  'typed',
  'format',
  'Unit',
  'expression',
  'json',
  'Node',
  'Parser',
  'on',
  'off',
  'once',
  'emit',
  'factory',
  'create',
]);

/** Named values of mathjs that stay available and cannot be redefined. */
const MATH_CONSTANTS = new Set([
  'pi',
  'PI',
  'e',
  'E',
  'i',
  'Infinity',
  'NaN',
  'true',
  'false',
  'null',
  'undefined',
  'phi',
  'tau',
  'LN2',
  'LN10',
  'LOG2E',
  'LOG10E',
  'SQRT1_2',
  'SQRT2',
  'version',
]);

export interface LibraryBinding {
  name: string;
  fn: (...args: unknown[]) => unknown;
}

export function createEngineMath(
  library: readonly LibraryBinding[],
  setup?: (math: MathJsInstance) => void,
): EngineMath {
  const math = create(all, { number: 'number', precision: 64 }) as MathJsInstance;
  const parse = math.parse.bind(math) as (expr: string) => MathNode;

  const units = (math.Unit as unknown as { UNITS: Record<string, { value: number }> }).UNITS;
  for (const u of UNIT_CORRECTIONS) {
    if (!units[u.name]) throw new Error(`mathjs has no unit ${u.name} to correct`);
    units[u.name].value = math.unit(u.value, u.unit).value as number;
  }
  for (const u of NEW_UNITS) {
    math.createUnit(
      u.name,
      { definition: u.definition, aliases: u.aliases ?? [], prefixes: u.prefixes ?? 'none' },
      { override: false },
    );
  }
  // Derived units are written in the SI's own (J, N, T·m …), never in whichever unit of that
  // dimension mathjs last parsed (its default "auto" system changes with every unit it reads, so a
  // result's display depended on what the worker had evaluated before).
  (math.Unit as unknown as { setUnitSystem(name: string): void }).setUnitSystem('si');
  installUnitRules(math);

  const corrections: Record<string, unknown> = {};
  for (const k of MATHJS_CONSTANT_CORRECTIONS) corrections[k.name] = k.unit ? math.unit(k.value, k.unit) : k.value;
  math.import(corrections, { override: true });

  const libraryFns: Record<string, unknown> = {};
  for (const f of library) libraryFns[f.name] = f.fn;
  math.import(libraryFns, { override: false });

  const constants = new Map<string, Unit | number>();
  for (const k of CONSTANTS) constants.set(k.name, k.unit === '' ? k.value : math.unit(k.value, k.unit));

  setup?.(math);

  const disabled: Record<string, unknown> = {};
  for (const name of DISABLED_FUNCTIONS) {
    disabled[name] = () => {
      throw new Error(`The function ${name} is not available in calculation sheets.`);
    };
  }
  math.import(disabled, { override: true });
  rememberUnitNames(math);

  const mathRecord = math as unknown as Record<string, unknown>;
  const libraryNames = new Set(library.map((f) => f.name));
  // mathjs's own lookup is memoised through a costly hasher; names repeat, so keep the answers here.
  const unitNames = new Map<string, boolean>();
  return {
    math,
    parse,
    constants,
    isFunctionName: (name) =>
      libraryNames.has(name) ||
      (Object.prototype.hasOwnProperty.call(mathRecord, name) && typeof mathRecord[name] === 'function'),
    isUnitName: (name) => {
      // No mathjs unit or prefix holds an underscore, and most sheet names do (T_kin, m_p): answer
      // those at once, since mathjs's lookup of an unknown name tries every unit in turn.
      if (name.includes('_') || UNIT_POSITION_ONLY.has(name)) return false;
      let known = unitNames.get(name);
      if (known === undefined) {
        known = (math.Unit as unknown as { isValuelessUnit(n: string): boolean }).isValuelessUnit(name);
        if (unitNames.size < 100_000) unitNames.set(name, known);
      }
      return known;
    },
    isMathConstant: (name) =>
      MATH_CONSTANTS.has(name) ||
      (Object.prototype.hasOwnProperty.call(mathRecord, name) && typeof mathRecord[name] !== 'function'),
  };
}

/** Answers of `Unit.isValuelessUnit` kept per instance; beyond this many names, asked again each time. */
const REMEMBERED_UNIT_NAMES = 100_000;

/**
 * mathjs asks `Unit.isValuelessUnit` of every name it compiles that is not one of its own (SymbolNode),
 * and answers from a memo of only 100 names: for a name that is no unit it then tries every unit and
 * prefix in turn. A sheet uses thousands of names (T_1 … T_2000), so nearly every compilation of a
 * statement missed that memo. mathjs finds a unit only as a key of its unit table or as one of a
 * unit's prefixes followed by such a key, so a name holding a character found in no key and no prefix
 * (the underscore of T_1, for one) is no unit: answered at once. Other answers are kept per name. Both
 * depend only on the unit table, which changes only through createUnit and deleteUnit (mathjs clears
 * its memo there, and so does this); sheet code cannot call either (disabled above).
 */
function rememberUnitNames(math: MathJsInstance): void {
  const unit = math.Unit as unknown as Record<string, (...args: unknown[]) => unknown> & {
    UNITS: Record<string, { prefixes: Record<string, unknown> }>;
  };
  const ask = unit.isValuelessUnit.bind(unit) as (name: string) => boolean;
  const known = new Map<string, boolean>();
  /** Every character of a unit's name or of one of its prefixes; null until asked after a change. */
  let characters: Set<string> | null = null;
  const charactersOfUnits = (): Set<string> => {
    const all = new Set<string>();
    for (const key of Object.keys(unit.UNITS)) {
      for (const ch of key) all.add(ch);
      for (const prefix of Object.keys(unit.UNITS[key].prefixes ?? {})) for (const ch of prefix) all.add(ch);
    }
    return all;
  };
  unit.isValuelessUnit = (name: unknown): boolean => {
    if (typeof name !== 'string') return ask(name as string);
    let answer = known.get(name);
    if (answer !== undefined) return answer;
    characters ??= charactersOfUnits();
    for (const ch of name) {
      if (!characters.has(ch)) return false;
    }
    answer = ask(name);
    if (known.size < REMEMBERED_UNIT_NAMES) known.set(name, answer);
    return answer;
  };
  for (const change of ['createUnit', 'createUnitSingle', 'deleteUnit']) {
    const original = unit[change].bind(unit);
    unit[change] = (...args: unknown[]): unknown => {
      known.clear();
      characters = null;
      try {
        return original(...args);
      } finally {
        known.clear();
        characters = null;
      }
    };
  }
}

interface UnitInternals {
  value: number | null;
  units: Array<{ unit: { name: string; base: { key: string; dimensions: number[] } }; prefix: unknown; power: number }>;
  dimensions: number[];
  skipAutomaticSimplification: boolean;
  fixPrefix: boolean;
  clone(): UnitInternals;
  _normalize(x: number): number;
}

/**
 * Two rules of the trade on top of mathjs's arithmetic:
 * - an angle is a ratio where it multiplies a length (SI Brochure 9th ed., §2.3.3: rad = m/m):
 *   ω·r with ω in rad/s is a speed in m/s, θ·r a length; only products holding a length lose
 *   their angle, so ω·t stays an angle and sin(30 deg) still takes an angle;
 * - a dimensionless unit the author wrote (ppm, ppb, µs/day, ns/day) keeps its name when scaled
 *   by a number or converted with `to`, where mathjs would return a bare number (4.5 µs/day, not
 *   5.2 × 10⁻¹¹).
 */
function installUnitRules(math: MathJsInstance): void {
  const dims = (math.Unit as unknown as { BASE_DIMENSIONS: string[] }).BASE_DIMENSIONS;
  const ANGLE = dims.indexOf('ANGLE');
  const LENGTH = dims.indexOf('LENGTH');
  const isUnit = (x: unknown): x is UnitInternals => math.isUnit(x);
  const dimensionless = (u: UnitInternals) => u.dimensions.every((d) => Math.abs(d) < 1e-12);
  const withoutAngle = (x: unknown): unknown => {
    if (!isUnit(x) || Math.abs(x.dimensions[ANGLE] ?? 0) < 1e-12 || Math.abs(x.dimensions[LENGTH] ?? 0) < 1e-12)
      return x;
    const r = x.clone();
    // The value is held in SI base units, where the radian is 1: removing the angle factors changes
    // only the unit the number is shown in.
    r.units = r.units.filter((f) => Math.abs(f.unit.base.dimensions[ANGLE] ?? 0) < 1e-12);
    r.dimensions = r.dimensions.map((d, i) => (i === ANGLE ? 0 : d));
    r.skipAutomaticSimplification = false;
    return r;
  };
  const mapResult = (x: unknown): unknown =>
    math.isMatrix(x) ? (x as { map(f: (v: unknown) => unknown): unknown }).map(withoutAngle) : withoutAngle(x);
  /** A named dimensionless unit times a number stays a quantity in that unit. */
  const scaled = (u: UnitInternals, factor: number): UnitInternals => {
    const r = u.clone();
    r.value = u.value === null ? u._normalize(factor) : (u.value as number) * factor;
    return r;
  };
  const record = math as unknown as Record<string, (...args: unknown[]) => unknown>;
  const multiply = record.multiply;
  const divide = record.divide;
  const to = record.to;
  const typed = (
    math as unknown as { typed: (name: string, signatures: Record<string, (...args: unknown[]) => unknown>) => unknown }
  ).typed;
  math.import(
    {
      multiply: typed('multiply', {
        'any, any': (a, b) => {
          if (typeof a === 'number' && isUnit(b) && b.units.length && dimensionless(b)) return scaled(b, a);
          if (typeof b === 'number' && isUnit(a) && a.units.length && dimensionless(a)) return scaled(a, b);
          return mapResult(multiply(a, b));
        },
        'any, any, ...any': (a, b, rest) =>
          (rest as unknown[]).reduce((acc, x) => mapResult(multiply(acc, x)), mapResult(multiply(a, b))),
      }),
      divide: typed('divide', {
        'any, any': (a, b) => {
          if (typeof b === 'number' && isUnit(a) && a.value !== null && a.units.length && dimensionless(a))
            return scaled(a, 1 / b);
          return mapResult(divide(a, b));
        },
      }),
      to: typed('to', {
        'any, any': (a, b) => {
          // A plain number written in a dimensionless unit: `4.5e-10 to us/day` is 38.88 µs/day.
          if (typeof a === 'number' && isUnit(b) && b.value === null && dimensionless(b)) {
            const r = scaled(b, 1);
            r.value = a;
            r.fixPrefix = true;
            return r;
          }
          return to(a, b);
        },
      }),
    },
    { override: true },
  );
}
