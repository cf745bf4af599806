// Comparison of two versions of a sheet, for the independent check: what the checker has to look at
// again since the version they last checked (or everything, at a first check). Pure functions on the
// version content and the engine's results; the answer is plain JSON-serialisable data (no Maps, no
// undefined values, no NaN or Infinity) so a route handler can return it as it is.
import { diffArrays } from 'diff';
import { z } from 'zod';
import { INT4_MAX } from '@/lib/http/params';
import type { DisplayValue, SheetResult, StatementResult, ValueKind } from '../calc/types';
import type { VersionContent } from './content';
import { DISPLAY_UNITS_DEFAULT, DISPLAY_UNITS_LABEL } from '@/lib/calc/display-units';

/** The query of GET /api/sheets/{sheetId}/compare: `?base=1&target=2`, or only `target` for a first check. */
export const compareQuerySchema = z.object({
  base: z.coerce.number().int().positive().max(INT4_MAX).optional(),
  target: z.coerce.number().int().positive().max(INT4_MAX),
});

type CellKind = 'calc' | 'text';
type DesignInput = VersionContent['record']['inputs'][number];
type Assumption = VersionContent['record']['assumptions'][number];
type AttachmentRef = VersionContent['attachments'][number];

/** One side of a comparison: a version's content and its stored results (null when not evaluated). */
export interface ComparedVersion {
  content: VersionContent;
  results: SheetResult | null;
}

/**
 * A piece of a word-level diff. Concatenating the pieces without `added` gives the old text; without
 * `removed`, the new text. The keys `added` and `removed` are absent (never false) on common text.
 */
export interface DiffPiece {
  text: string;
  added?: true;
  removed?: true;
}

export type CellStatus = 'added' | 'removed' | 'changed' | 'moved' | 'unchanged';

export interface CellComparison {
  id: string;
  status: CellStatus;
  /** The kind in the target (in the base for a removed cell). */
  kind: CellKind;
  /** The kind in the base, or null for an added cell. Differs from `kind` when the kind changed. */
  baseKind: CellKind | null;
  /** 0-based position in the base, or null for an added cell. */
  baseIndex: number | null;
  /** 0-based position in the target, or null for a removed cell. */
  targetIndex: number | null;
  /**
   * True when the cell left the relative order of the cells both versions share (see
   * `compareVersions`). A cell that moved and changed has status `changed` and `moved: true`.
   */
  moved: boolean;
  /**
   * Word-level diff of the source: for a changed cell the diff (one common piece when only the kind
   * changed), for an added cell its whole source as one added piece, for a removed cell its whole
   * source as one removed piece (no pieces for an empty source); null for moved and unchanged cells.
   */
  sourceDiff: DiffPiece[] | null;
}

/** What one side shows for a result. For a criterion, `text` and `number` are its margin. */
export interface ResultSnapshot {
  text: string;
  number: number | null;
  unit: string | null;
  /** The value's kind, or null when the statement has no value (it failed). */
  kind: ValueKind | null;
  error: string | null;
}

type ResultStatus = 'added' | 'removed' | 'changed' | 'unchanged';

export interface ResultComparison {
  /** Stable key of the entry: `value:<name>` or `criterion:<cell id>:<source>` (`#2`, … for repeats). */
  key: string;
  type: 'value' | 'criterion';
  /** The name defined, for values; the criterion's source line, for criteria. */
  name: string;
  /** The cell in the target (in the base for a removed result). */
  cellId: string;
  status: ResultStatus;
  old: ResultSnapshot | null;
  new: ResultSnapshot | null;
  /** (new − old) / |old| when both are numbers in the same unit string; 0 when both are 0; else null. */
  relativeChange: number | null;
  /** Both are quantities and their unit strings differ (then `relativeChange` is null). */
  unitChanged: boolean;
  /** For criteria: passed in the base / in the target, null when absent or failed to evaluate. */
  passOld: boolean | null;
  passNew: boolean | null;
  /** A criterion that passed in one version and failed in the other. */
  flipped: boolean;
}

export type RecordFieldName =
  'title' | 'safetyRelated' | 'significantFigures' | 'displayUnits' | 'objective' | 'method' | 'conclusions';

