// Numbers and units as a checker reads them, per ISO 80000-1 and the SI Brochure (9th ed., §5.4):
// a space between number and unit, digits grouped in threes by a thin space when a side has more
// than four, the minus sign U+2212, powers of ten written as × 10ⁿ, products of units with a
// half-high dot, quotients with a solidus.
import type { MathJsInstance, Unit } from 'mathjs';
import type { DisplayValue } from './types';
import { cancelLikeUnits, displayUnitsOf, tradeDisplay } from './display-units';

const THIN = '\u202f';
const MINUS = '\u2212';
const SUPERSCRIPTS: Record<string, string> = {
  '0': '⁰',
  '1': '¹',
  '2': '²',
  '3': '³',
  '4': '⁴',
  '5': '⁵',
  '6': '⁶',
  '7': '⁷',
  '8': '⁸',
  '9': '⁹',
  '-': '⁻',
};

const superscript = (s: string) => [...s].map((ch) => SUPERSCRIPTS[ch] ?? ch).join('');

function group(digits: string, fromLeft: boolean, sep: string): string {
  if (digits.length <= 4) return digits;
  const out: string[] = [];
  if (fromLeft) {
    for (let i = 0; i < digits.length; i += 3) out.push(digits.slice(i, i + 3));
  } else {
    for (let i = digits.length; i > 0; i -= 3) out.unshift(digits.slice(Math.max(0, i - 3), i));
  }
  return out.join(sep);
}

interface NumberParts {
  negative: boolean;
  integer: string;
  fraction: string;
  exponent: number | null;
}

/**
 * Rounds to `sig` significant figures and keeps the trailing zeros, which are significant
 * (1.967 50, 144.110): the number of digits written tells the reader the precision (SI Brochure 9th ed.,
 * §5.4.4; significant-figure convention, common practice). A whole number (an input such as 250 MeV,
 * a count, a charge number, within 4 ulp of an integer below 2⁵³) is written without a fraction, as
 * it is exact. `trailingZeros: false` drops them (axis tick labels).
 */
function numberParts(x: number, sig: number, trailingZeros = true): NumberParts {
  const negative = x < 0 || Object.is(x, -0);
  const a = Math.abs(x);
  if (a === 0) return { negative: false, integer: '0', fraction: '', exponent: null };
  const [mantissa, expText] = a.toExponential(sig - 1).split('e');
  let exponent = Number(expText);
  const scientific = exponent < -3 || exponent >= 6;
  let text: string;
  if (scientific) {
    text = mantissa;
  } else {
    text = Number(a.toPrecision(sig)).toFixed(Math.max(0, sig - 1 - exponent));
    exponent = 0;
  }
  const [integer, fraction0 = ''] = text.split('.');
  let fraction = fraction0;
  // A whole number drops its fraction's zeros only where they are all there is: written out (250),
  // or as a power of ten that is the number itself (1 × 10²⁰). 3.986004418e14 at six figures stays
  // 3.986 00 × 10¹⁴: "3.986 × 10¹⁴" would claim the digits after 3.986 are zeros.
  const exactAsWritten = !scientific || Number(`${mantissa}e${exponent}`) === a;
  if (!trailingZeros || (isWholeNumber(a) && exactAsWritten)) fraction = fraction.replace(/0+$/, '');
  return { negative, integer, fraction, exponent: scientific ? exponent : null };
}

/** True for a whole number (within 4 ulp of an integer, below 2⁵³): it is written without a fraction. */
function isWholeNumber(a: number): boolean {
  if (!(a >= 1) || a >= 2 ** 53) return false;
  return Math.abs(a - Math.round(a)) <= a * 2 ** -50;
}

/** The number at `sig` significant figures; `trailingZeros: false` drops the fraction's trailing zeros (axis ticks). */
export function formatNumberText(x: number, sig: number, options?: { trailingZeros?: boolean }): string {
  if (Number.isNaN(x)) return 'NaN';
  if (!Number.isFinite(x)) return x > 0 ? '∞' : `${MINUS}∞`;
  const p = numberParts(x, sig, options?.trailingZeros ?? true);
  const body = group(p.integer, false, THIN) + (p.fraction ? `.${group(p.fraction, true, THIN)}` : '');
  return `${p.negative ? MINUS : ''}${body}${p.exponent !== null ? ` × 10${superscript(String(p.exponent))}` : ''}`;
}

export function formatNumberTex(x: number, sig: number): string {
  if (Number.isNaN(x)) return '\\mathrm{NaN}';
  if (!Number.isFinite(x)) return x > 0 ? '\\infty' : '-\\infty';
  const p = numberParts(x, sig);
  const body = group(p.integer, false, '\\,') + (p.fraction ? `.${group(p.fraction, true, '\\,')}` : '');
  return `${p.negative ? '-' : ''}${body}${p.exponent !== null ? ` \\times 10^{${p.exponent}}` : ''}`;
}

