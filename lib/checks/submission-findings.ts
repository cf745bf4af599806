// What must be acknowledged in writing before a version is submitted for check (issue: "nothing is
// signed on a broken or unsupported sheet"): every cell error, every failed design criterion, every
// warning of the engine's lint, and every design input of the calculation record whose value does
// not match the value the cell it names was evaluated with (or that names a quantity the sheet does
// not define). A pure function of the version's content and its stored results, so that the submit
// route, the submit form, the check view and the issued PDF list the same items.
import type { MathJsInstance, Unit } from 'mathjs';
import { createEngineMath } from '@/lib/calc/math-instance';
import { formatNumberText } from '@/lib/calc/format';
import { unitLabel } from '@/lib/calc/unit-label';
import type { DisplayValue, SheetResult } from '@/lib/calc/types';
import type { CalculationRecord, VersionContent } from '@/lib/sheets/content';

export type FindingKind = 'cell-error' | 'criterion-failed' | 'lint-warning' | 'design-input';

export interface SubmissionFinding {
  /** Stable within a version: what an acknowledgement names. */
  key: string;
  kind: FindingKind;
  /** The cell concerned (null for a design input). */
  cellId: string | null;
  /** What is wrong, in words. */
  message: string;
}

export const FINDING_LABELS: Record<FindingKind, string> = {
  'cell-error': 'Cell error',
  'criterion-failed': 'Failed design criterion',
  'lint-warning': 'Engine warning',
  'design-input': 'Design input does not match the sheet',
};

// ── Design inputs linked to the cells ───────────────────────────────────────────────────────────

let unitMath: MathJsInstance | null = null;
const math = () => (unitMath ??= createEngineMath([]).math);

export interface DesignInputCheck {
  /** The record's value as written ("150 MeV"). */
  recordValue: string;
  /** The cell quantity named. */
  cell: string;
  /** The value the engine used for that name, as displayed, or null when the sheet does not define it. */
  engineValue: string | null;
  status: 'match' | 'mismatch' | 'missing-cell' | 'unreadable';
  /** In words, for the editor, the check view and the PDF. */
  words: string;
}

/** The last value each name is defined with in the results (null: its statement has an error). */
function definedValues(results: SheetResult | null | undefined): Map<string, DisplayValue | null> {
  const out = new Map<string, DisplayValue | null>();
  for (const cell of results?.cells ?? []) {
    for (const s of cell.statements) {
      if (s.kind === 'definition' && s.name) out.set(s.name, s.error ? null : s.value);
    }
  }
  return out;
}

const NUMBER_PART = /^\s*([+-]?)(\d+(?:\.(\d*))?|\.(\d+))(?:e([+-]?\d+))?/i;

/**
 * Compares a design input's value as written in the record ("150 MeV", "2.403e-11 J") with the
 * value a cell defines. The two are compared in SI, the units must be of the same dimension, and
 * the record's value counts as written to its last digit: the cell's value, in the record's unit,
 * must lie within half a unit of that last digit (150 MeV matches 150.04 MeV, not 150.7 MeV).
 */
export function checkDesignInput(
  recordValue: string,
  cell: string,
  engine: DisplayValue | null | undefined,
): DesignInputCheck {
  const base = { recordValue, cell };
  if (engine === undefined)
    return { ...base, engineValue: null, status: 'missing-cell', words: `the sheet defines no quantity named ${cell}` };
  if (engine === null)
    return {
      ...base,
      engineValue: null,
      status: 'missing-cell',
      words: `the statement defining ${cell} has an error, so no value was used`,
    };
  const engineText = engine.text;
  if (
    (engine.kind !== 'quantity' && engine.kind !== 'number') ||
    engine.number === null ||
    !Number.isFinite(engine.number)
  ) {
    return {
      ...base,
      engineValue: engineText,
      status: 'unreadable',
      words: `${cell} is not a finite number or quantity (${engineText})`,
    };
  }
  const m = NUMBER_PART.exec(recordValue.replace(/[\u00a0\u2009\u202f]/g, ' ').replace(/\u2212/g, '-'));
  if (!m)
    return {
      ...base,
      engineValue: engineText,
      status: 'unreadable',
      words: `the record's value "${recordValue}" does not start with a number`,
    };
  const decimals = (m[3] ?? m[4] ?? '').length;
  const exponent = m[5] ? Number(m[5]) : 0;
  const unitText = recordValue.slice(m[0].length).trim();
  let record: Unit | null = null;
  let written: number;
  try {
    written = Number(`${m[1]}${m[2]}${m[5] ? `e${m[5]}` : ''}`);
    if (unitText) record = math().unit(written, unitText) as Unit;
  } catch {
    return {
      ...base,
      engineValue: engineText,
      status: 'unreadable',
      words: `the unit "${unitText}" of the record's value is not read`,
    };
  }
  let cellUnit: Unit | null = null;
  try {
    if (engine.unit) cellUnit = math().unit(engine.number, engine.unit) as Unit;
  } catch {
    return {
      ...base,
      engineValue: engineText,
      status: 'unreadable',
      words: `the unit ${engine.unit} of ${cell} is not read`,
    };
  }
  const dimless = (u: Unit | null) =>
    u === null || (u as unknown as { dimensions: number[] }).dimensions.every((d) => d === 0);
  const same = record && cellUnit ? record.equalBase(cellUnit) : dimless(record) && dimless(cellUnit);
  if (!same) {
    return {
      ...base,
      engineValue: engineText,
      status: 'mismatch',
      words: `units differ: the record gives ${unitText || 'a plain number'}, ${cell} is in ${unitLabel(engine.unit) || 'no unit'}`,
    };
  }
  // The cell's value expressed in the record's unit.
  const cellSi = cellUnit ? (cellUnit.value as number) : engine.number;
  const unitSi = record ? (math().unit(1, unitText).value as number) : 1;
  const inRecordUnit = cellSi / unitSi;
  const halfStep = 0.5 * 10 ** (exponent - decimals);
  const slack = 1e-12 * Math.max(Math.abs(written), Math.abs(inRecordUnit));
  const shown = `${formatNumberText(inRecordUnit, 8, { trailingZeros: false })}${unitText ? ` ${unitText}` : ''}`;
  if (Math.abs(inRecordUnit - written) <= halfStep + slack) {
    return { ...base, engineValue: engineText, status: 'match', words: `matches the value used: ${engineText}` };
  }
  const rel = written === 0 ? null : Math.abs(inRecordUnit - written) / Math.abs(written);
  return {
    ...base,
    engineValue: engineText,
    status: 'mismatch',
    words: `does not match: the record gives ${recordValue}, the sheet uses ${engineText} (${shown})${rel === null ? '' : `, a relative difference of ${formatNumberText(rel, 3, { trailingZeros: false })}`}`,
  };
}