interface RecordFieldChange {
  field: RecordFieldName;
  /** Null at a first check. */
  old: string | number | boolean | null;
  new: string | number | boolean;
  /** Word-level diff for the text fields (title, objective, method, conclusions); null otherwise. */
  diff: DiffPiece[] | null;
}

type ItemStatus = 'added' | 'removed' | 'changed';

interface ItemChange<T, F extends string> {
  /** What the item was matched by: an input's name, an assumption's or reference's text, an attachment's name. */
  key: string;
  status: ItemStatus;
  old: T | null;
  new: T | null;
  /** For changed items, the fields that differ, in a fixed order. Empty for added and removed items. */
  changedFields: F[];
}

type InputChange = ItemChange<DesignInput, 'value' | 'source' | 'sourceRevision'>;
type AssumptionChange = ItemChange<Assumption, 'needsVerification'>;
type ReferenceChange = ItemChange<string, never>;
/**
 * An attachment added, removed or changed (status `changed`: the same name with other bytes, i.e.
 * replaced). `table` is the row/column diff when either side is a CSV data table whose parsed columns
 * were passed in (`CompareOptions.tables`), else null.
 */
export type AttachmentChange = ItemChange<AttachmentRef, 'sha256' | 'mediaType' | 'size'> & { table: TableDiff | null };

/** A CSV data table as parsed at upload (lib/attachments/csv-table.ts): columns with their values. */
export interface ComparedTable {
  rows: number;
  columns: ReadonlyArray<{ name: string; unit: string | null; values: readonly number[] }>;
}

export interface CompareOptions {
  /** Parsed CSV tables by the SHA-256 of their bytes; attachments without one get no table diff. */
  tables?: Readonly<Record<string, ComparedTable>>;
}

type TableColumnStatus = 'added' | 'removed' | 'unitChanged' | 'unchanged';

interface TableColumnChange {
  name: string;
  status: TableColumnStatus;
  /** Null when the column is absent on that side. */
  oldUnit: string | null;
  newUnit: string | null;
}

interface TableRowChange {
  status: 'added' | 'removed' | 'changed';
  /** 1-based data row (the header not counted) in the old / new table; null when absent there. */
  oldRow: number | null;
  newRow: number | null;
  /** The row's values aligned with `TableDiff.columns` (null for a column absent on that side); null when the row is absent. */
  old: Array<number | null> | null;
  new: Array<number | null> | null;
  /** For a changed row, the columns (present on both sides) whose values differ. */
  changedColumns: string[];
}

export interface TableDiff {
  /** Data rows on each side; null when that side is not a table (absent, or not a CSV table). */
  oldRows: number | null;
  newRows: number | null;
  /** Every column of either side: the new table's order, then the removed columns in the old order. */
  columns: TableColumnChange[];
  /** Row changes in table order, at most `MAX_TABLE_ROW_CHANGES` of them (see `truncated`). */
  rows: TableRowChange[];
  rowCounts: { added: number; removed: number; changed: number };
  /** More row changes than listed. */
  truncated: boolean;
}

/** At most this many row changes are listed per table (all are counted). */
export const MAX_TABLE_ROW_CHANGES = 200;
/** Tables more than this many row edits apart are compared row k with row k instead of diffed. */
const MAX_TABLE_EDIT_ROWS = 500;

export interface RecordComparison {
  fields: RecordFieldChange[];
  inputs: InputChange[];
  assumptions: AssumptionChange[];
  references: ReferenceChange[];
  attachments: AttachmentChange[];
}

interface ComparisonSummary {
  cells: Record<CellStatus, number>;
  results: Record<ResultStatus, number>;
  /** Criteria that passed in one version and failed in the other. */
  criteriaFlipped: number;
  /** Record fields, inputs, assumptions and references that changed (each item counts once). */
  recordChanges: number;
  attachmentChanges: number;
}

export interface VersionComparison {
  /** True when there was no base: everything in the target is reported as added. */
  firstCheck: boolean;
  /**
   * False when the base or the target has no stored results (and there was a base): then `results`
   * is empty rather than reporting every result as added or removed.
   */
  resultsCompared: boolean;
  cells: CellComparison[];
  results: ResultComparison[];
  record: RecordComparison;
  summary: ComparisonSummary;
}