interface UnitPart {
  name: string;
  power: number;
}

function unitParts(unit: Unit): UnitPart[] {
  const units = (
    unit as unknown as { units: Array<{ unit: { name: string }; prefix: { name: string }; power: number }> }
  ).units;
  return units.map((u) => ({ name: `${u.prefix.name}${u.unit.name}`, power: u.power }));
}

// `c` in GeV/c and MeV/c² is the speed of light, written as the quantity symbol (PDG RPP).
const UPRIGHT_TEX: Record<string, string> = { deg: '^{\\circ}', ohm: '\\Omega', micro: '\\mu', c: 'c' };

function unitNameTex(name: string): string {
  if (UPRIGHT_TEX[name]) return UPRIGHT_TEX[name];
  // mathjs spells the micro prefix "u" (us, um, uV): print µ.
  const micro = /^u[A-Za-z]/.test(name) && name !== 'unit' ? `\\mu\\mathrm{${name.slice(1)}}` : null;
  return micro ?? `\\mathrm{${name}}`;
}

function unitNameText(name: string): string {
  if (name === 'deg') return '°';
  return /^u[A-Za-z]/.test(name) ? `µ${name.slice(1)}` : name;
}

export function unitText(parts: UnitPart[]): string {
  const term = (p: UnitPart, power: number) =>
    `${unitNameText(p.name)}${power === 1 ? '' : superscript(String(power))}`;
  const num = parts.filter((p) => p.power > 0).map((p) => term(p, p.power));
  const den = parts.filter((p) => p.power < 0).map((p) => term(p, -p.power));
  const top = num.length ? num.join('·') : '1';
  if (!den.length) return top;
  return `${top}/${den.length > 1 ? `(${den.join('·')})` : den[0]}`;
}

export function unitTex(parts: UnitPart[]): string {
  const term = (p: UnitPart, power: number) => `${unitNameTex(p.name)}${power === 1 ? '' : `^{${power}}`}`;
  const num = parts.filter((p) => p.power > 0).map((p) => term(p, p.power));
  const den = parts.filter((p) => p.power < 0).map((p) => term(p, -p.power));
  const top = num.length ? num.join('\\cdot ') : '1';
  if (!den.length) return top;
  return `${top}/${den.length > 1 ? `\\left(${den.join('\\cdot ')}\\right)` : den[0]}`;
}

const partsCache = new WeakMap<MathJsInstance, Map<string, UnitPart[]>>();

/** The parts of a unit string, parsed once per instance and unit string. */
function partsOf(math: MathJsInstance, unitString: string): UnitPart[] {
  let cache = partsCache.get(math);
  if (!cache) {
    cache = new Map();
    partsCache.set(math, cache);
  }
  let parts = cache.get(unitString);
  if (!parts) {
    parts = unitParts(math.unit(unitString));
    if (cache.size < 10_000) cache.set(unitString, parts);
  }
  return parts;
}

/**
 * Splits a mathjs quantity into the number and unit it is displayed in (simplified, with the best
 * prefix, as mathjs chooses), keeping the number at full double precision.
 */
export function quantityParts(
  math: MathJsInstance,
  written: Unit,
): { number: number; unitString: string; parts: UnitPart[] } {
  const fixed = (written as unknown as { fixPrefix?: boolean }).fixPrefix;
  // Factors of one unit that cancel go (MeV·T·m/MeV is T·m), unless `to` asked for that unit.
  const unit = fixed ? written : cancelLikeUnits(written);
  // The trade's units, where the sheet asks for them (lib/calc/display-units.ts).
  if (displayUnitsOf(math) === 'trade') {
    const t = tradeDisplay(math, unit);
    if (t) return { ...t, parts: partsOf(math, t.unitString) };
  }
  // A mass stays in kilograms unless the sheet asked for another unit with `to`: mathjs's choice of
  // the "best" prefix would show the proton mass in yoctograms.
  if (!fixed && unit.equalBase(kilogram(math)) && !writtenAsAtomicMass(unit)) {
    const kg = unit.value as number;
    if (Math.abs(kg) < 1e3) return { number: kg, unitString: 'kg', parts: [{ name: 'kg', power: 1 }] };
  }
  // The steps of mathjs's Unit.format (simplify unless told not to, then pick the best prefix of
  // a single unit), without formatting the number to text and parsing the unit back.
  const u = unit as unknown as InternalUnit;
  const simp = (u.skipAutomaticSimplification ? u.clone() : u.simplify()) as InternalUnit;
  if (
    simp.units.length === 1 &&
    !simp.fixPrefix &&
    Math.abs(simp.units[0].power - Math.round(simp.units[0].power)) < 1e-14
  ) {
    const best = simp._bestPrefix();
    if (prefixInUse(simp.units[0].unit.name, best.name)) simp.units[0].prefix = best;
    else if (simp.units[0].unit.name === 'g')
      simp.units[0].prefix = (
        simp.units[0].unit as unknown as { prefixes: Record<string, { name: string; value: number }> }
      ).prefixes.k;
    else if (!prefixInUse(simp.units[0].unit.name, simp.units[0].prefix.name)) {
      const none = (simp.units[0].unit as unknown as { prefixes: Record<string, { name: string; value: number }> })
        .prefixes[''];
      if (none) simp.units[0].prefix = none;
    }
  }
  const number = simp._denormalize(simp.value) as number;
  const unitString = simp.formatUnits();
  return { number, unitString, parts: unitParts(simp as unknown as Unit) };
}