/** Each design input that names a cell quantity, checked against the results. */
export function checkDesignInputs(
  record: CalculationRecord,
  results: SheetResult | null | undefined,
): Array<DesignInputCheck & { index: number; name: string }> {
  const values = definedValues(results);
  const out: Array<DesignInputCheck & { index: number; name: string }> = [];
  record.inputs.forEach((input, index) => {
    const cell = input.cell?.trim();
    if (!cell) return;
    out.push({ index, name: input.name, ...checkDesignInput(input.value, cell, values.get(cell)) });
  });
  return out;
}

// ── Everything to acknowledge ───────────────────────────────────────────────────────────────────

/** Every item the originator must acknowledge in writing before submitting the version. */
export function submissionFindings(
  content: VersionContent,
  results: SheetResult | null | undefined,
): SubmissionFinding[] {
  const out: SubmissionFinding[] = [];
  if (!results) {
    out.push({
      key: 'results:none',
      kind: 'cell-error',
      cellId: null,
      message: 'The version has no stored evaluation.',
    });
    return out;
  }
  const labelOf = (cellId: string) => {
    const i = content.cells.findIndex((c) => c.id === cellId);
    return i >= 0 ? `cell ${i + 1}` : `cell ${cellId}`;
  };
  for (const cell of results.cells) {
    if (cell.kind !== 'calc') continue;
    const where = labelOf(cell.id);
    const erred = cell.statements.filter((s) => s.error);
    if (erred.length === 0 && cell.error)
      out.push({ key: `error:${cell.id}`, kind: 'cell-error', cellId: cell.id, message: `${where}: ${cell.error}` });
    for (const s of erred)
      out.push({
        key: `error:${cell.id}:${s.line}`,
        kind: 'cell-error',
        cellId: cell.id,
        message: `${where}, line ${s.line} (${s.source.trim()}): ${s.error}`,
      });
    for (const s of cell.statements) {
      if (s.kind === 'criterion' && !s.error && s.criterion && !s.criterion.pass) {
        out.push({
          key: `criterion:${cell.id}:${s.line}`,
          kind: 'criterion-failed',
          cellId: cell.id,
          message: `${where}, line ${s.line}: the criterion ${s.source.trim()} fails (${s.criterion.marginText})`,
        });
      }
      (s.warnings ?? []).forEach((w, i) =>
        out.push({
          key: `warning:${cell.id}:${s.line}:${i}`,
          kind: 'lint-warning',
          cellId: cell.id,
          message: `${where}, line ${s.line}: ${w}`,
        }),
      );
    }
  }
  for (const d of checkDesignInputs(content.record, results)) {
    if (d.status === 'match') continue;
    out.push({
      key: `input:${d.index}`,
      kind: 'design-input',
      cellId: null,
      message: `Design input "${d.name}" (${d.cell} = ${d.recordValue}): ${d.words}`,
    });
  }
  return out;
}

export interface Acknowledgement {
  key: string;
  text: string;
}

/** The findings not acknowledged with some written text, and acknowledgements of nothing found. */
export function unacknowledged(
  findings: readonly SubmissionFinding[],
  acks: readonly Acknowledgement[],
): { missing: SubmissionFinding[]; unknown: string[] } {
  const given = new Map(acks.filter((a) => a.text.trim().length > 0).map((a) => [a.key, a.text.trim()]));
  const keys = new Set(findings.map((f) => f.key));
  return {
    missing: findings.filter((f) => !given.has(f.key)),
    unknown: acks.map((a) => a.key).filter((k) => !keys.has(k)),
  };
}