/**
 * Compares two versions of a sheet. `base` is the version checked before (null at a first check);
 * `target` is the version under check. Deterministic: the same inputs always give the same output.
 *
 * Matching rules:
 * - **Cells** are matched by `id`, never by content or position. A cell only in the target is
 *   `added`, only in the base `removed`. A matched cell whose source or kind differs is `changed`.
 *   Otherwise it is `moved` when it left the relative order of the matched cells, else `unchanged`.
 *   Relative order means: the longest common subsequence of the matched ids in base order and in
 *   target order (Myers's diff, as the `diff` package computes it) stays in place; the matched cells
 *   outside it moved. So inserting or deleting a cell does not make the cells after it "moved".
 *   The list follows the target's order; each removed cell is placed right after the nearest cell
 *   before it in the base that stayed in place (at the start when there is none), removed cells
 *   before added ones at the same spot.
 * - **Source diffs** are word-level: the text is split into words (letters, digits and `_`),
 *   numbers (`2.43`, `1e-3` as one token), runs of spaces, line breaks and single other characters,
 *   then diffed token by token (`diffArrays`). Within one change, the removed text comes before the
 *   added text, and spaces between two changed words on one line are folded into the change.
 *   Texts too different to diff cheaply (more than 2000 token edits) give one removed and one added
 *   piece.
 * - **Named results** (statements with a `name`: definitions and functions) are matched by name
 *   across the whole sheet, wherever their cell went; the k-th statement defining a name is matched
 *   with the k-th in the other version. **Criteria** are matched by cell id and source line (so an
 *   edited criterion is one removed and one added). A result changed when its display text, full
 *   precision number, unit, kind or error differs (an error appearing or disappearing is a change);
 *   a criterion also when its pass/fail or margin differs. `relativeChange` is computed only for
 *   equal unit strings ("T m" and "T·m" are not converted; "MeV" and "GeV" neither).
 * - **Record**: fields compared by value (text fields with a word diff); inputs matched by `name`,
 *   assumptions and references by their exact text, attachments by `name` (changed when `sha256`,
 *   media type or size differs: replaced). Order within these lists is ignored. Repeated keys are
 *   matched k-th with k-th. Only differences are listed.
 * - **CSV tables** (an attachment whose SHA-256 has an entry in `options.tables`, on either side):
 *   columns matched by name (added, removed, unit changed); rows compared on the values of the
 *   columns both sides have, diffed in order (Myers's diff on whole rows), a removed run followed by
 *   an added run paired row by row as changed rows (the columns that differ named); tables more than
 *   500 row edits apart are compared row k with row k. A missing side counts as an empty table, so an
 *   added table lists every row as added.
 * - With `base` null every cell, result, field and list item of the target is `added`.
 */
export function compareVersions(
  base: ComparedVersion | null,
  target: ComparedVersion,
  options: CompareOptions = {},
): VersionComparison {
  const cells = compareCells(base?.content.cells ?? [], target.content.cells);
  const resultsCompared = base === null || (base.results !== null && target.results !== null);
  const results = resultsCompared ? compareResults(base?.results ?? null, target.results) : [];
  const record = compareRecord(base?.content ?? null, target.content, options.tables ?? {});

  const cellCounts: Record<CellStatus, number> = { added: 0, removed: 0, changed: 0, moved: 0, unchanged: 0 };
  for (const cell of cells) cellCounts[cell.status]++;
  const resultCounts: Record<ResultStatus, number> = { added: 0, removed: 0, changed: 0, unchanged: 0 };
  for (const result of results) resultCounts[result.status]++;

  return {
    firstCheck: base === null,
    resultsCompared,
    cells,
    results,
    record,
    summary: {
      cells: cellCounts,
      results: resultCounts,
      criteriaFlipped: results.filter((r) => r.flipped).length,
      recordChanges: record.fields.length + record.inputs.length + record.assumptions.length + record.references.length,
      attachmentChanges: record.attachments.length,
    },
  };
}

// ---------------------------------------------------------------------------------------------------
// Word diff

