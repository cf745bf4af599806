// The checker's alternate calculation compared with the sheet: for every name defined both in the
// alternate cells and in the version's stored results, both values, the relative difference
// |a − s| / |s| computed on the values in SI units at full double precision, and whether it is
// within the tolerance the checker states. Pure: the check view, the approval view and the PDF read
// the same rows.
//
// Decisions (lib/checks/README.md):
// - Units: both values are converted to SI by the engine's unit table; dimensions that differ are
//   "cannot be compared: units differ". A plain number and a quantity compare only when the
//   quantity is dimensionless (1 ppm and 1e-6).
// - Zero: a sheet value of 0 has no relative difference; equal zeros are within any tolerance, and
//   an alternate that is not 0 is outside it (said in words).
// - Lists, booleans, strings and functions are not compared (said in the row), nor values that are
//   not finite or statements with an error.
import type { MathJsInstance, Unit } from 'mathjs';
import { createEngineMath } from '@/lib/calc/math-instance';
import { formatNumberText } from '@/lib/calc/format';
import { unitLabel } from '@/lib/calc/unit-label';
import type { DisplayValue, SheetResult } from '@/lib/calc/types';

export type ComparisonStatus = 'within' | 'outside' | 'no_tolerance' | 'units_differ' | 'not_compared';

export interface AlternateComparisonRow {
  name: string;
  /** The sheet's value as displayed in its results. */
  sheet: string;
  /** The alternate's value as displayed, and converted to the sheet's unit when the units differ in form. */
  alternate: string;
  alternateInSheetUnit: string | null;
  /** |a − s| / |s| on SI values; null when not computed (see `status` and `words`). */
  relativeDifference: number | null;
  /** The relative difference written for the reader ("2.35 × 10⁻⁵", "0.1 %"), or "—". */
  relativeDifferenceText: string;
  status: ComparisonStatus;
  /** The outcome in words ("within the tolerance of 1 × 10⁻⁶"), never by colour alone. */
  words: string;
}

export interface AlternateComparison {
  tolerance: number | null;
  toleranceText: string | null;
  /** The tolerance written for the reader ("1 × 10⁻⁶"), or null. */
  toleranceWords: string | null;
  rows: AlternateComparisonRow[];
  /** How many rows are not within the tolerance (outside it, not compared, or no tolerance stated). */
  notWithin: number;
}

// ── The tolerance as the checker states it ──────────────────────────────────────────────────

/** Largest tolerance accepted: 10 % is already a loose check (common practice). */
const TOLERANCE_MAX = 0.1;

/**
 * A relative tolerance as written: a number ("1e-6", "0.000 001"), a percentage ("0.1 %"), or
 * parts per million ("5 ppm"). Returns the fraction, or a message saying what is accepted.
 */
export function parseTolerance(text: string): { ok: true; value: number } | { ok: false; message: string } {
  const t = text
    .trim()
    .replace(/[\u00a0\u202f\u2009 ]/g, '')
    .replace(/\u2212/g, '-')
    .replace(/×10\^?/g, 'e');
  const m = /^([0-9]*\.?[0-9]+(?:e[+-]?[0-9]+)?)(%|ppm)?$/i.exec(t);
  if (!m)
    return {
      ok: false,
      message: 'write the tolerance as a relative number (1e-6), a percentage (0.1 %) or parts per million (5 ppm)',
    };
  const n = Number(m[1]) / (m[2] === '%' ? 100 : m[2]?.toLowerCase() === 'ppm' ? 1e6 : 1);
  if (!Number.isFinite(n) || n <= 0) return { ok: false, message: 'the tolerance must be greater than zero' };
  if (n > TOLERANCE_MAX)
    return { ok: false, message: `the tolerance must be at most ${TOLERANCE_MAX * 100} % (a relative difference)` };
  return { ok: true, value: n };
}

/** "1 × 10⁻⁶", "0.1 %": a tolerance or a relative difference in words a checker reads. */
export function formatRelative(x: number): string {
  if (x === 0) return '0';
  if (x >= 1e-3) return `${formatNumberText(x * 100, 3, { trailingZeros: false })} %`;
  return formatNumberText(x, 3, { trailingZeros: false });
}

// ── The comparison ───────────────────────────────────────────────────────────────────────────

let unitMath: MathJsInstance | null = null;
const math = () => (unitMath ??= createEngineMath([]).math);

/** The last value each name is defined with, from statements without an error. */
function definitions(results: SheetResult | null | undefined): Map<string, DisplayValue | null> {
  const out = new Map<string, DisplayValue | null>();
  for (const cell of results?.cells ?? []) {
    for (const s of cell.statements) {
      if (s.kind !== 'definition' || !s.name) continue;
      out.set(s.name, s.error ? null : s.value);
    }
  }
  return out;
}