/**
 * The prefixes a result is given automatically: atto to exa, as the trade writes them (common
 * practice: 3 × 10¹² m, not 3 Tm; 1 × 10⁻⁴⁰ m, never 10⁻¹⁰ quectometres; 43 082 s, never 43.1 ks
 * or 100 Es). Lengths take no prefix above kilo, durations none above one (a duration in hours,
 * days or years is asked for with `to`), masses no prefix but kilo above a kilogram. Outside
 * these, the unit keeps no prefix and the number carries the power of ten. A prefix the author
 * wrote, or asked for with `to`, is never changed.
 */
const AUTOMATIC_PREFIXES = new Set(['a', 'f', 'p', 'n', 'u', 'm', '', 'k', 'M', 'G', 'T', 'P', 'E']);
const LARGEST_PREFIX: Record<string, string> = { m: 'k', s: '', g: 'k' };
const PREFIX_ORDER = ['a', 'f', 'p', 'n', 'u', 'm', '', 'k', 'M', 'G', 'T', 'P', 'E'];
function prefixInUse(unitName: string, prefix: string): boolean {
  if (!AUTOMATIC_PREFIXES.has(prefix)) return false;
  const cap = LARGEST_PREFIX[unitName];
  return cap === undefined || PREFIX_ORDER.indexOf(prefix) <= PREFIX_ORDER.indexOf(cap);
}

/** A mass the author wrote in MeV/c², u or Da: shown so, not in kilograms. */
function writtenAsAtomicMass(unit: Unit): boolean {
  const u = unit as unknown as InternalUnit;
  return (
    u.skipAutomaticSimplification &&
    u.units.some((f) => f.unit.name === 'c' || f.unit.name === 'u' || f.unit.name === 'Da')
  );
}

/** The parts of mathjs's Unit that its own format() uses. */
interface InternalUnit {
  value: number;
  units: Array<{ unit: { name: string }; prefix: { name: string; value: number }; power: number }>;
  fixPrefix: boolean;
  skipAutomaticSimplification: boolean;
  clone(): InternalUnit;
  simplify(): InternalUnit;
  _bestPrefix(): { name: string; value: number };
  _denormalize(value: number): number;
  formatUnits(): string;
}

const kilograms = new WeakMap<MathJsInstance, Unit>();
function kilogram(math: MathJsInstance): Unit {
  let kg = kilograms.get(math);
  if (!kg) {
    kg = math.unit('kg');
    kilograms.set(math, kg);
  }
  return kg;
}

export function displayValue(math: MathJsInstance, value: unknown, sig: number): DisplayValue {
  if (typeof value === 'number') {
    return {
      kind: 'number',
      text: formatNumberText(value, sig),
      tex: formatNumberTex(value, sig),
      number: value,
      unit: null,
      raw: null,
    };
  }
  if (typeof value === 'boolean') {
    return {
      kind: 'boolean',
      text: value ? 'true' : 'false',
      tex: `\\mathrm{${value}}`,
      number: null,
      unit: null,
      raw: value,
    };
  }
  if (typeof value === 'string') {
    return {
      kind: 'string',
      text: value,
      tex: `\\text{${value.replace(/[\\{}$&#^_%~]/g, '')}}`,
      number: null,
      unit: null,
      raw: value,
    };
  }
  if (math.isUnit(value)) {
    const u = value as Unit;
    if (u.value === null) {
      const parts = unitParts(u);
      return {
        kind: 'quantity',
        text: unitText(parts),
        tex: unitTex(parts),
        number: null,
        unit: u.formatUnits(),
        raw: null,
      };
    }
    const q = quantityParts(math, u);
    if (!q.unitString) {
      return {
        kind: 'number',
        text: formatNumberText(q.number, sig),
        tex: formatNumberTex(q.number, sig),
        number: q.number,
        unit: null,
        raw: null,
      };
    }
    return {
      kind: 'quantity',
      text: `${formatNumberText(q.number, sig)} ${unitText(q.parts)}`,
      tex: `${formatNumberTex(q.number, sig)}\\ ${unitTex(q.parts)}`,
      number: q.number,
      unit: q.unitString,
      raw: null,
    };
  }
  if (math.isMatrix(value) || Array.isArray(value))
    return listDisplay(math, value as unknown[] | { toArray(): unknown[] }, sig);
  if (typeof value === 'function') {
    return { kind: 'function', text: 'function', tex: '\\text{function}', number: null, unit: null, raw: null };
  }
  const text = math.format(value as never, { precision: sig });
  return {
    kind: 'other',
    text,
    tex: `\\text{${text.replace(/[\\{}$&#^_%~]/g, '')}}`,
    number: null,
    unit: null,
    raw: text,
  };
}