/** Words, numbers (with decimals and exponent), runs of spaces, line breaks, any other character. */
const TOKEN = /\r?\n|[^\S\r\n]+|(?:\d+(?:\.\d+)?|\.\d+)(?:[eE][+-]?\d+)?|[\p{L}\p{M}\p{N}_]+|[^]/gu;
const MAX_EDIT_TOKENS = 2000;

function tokenize(text: string): string[] {
  return text.match(TOKEN) ?? [];
}

/**
 * Word-level diff of two texts (see `compareVersions` for the tokens). Pieces come in text order; in
 * each run of changes, one removed piece then one added piece.
 */
export function wordDiff(oldText: string, newText: string): DiffPiece[] {
  if (oldText === newText) return oldText === '' ? [] : [{ text: oldText }];
  const changes = diffArrays(tokenize(oldText), tokenize(newText), { maxEditLength: MAX_EDIT_TOKENS });
  if (!changes)
    return [
      ...(oldText ? [{ text: oldText, removed: true as const }] : []),
      ...(newText ? [{ text: newText, added: true as const }] : []),
    ];

  const pieces: DiffPiece[] = [];
  let removed = '';
  let added = '';
  const flush = () => {
    // Spaces folded into both sides at the edges of a change go back to the common text.
    let lead = '';
    let trail = '';
    if (removed && added) {
      lead = sharedSpaces(removed, added, false);
      removed = removed.slice(lead.length);
      added = added.slice(lead.length);
      trail = sharedSpaces(removed, added, true);
      removed = removed.slice(0, removed.length - trail.length);
      added = added.slice(0, added.length - trail.length);
    }
    if (lead) pieces.push({ text: lead });
    if (removed) pieces.push({ text: removed, removed: true });
    if (added) pieces.push({ text: added, added: true });
    if (trail) pieces.push({ text: trail });
    removed = '';
    added = '';
  };
  changes.forEach((change, i) => {
    const text = change.value.join('');
    if (change.removed) removed += text;
    else if (change.added) added += text;
    else {
      const inChange = removed !== '' || added !== '';
      const next = changes[i + 1];
      // Spaces between two changed words on one line read better inside the change.
      if (inChange && next && (next.added || next.removed) && /^[^\S\r\n]+$/.test(text)) {
        removed += text;
        added += text;
      } else {
        flush();
        pieces.push({ text });
      }
    }
  });
  flush();
  // Join neighbouring common pieces (a common run split by the folding above).
  const merged: DiffPiece[] = [];
  for (const piece of pieces) {
    const last = merged[merged.length - 1];
    if (last && !last.added && !last.removed && !piece.added && !piece.removed) last.text += piece.text;
    else merged.push(piece);
  }
  return merged;
}

/**
 * The spaces (no line breaks) both texts start with (`end` false) or end with (`end` true), or ''
 * when none, or when either text is nothing but spaces.
 */
function sharedSpaces(a: string, b: string, end: boolean): string {
  const edge = (t: string) => t.match(end ? /[^\S\r\n]*$/ : /^[^\S\r\n]*/)![0];
  const x = edge(a);
  const y = edge(b);
  if (x.length === a.length || y.length === b.length) return '';
  let n = 0;
  const max = Math.min(x.length, y.length);
  while (n < max && (end ? x[x.length - 1 - n] === y[y.length - 1 - n] : x[n] === y[n])) n++;
  return end ? x.slice(x.length - n) : x.slice(0, n);
}

// ---------------------------------------------------------------------------------------------------
// Cells