/** A value in SI with its dimension, or why it is not compared. */
function siValue(v: DisplayValue): { value: number; unit: Unit | null } | string {
  if (v.kind === 'matrix') return 'not compared: lists are not compared';
  if (v.kind !== 'quantity' && v.kind !== 'number')
    return `not compared: a ${v.kind === 'boolean' ? 'true/false value' : v.kind === 'string' ? 'text' : v.kind === 'function' ? 'function' : 'value that is not a number'}`;
  if (v.number === null || !Number.isFinite(v.number)) return 'not compared: not a finite number';
  if (!v.unit) return { value: v.number, unit: null };
  try {
    const u = math().unit(v.number, v.unit) as Unit;
    return { value: u.value as number, unit: u };
  } catch {
    return `not compared: the unit ${v.unit} is not read`;
  }
}

const dimensionless = (u: Unit) => (u as unknown as { dimensions: number[] }).dimensions.every((d) => d === 0);

/** The relative difference |a − s| / |s| and the verdict for one pair of values. */
export function compareValues(
  sheet: DisplayValue,
  alternate: DisplayValue,
  tolerance: number | null,
  /** The tolerance as the checker wrote it ("0.01 %"); by default written from the number. */
  toleranceLabel: string | null = null,
): Pick<AlternateComparisonRow, 'relativeDifference' | 'status' | 'words' | 'alternateInSheetUnit'> {
  const s = siValue(sheet);
  const a = siValue(alternate);
  if (typeof s === 'string')
    return { relativeDifference: null, status: 'not_compared', words: `${s} (sheet)`, alternateInSheetUnit: null };
  if (typeof a === 'string')
    return { relativeDifference: null, status: 'not_compared', words: `${a} (alternate)`, alternateInSheetUnit: null };
  const sameDimension =
    s.unit && a.unit
      ? s.unit.equalBase(a.unit)
      : (s.unit === null || dimensionless(s.unit)) && (a.unit === null || dimensionless(a.unit));
  if (!sameDimension) {
    return {
      relativeDifference: null,
      status: 'units_differ',
      words: `cannot be compared: units differ (${unitLabel(sheet.unit) || 'a plain number'} and ${unitLabel(alternate.unit) || 'a plain number'})`,
      alternateInSheetUnit: null,
    };
  }
  let inSheetUnit: string | null = null;
  if (unitLabel(alternate.unit) !== unitLabel(sheet.unit)) {
    const n = sheet.unit ? a.value / (math().unit(1, sheet.unit).value as number) : a.value;
    inSheetUnit = `${formatNumberText(n, 6)}${sheet.unit ? ` ${unitLabel(sheet.unit)}` : ''}`;
  }
  let rel: number;
  if (s.value === 0) {
    if (a.value !== 0)
      return {
        relativeDifference: null,
        status: 'outside',
        words:
          'outside the tolerance: the sheet value is 0 and the alternate is not, so there is no relative difference',
        alternateInSheetUnit: inSheetUnit,
      };
    rel = 0;
  } else rel = Math.abs(a.value - s.value) / Math.abs(s.value);
  if (tolerance === null)
    return {
      relativeDifference: rel,
      status: 'no_tolerance',
      words: 'no tolerance stated yet',
      alternateInSheetUnit: inSheetUnit,
    };
  const within = rel <= tolerance;
  return {
    relativeDifference: rel,
    status: within ? 'within' : 'outside',
    words: `${within ? 'within' : 'outside'} the tolerance of ${toleranceLabel ?? formatRelative(tolerance)}`,
    alternateInSheetUnit: inSheetUnit,
  };
}

/** Every name defined both in the sheet's results and in the alternate cells, in the sheet's order. */
export function compareAlternate(
  sheet: SheetResult | null | undefined,
  alternate: SheetResult | null | undefined,
  tolerance: number | null,
  toleranceText: string | null = null,
): AlternateComparison {
  const ours = definitions(sheet);
  const theirs = definitions(alternate);
  const rows: AlternateComparisonRow[] = [];
  for (const [name, s] of ours) {
    if (!theirs.has(name)) continue;
    const a = theirs.get(name) ?? null;
    if (!s || !a) {
      rows.push({
        name,
        sheet: s?.text ?? '—',
        alternate: a?.text ?? '—',
        alternateInSheetUnit: null,
        relativeDifference: null,
        relativeDifferenceText: '—',
        status: 'not_compared',
        words: `not compared: the ${!s ? 'sheet' : 'alternate'}'s statement has an error`,
      });
      continue;
    }
    const c = compareValues(s, a, tolerance, toleranceText);
    rows.push({
      name,
      sheet: s.text,
      alternate: a.text,
      ...c,
      relativeDifferenceText: c.relativeDifference === null ? '—' : formatRelative(c.relativeDifference),
    });
  }
  return {
    tolerance,
    toleranceText,
    toleranceWords: tolerance === null ? null : formatRelative(tolerance),
    rows,
    notWithin: rows.filter((r) => r.status !== 'within').length,
  };
}