/** TeX of a unit expression written in a sheet ("m/s^2", "T*m"). */
export function unitTexOf(math: MathJsInstance, unit: string): string {
  return unitTex(partsOf(math, unit));
}

/** Longest list shown whole; longer ones show their first and last elements and their length. */
const LIST_SHOWN = 12;

/**
 * A list (a table column, or a library function applied to one): quantities of one dimension in a
 * common unit, `[70, 150, 250] MeV`; anything else element by element.
 */
function listDisplay(math: MathJsInstance, value: unknown[] | { toArray(): unknown[] }, sig: number): DisplayValue {
  const items = Array.isArray(value) ? value : value.toArray();
  const elide = <T>(xs: T[]): Array<T | null> =>
    xs.length <= LIST_SHOWN ? xs : [...xs.slice(0, 6), null, ...xs.slice(-3)];
  const suffix = items.length > LIST_SHOWN ? ` (${items.length} values)` : '';
  const first = items[0];
  const sameQuantity =
    items.length > 0 &&
    math.isUnit(first) &&
    (first as Unit).value !== null &&
    items.every((x) => math.isUnit(x) && (x as Unit).value !== null && (x as Unit).equalBase(first as Unit));
  if (sameQuantity) {
    const { unitString, parts } = quantityParts(math, first as Unit);
    const numbers = items.map((x) => (unitString ? (x as Unit).toNumber(unitString) : ((x as Unit).value as number)));
    const shown = elide(numbers);
    const text = `[${shown.map((n) => (n === null ? '…' : formatNumberText(n, sig))).join(', ')}]${unitString ? ` ${unitText(parts)}` : ''}${suffix}`;
    const tex = `\\left[${shown.map((n) => (n === null ? '\\ldots' : formatNumberTex(n, sig))).join(',\\ ')}\\right]${unitString ? `\\ ${unitTex(parts)}` : ''}${suffix ? `\\ \\text{${suffix.trim()}}` : ''}`;
    return { kind: 'matrix', text, tex, number: null, unit: unitString || null, raw: JSON.stringify(numbers) };
  }
  const shown = elide(items).map((x) => (x === null ? null : displayValue(math, x, sig)));
  const text = `[${shown.map((d) => (d === null ? '…' : d.text)).join(', ')}]${suffix}`;
  const tex = `\\left[${shown.map((d) => (d === null ? '\\ldots' : d.tex)).join(',\\ ')}\\right]${suffix ? `\\ \\text{${suffix.trim()}}` : ''}`;
  return { kind: 'matrix', text, tex, number: null, unit: null, raw: text };
}

function fixedParts(x: number, decimals: number): { negative: boolean; integer: string; fraction: string } {
  const text = Math.abs(x).toFixed(Math.min(20, Math.max(0, decimals)));
  const [integer, fraction = ''] = text.split('.');
  return { negative: x < 0 && Number(text) !== 0, integer, fraction };
}

/** A number with a fixed count of decimals, trailing zeros kept (they carry meaning beside an uncertainty). */
export function formatFixedText(x: number, decimals: number): string {
  const p = fixedParts(x, decimals);
  return `${p.negative ? MINUS : ''}${group(p.integer, false, THIN)}${p.fraction ? `.${group(p.fraction, true, THIN)}` : ''}`;
}

export function formatFixedTex(x: number, decimals: number): string {
  const p = fixedParts(x, decimals);
  return `${p.negative ? '-' : ''}${group(p.integer, false, '\\,')}${p.fraction ? `.${group(p.fraction, true, '\\,')}` : ''}`;
}

/** A number to exactly `sig` significant digits, trailing zeros kept: an uncertainty of 7.0 × 10⁻²² stays so. */
export function formatSignificantText(x: number, sig: number): string {
  if (!Number.isFinite(x) || x === 0) return formatNumberText(x, sig);
  const rounded = Number(x.toPrecision(sig));
  const e = Math.floor(Math.log10(Math.abs(rounded)));
  if (e < -3 || e >= 6) return `${formatFixedText(rounded / 10 ** e, sig - 1)} × 10${superscript(String(e))}`;
  return formatFixedText(rounded, Math.max(0, sig - 1 - e));
}