function compareCells(baseCells: VersionContent['cells'], targetCells: VersionContent['cells']): CellComparison[] {
  const baseById = new Map(baseCells.map((cell, index) => [cell.id, { cell, index }]));
  const targetIds = new Set(targetCells.map((cell) => cell.id));

  const sharedInBaseOrder = baseCells.filter((c) => targetIds.has(c.id)).map((c) => c.id);
  const sharedInTargetOrder = targetCells.filter((c) => baseById.has(c.id)).map((c) => c.id);
  const inPlace = new Set<string>();
  for (const change of diffArrays(sharedInBaseOrder, sharedInTargetOrder)) {
    if (!change.added && !change.removed) for (const id of change.value) inPlace.add(id);
  }

  // Removed cells, grouped by the in-place cell they follow in the base ('' = the start).
  const removedAfter = new Map<string, CellComparison[]>();
  let anchor = '';
  baseCells.forEach((cell, index) => {
    if (inPlace.has(cell.id)) anchor = cell.id;
    else if (!targetIds.has(cell.id)) {
      const entry: CellComparison = {
        id: cell.id,
        status: 'removed',
        kind: cell.kind,
        baseKind: cell.kind,
        baseIndex: index,
        targetIndex: null,
        moved: false,
        sourceDiff: cell.source ? [{ text: cell.source, removed: true }] : [],
      };
      removedAfter.set(anchor, [...(removedAfter.get(anchor) ?? []), entry]);
    }
  });

  const out: CellComparison[] = [...(removedAfter.get('') ?? [])];
  targetCells.forEach((cell, index) => {
    const old = baseById.get(cell.id);
    if (!old) {
      out.push({
        id: cell.id,
        status: 'added',
        kind: cell.kind,
        baseKind: null,
        baseIndex: null,
        targetIndex: index,
        moved: false,
        sourceDiff: cell.source ? [{ text: cell.source, added: true }] : [],
      });
      return;
    }
    const moved = !inPlace.has(cell.id);
    const changed = old.cell.source !== cell.source || old.cell.kind !== cell.kind;
    out.push({
      id: cell.id,
      status: changed ? 'changed' : moved ? 'moved' : 'unchanged',
      kind: cell.kind,
      baseKind: old.cell.kind,
      baseIndex: old.index,
      targetIndex: index,
      moved,
      sourceDiff: changed ? wordDiff(old.cell.source, cell.source) : null,
    });
    if (!moved) out.push(...(removedAfter.get(cell.id) ?? []));
  });
  return out;
}

// ---------------------------------------------------------------------------------------------------
// Results

interface KeyedStatement {
  key: string;
  type: 'value' | 'criterion';
  name: string;
  cellId: string;
  statement: StatementResult;
}

/** Keys `base`, `base#2`, `base#3`, … so that repeated keys match k-th with k-th. */
function occurrenceKeyer(): (key: string) => string {
  const seen = new Map<string, number>();
  return (key) => {
    const n = (seen.get(key) ?? 0) + 1;
    seen.set(key, n);
    return n === 1 ? key : `${key}#${n}`;
  };
}

function keyedStatements(results: SheetResult | null): KeyedStatement[] {
  if (!results) return [];
  const keyOf = occurrenceKeyer();
  const out: KeyedStatement[] = [];
  for (const cell of results.cells) {
    for (const statement of cell.statements) {
      if (statement.kind === 'criterion') {
        out.push({
          key: keyOf(`criterion:${cell.id}:${statement.source}`),
          type: 'criterion',
          name: statement.source,
          cellId: cell.id,
          statement,
        });
      } else if (statement.name !== null) {
        out.push({
          key: keyOf(`value:${statement.name}`),
          type: 'value',
          name: statement.name,
          cellId: cell.id,
          statement,
        });
      }
    }
  }
  return out;
}

function finiteOrNull(x: number | null | undefined): number | null {
  return typeof x === 'number' && Number.isFinite(x) ? x : null;
}

function snapshotOf(entry: KeyedStatement): ResultSnapshot {
  const { statement } = entry;
  const value: DisplayValue | null = statement.value;
  if (entry.type === 'criterion') {
    return {
      text: statement.criterion?.marginText ?? '',
      number: finiteOrNull(statement.criterion?.margin),
      unit: null,
      kind: value?.kind ?? null,
      error: statement.error,
    };
  }
  return {
    text: value?.text ?? '',
    number: finiteOrNull(value?.number),
    unit: value?.unit ?? null,
    kind: value?.kind ?? null,
    error: statement.error,
  };
}

function passOf(entry: KeyedStatement | undefined): boolean | null {
  if (!entry || entry.statement.error !== null) return null;
  return entry.statement.criterion?.pass ?? null;
}

