// What the engine returns for a sheet: per cell, per statement.

export interface CellInput {
  /** Stable id of the cell within its sheet. */
  id: string;
  kind: 'calc' | 'text';
  source: string;
}

export interface EvaluateOptions {
  /** Significant figures for display; full precision is kept in `value.number`. */
  significantFigures: number;
  /** Input tables from the sheet's CSV attachments, usable in cells as `table.column`. */
  tables?: InputTable[];
}

/** A table of numbers read from a CSV attachment: each column a name and an optional unit. */
export interface InputTable {
  /** The name cells use (from the file name): `beam_energies` for "beam-energies.csv". */
  name: string;
  /** SHA-256 of the attachment it was read from; the cache key of everything that uses it. */
  sha256: string;
  /** The attachment's file name, for messages. */
  fileName: string;
  columns: Array<{ name: string; unit: string | null; values: number[] }>;
}

export type ValueKind = 'quantity' | 'number' | 'boolean' | 'string' | 'matrix' | 'function' | 'other';

export interface DisplayValue {
  kind: ValueKind;
  /** Display text, rounded to the sheet's significant figures: "2.429 68 T·m". */
  text: string;
  /** The same as TeX. */
  tex: string;
  /** Machine-readable value at full double precision, in `unit` (never rounded for display). */
  number: number | null;
  /** The unit of `number`, in mathjs syntax ("T m", "MeV", "m / s"), or null for plain numbers. */
  unit: string | null;
  /** For booleans, strings and anything that is not a number. */
  raw: string | boolean | null;
}

export interface CriterionResult {
  pass: boolean;
  /** How the comparison was made: exactly, on the SI values, without mathjs's relative tolerance. */
  comparison: 'exact';
  /** Relative margin to the limit (positive when the criterion passes), or null when undefined. */
  margin: number | null;
  marginText: string;
}

export interface StatementResult {
  /** 1-based line in the cell. */
  line: number;
  source: string;
  kind: 'definition' | 'function' | 'expression' | 'criterion';
  /** The name defined, for definitions and functions. */
  name: string | null;
  /** The formula typeset. */
  tex: string;
  /** The formula with the input values substituted. */
  substitutedTex: string | null;
  value: DisplayValue | null;
  criterion: CriterionResult | null;
  error: string | null;
}

export interface CellResult {
  id: string;
  index: number;
  kind: 'calc' | 'text';
  ok: boolean;
  /** The first error of the cell, or why it could not be evaluated. */
  error: string | null;
  statements: StatementResult[];
  /** Names this cell defines. */
  defines: string[];
  /** Names from other cells this cell uses. */
  uses: string[];
}

export interface SheetResult {
  ok: boolean;
  cells: CellResult[];
  engineVersion: string;
  constantsEdition: string;
  /** How many cells were evaluated now (the rest came from the cache). */
  evaluatedCells: number;
}