function compareResults(base: SheetResult | null, target: SheetResult | null): ResultComparison[] {
  const baseEntries = keyedStatements(base);
  const targetEntries = keyedStatements(target);
  const baseByKey = new Map(baseEntries.map((e) => [e.key, e]));
  const targetKeys = new Set(targetEntries.map((e) => e.key));

  const build = (oldEntry: KeyedStatement | undefined, newEntry: KeyedStatement | undefined): ResultComparison => {
    const entry = (newEntry ?? oldEntry)!;
    const oldSnap = oldEntry ? snapshotOf(oldEntry) : null;
    const newSnap = newEntry ? snapshotOf(newEntry) : null;
    const passOld = entry.type === 'criterion' ? passOf(oldEntry) : null;
    const passNew = entry.type === 'criterion' ? passOf(newEntry) : null;

    let relativeChange: number | null = null;
    let unitChanged = false;
    if (entry.type === 'value' && oldSnap && newSnap) {
      if (oldSnap.kind === 'quantity' && newSnap.kind === 'quantity' && oldSnap.unit !== newSnap.unit)
        unitChanged = true;
      else if (oldSnap.number !== null && newSnap.number !== null && oldSnap.unit === newSnap.unit) {
        if (oldSnap.number !== 0)
          relativeChange = finiteOrNull((newSnap.number - oldSnap.number) / Math.abs(oldSnap.number));
        else if (newSnap.number === 0) relativeChange = 0;
      }
    }

    let status: ResultStatus;
    if (!oldSnap) status = 'added';
    else if (!newSnap) status = 'removed';
    else {
      const same =
        oldSnap.text === newSnap.text &&
        Object.is(oldSnap.number, newSnap.number) &&
        oldSnap.unit === newSnap.unit &&
        oldSnap.kind === newSnap.kind &&
        oldSnap.error === newSnap.error &&
        passOld === passNew;
      status = same ? 'unchanged' : 'changed';
    }

    return {
      key: entry.key,
      type: entry.type,
      name: entry.name,
      cellId: entry.cellId,
      status,
      old: oldSnap,
      new: newSnap,
      relativeChange,
      unitChanged,
      passOld,
      passNew,
      flipped: passOld !== null && passNew !== null && passOld !== passNew,
    };
  };

  // Target order, each removed result after the result before it in the base (as for cells).
  const removedAfter = new Map<string, ResultComparison[]>();
  let anchor = '';
  for (const entry of baseEntries) {
    if (targetKeys.has(entry.key)) anchor = entry.key;
    else removedAfter.set(anchor, [...(removedAfter.get(anchor) ?? []), build(entry, undefined)]);
  }
  const out: ResultComparison[] = [...(removedAfter.get('') ?? [])];
  for (const entry of targetEntries) {
    out.push(build(baseByKey.get(entry.key), entry));
    out.push(...(removedAfter.get(entry.key) ?? []));
  }
  return out;
}

// ---------------------------------------------------------------------------------------------------
// Record and attachments

function compareField(
  field: RecordFieldName,
  oldValue: string | number | boolean | null,
  newValue: string | number | boolean,
  isText: boolean,
): RecordFieldChange | null {
  if (oldValue === newValue) return null;
  const diff = isText ? wordDiff(typeof oldValue === 'string' ? oldValue : '', String(newValue)) : null;
  return { field, old: oldValue, new: newValue, diff };
}

/**
 * Matches two lists by key (k-th occurrence with k-th), in target order with removed items after
 * them in base order; lists the added, removed and changed items.
 */
function compareList<T, F extends string>(
  oldItems: T[],
  newItems: T[],
  keyOf: (item: T) => string,
  fields: readonly F[],
  fieldOf: (item: T, field: F) => unknown,
): ItemChange<T, F>[] {
  const oldKeyer = occurrenceKeyer();
  const newKeyer = occurrenceKeyer();
  const oldKeyed = oldItems.map((item) => ({ item, key: keyOf(item), match: oldKeyer(keyOf(item)) }));
  const newKeyed = newItems.map((item) => ({ item, key: keyOf(item), match: newKeyer(keyOf(item)) }));
  const oldByMatch = new Map(oldKeyed.map((o) => [o.match, o]));
  const newMatches = new Set(newKeyed.map((n) => n.match));

  const out: ItemChange<T, F>[] = [];
  for (const { item, key, match } of newKeyed) {
    const old = oldByMatch.get(match);
    if (!old) {
      out.push({ key, status: 'added', old: null, new: item, changedFields: [] });
      continue;
    }
    const changedFields = fields.filter((f) => fieldOf(old.item, f) !== fieldOf(item, f));
    if (changedFields.length) out.push({ key, status: 'changed', old: old.item, new: item, changedFields });
  }
  for (const { item, key, match } of oldKeyed) {
    if (!newMatches.has(match)) out.push({ key, status: 'removed', old: item, new: null, changedFields: [] });
  }
  return out;
}

function displayUnitsLabel(content: VersionContent): string {
  return DISPLAY_UNITS_LABEL[content.displayUnits ?? DISPLAY_UNITS_DEFAULT];
}

function compareRecord(
  base: VersionContent | null,
  target: VersionContent,
  tables: Readonly<Record<string, ComparedTable>>,
): RecordComparison {
  const fields = [
    compareField('title', base?.title ?? null, target.title, true),
    compareField('safetyRelated', base?.safetyRelated ?? null, target.safetyRelated, false),
    compareField('significantFigures', base?.significantFigures ?? null, target.significantFigures, false),
    // Compared as shown: a version saved before the setting existed shows SI units.
    compareField('displayUnits', base ? displayUnitsLabel(base) : null, displayUnitsLabel(target), false),
    compareField('objective', base?.record.objective ?? null, target.record.objective, true),
    compareField('method', base?.record.method ?? null, target.record.method, true),
    compareField('conclusions', base?.record.conclusions ?? null, target.record.conclusions, true),
  ].filter((f): f is RecordFieldChange => f !== null);

  const oldRecord = base?.record;
  return {
    fields,
    inputs: compareList(
      oldRecord?.inputs ?? [],
      target.record.inputs,
      (i) => i.name,
      ['value', 'source', 'sourceRevision'] as const,
      (i, f) => i[f],
    ),
    assumptions: compareList(
      oldRecord?.assumptions ?? [],
      target.record.assumptions,
      (a) => a.text,
      ['needsVerification'] as const,
      (a, f) => a[f],
    ),
    references: compareList<string, never>(
      oldRecord?.references ?? [],
      target.record.references,
      (r) => r,
      [],
      () => null,
    ),
    attachments: compareList(
      base?.attachments ?? [],
      target.attachments,
      (a) => a.name,
      ['sha256', 'mediaType', 'size'] as const,
      (a, f) => a[f],
    ).map((change) => {
      const oldTable = change.old ? (tables[change.old.sha256] ?? null) : null;
      const newTable = change.new ? (tables[change.new.sha256] ?? null) : null;
      return { ...change, table: oldTable || newTable ? compareTables(oldTable, newTable) : null };
    }),
  };
}

/**
 * Row/column diff of two CSV data tables (either may be null: absent, or not a table). See
 * `compareVersions` for the rules.
 */
export function compareTables(oldTable: ComparedTable | null, newTable: ComparedTable | null): TableDiff {
  const oldCols = oldTable?.columns ?? [];
  const newCols = newTable?.columns ?? [];
  const oldByName = new Map(oldCols.map((c) => [c.name, c]));
  const newNames = new Set(newCols.map((c) => c.name));
  const columns: TableColumnChange[] = [
    ...newCols.map((c): TableColumnChange => {
      const old = oldByName.get(c.name);
      if (!old) return { name: c.name, status: 'added', oldUnit: null, newUnit: c.unit };
      return {
        name: c.name,
        status: old.unit === c.unit ? 'unchanged' : 'unitChanged',
        oldUnit: old.unit,
        newUnit: c.unit,
      };
    }),
    ...oldCols
      .filter((c) => !newNames.has(c.name))
      .map((c): TableColumnChange => ({ name: c.name, status: 'removed', oldUnit: c.unit, newUnit: null })),
  ];
  const shared = columns.filter((c) => c.status === 'unchanged' || c.status === 'unitChanged').map((c) => c.name);
  const newByName = new Map(newCols.map((c) => [c.name, c]));
  const oldCount = oldTable ? Math.min(oldTable.rows, ...oldCols.map((c) => c.values.length)) : 0;
  const newCount = newTable ? Math.min(newTable.rows, ...newCols.map((c) => c.values.length)) : 0;
  const rowValues = (byName: Map<string, ComparedTable['columns'][number]>, r: number) =>
    columns.map((c) => byName.get(c.name)?.values[r] ?? null);
  const keyOf = (byName: Map<string, ComparedTable['columns'][number]>, r: number) =>
    JSON.stringify(shared.map((n) => byName.get(n)!.values[r]));
  const oldKeys = Array.from({ length: oldCount }, (_, r) => keyOf(oldByName, r));
  const newKeys = Array.from({ length: newCount }, (_, r) => keyOf(newByName, r));

  const rows: TableRowChange[] = [];
  const rowCounts = { added: 0, removed: 0, changed: 0 };
  const push = (change: TableRowChange) => {
    rowCounts[change.status]++;
    if (rows.length < MAX_TABLE_ROW_CHANGES) rows.push(change);
  };
  const emitHunk = (removed: number[], added: number[]) => {
    const pairs = Math.min(removed.length, added.length);
    for (let k = 0; k < Math.max(removed.length, added.length); k++) {
      const o = k < removed.length ? removed[k] : null;
      const n = k < added.length ? added[k] : null;
      if (k < pairs && o !== null && n !== null) {
        const changedColumns = shared.filter(
          (name) => !Object.is(oldByName.get(name)!.values[o], newByName.get(name)!.values[n]),
        );
        push({
          status: 'changed',
          oldRow: o + 1,
          newRow: n + 1,
          old: rowValues(oldByName, o),
          new: rowValues(newByName, n),
          changedColumns,
        });
      } else if (o !== null)
        push({
          status: 'removed',
          oldRow: o + 1,
          newRow: null,
          old: rowValues(oldByName, o),
          new: null,
          changedColumns: [],
        });
      else if (n !== null)
        push({
          status: 'added',
          oldRow: null,
          newRow: n + 1,
          old: null,
          new: rowValues(newByName, n),
          changedColumns: [],
        });
    }
  };

  // Tables have up to 10,000 rows each: a tighter bound on the diff's work than for cell sources.
  const changes = diffArrays(oldKeys, newKeys, { maxEditLength: MAX_TABLE_EDIT_ROWS });
  if (!changes) {
    // Too different to diff cheaply: row k against row k.
    const both = Math.min(oldCount, newCount);
    for (let r = 0; r < both; r++) if (oldKeys[r] !== newKeys[r]) emitHunk([r], [r]);
    emitHunk(
      Array.from({ length: Math.max(0, oldCount - both) }, (_, i) => both + i),
      Array.from({ length: Math.max(0, newCount - both) }, (_, i) => both + i),
    );
  } else {
    let o = 0;
    let n = 0;
    let removed: number[] = [];
    let added: number[] = [];
    for (const change of changes) {
      const count = change.value.length;
      if (change.removed) removed = [...removed, ...Array.from({ length: count }, (_, i) => o + i)];
      else if (change.added) added = [...added, ...Array.from({ length: count }, (_, i) => n + i)];
      else {
        emitHunk(removed, added);
        removed = [];
        added = [];
      }
      if (!change.added) o += count;
      if (!change.removed) n += count;
    }
    emitHunk(removed, added);
  }

  return {
    oldRows: oldTable ? oldCount : null,
    newRows: newTable ? newCount : null,
    columns,
    rows,
    rowCounts,
    truncated: rowCounts.added + rowCounts.removed + rowCounts.changed > rows.length,
  };
}

/**
 * The results' changes in words, naming only what happened: "results: 5 added", "results: 2 changed,
 * 1 removed", "no result changed" (a bare "Results changed: 0" above a table of added results read as
 * if nothing had).
 */
export function resultChangesText(results: Record<ResultStatus, number>): string {
  const parts = (['changed', 'added', 'removed'] as const)
    .filter((s) => results[s] > 0)
    .map((s) => `${results[s]} ${s}`);
  return parts.length ? `results: ${parts.join(', ')}` : 'no result changed';
}
