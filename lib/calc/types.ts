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
  /**
   * The units results are shown in: 'si' (the default) or 'trade' (energies, momenta and masses at
   * particle scale in eV, eV/c, eV/c²; lib/calc/display-units.ts). Values are the same either way.
   */
  displayUnits?: 'si' | 'trade';
  /** Input tables from the sheet's CSV attachments, usable in cells as `table.column`. */
  tables?: InputTable[];
  /**
   * Named results of issued revisions of other sheets, as `fromRevision("PROJ-CALC-0003", "B", "Brho")`
   * cites them; resolved by the server before evaluating (the engine never reads the database).
   */
  references?: ResolvedReference[];
  /** Run the Monte Carlo propagation for every result with an uncertainty, not only non-linear ones. */
  monteCarlo?: 'auto' | 'always';
}

/** A citation of a named result of an issued revision, as written in a cell. */
export interface SheetReference {
  /** Sheet number, "TPT2-CALC-0003". */
  sheet: string;
  /** Revision code, "B". */
  revision: string;
  /** Name of the result in that revision. */
  name: string;
}

/** A citation resolved by the server: the value as issued, or why it cannot be used. */
export interface ResolvedReference extends SheetReference {
  value: { number: number; unit: string | null; uncertainty: number | null } | null;
  /** Why the value is not available (unknown sheet, revision not issued, withdrawn, no such name). */
  error: string | null;
  /** Status of the cited revision when it was resolved. */
  status: 'current' | 'superseded' | 'withdrawn' | null;
  /** The newer revision that superseded it, when there is one. */
  supersededBy: string | null;
  title: string | null;
  /** SHA-256 of the issued version's content. */
  versionSha256: string | null;
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

/** One input's part in a combined standard uncertainty (JCGM 100:2008, 5.1.3). */
export interface BudgetLine {
  /** The input's name in the sheet. */
  name: string;
  /** Its value and standard uncertainty as displayed: "250 MeV", "0.5 MeV". */
  valueText: string;
  uText: string;
  /** Sensitivity coefficient ∂f/∂x_i at full precision, in SI units of result per input, with its unit text. */
  sensitivity: number;
  sensitivityText: string;
  /** |c_i| u(x_i), in the result's display unit. */
  contribution: number;
  contributionText: string;
  /** Share of the combined variance, 0…1. */
  share: number;
}

/** Monte Carlo propagation of distributions (JCGM 101:2008) for one result. */
export interface MonteCarloSummary {
  trials: number;
  /** Draws for which the model could not be evaluated (outside a function's domain). */
  outOfDomain: number;
  seed: number;
  /** Mean, standard deviation and the probabilistically symmetric coverage interval (p = 95.45 %, as k = 2). */
  mean: number;
  u: number;
  low: number;
  high: number;
  /** Numerical tolerance the comparison allowed (JCGM 101, 8.2, widened by the Monte Carlo's own standard error). */
  tolerance: number;
  /** |y − U − low| and |y + U − high| (JCGM 101, 8.2). */
  dLow: number;
  dHigh: number;
  agrees: boolean;
  /** Same figures as text in the result's display unit. */
  text: string;
}

/** Uncertainty of a value: an input's own standard uncertainty, or one propagated to a result. */
export interface UncertaintyResult {
  kind: 'input' | 'propagated';
  /** Standard uncertainty u (input) or combined standard uncertainty u_c (result), in `unit`. */
  u: number;
  /** Expanded uncertainty U = k·u_c with k = 2, rounded to two significant digits (JCGM 100, 7.2.6). */
  U: number;
  k: 2;
  /** Display unit of u and U (the value's display unit), or null for plain numbers. */
  unit: string | null;
  /** "y ± U (k = 2)" with y rounded to the last digit of U: "1.2665 ± 0.0012 (k = 2)". */
  text: string;
  tex: string;
  /** Each input's contribution; empty for an input. */
  budget: BudgetLine[];
  /** Correlations between the inputs of the budget that entered the propagation (none: uncorrelated). */
  correlations?: Array<{ a: string; b: string; r: number }>;
  /** True when the first-order (linear) approximation is poor over ±2u of some input. */
  nonLinear: boolean;
  monteCarlo: MonteCarloSummary | null;
  /** Shown beside the result: the two methods disagree, or draws fell outside the model's domain. */
  warning: string | null;
}

/** A parameter sweep: the results for each value of one input, by re-evaluating what depends on it. */
export interface StudyTable {
  /** The input swept and the results tabulated, each with the unit its numbers are in. */
  columns: Array<{ name: string; unit: string | null; tex: string }>;
  /** Numbers at full precision, one row per value of the input (null where that step failed). */
  rows: Array<Array<number | null>>;
  /** Why a step failed, per row (null when it evaluated). */
  errors: Array<string | null>;
}

/** Data of a plot, drawn in the app and in the PDF from the same numbers. */
export interface PlotData {
  kind: 'curve' | 'spacetime';
  x: { label: string; unit: string | null };
  y: { label: string; unit: string | null };
  /** Each series: a name and its points [x, y] in the axes' units (NaN-free; failed steps left out). */
  series: Array<{ name: string; points: Array<[number, number]> }>;
  /**
   * For space-time diagrams (x horizontal, ct vertical, one unit of length on both axes): light
   * lines at 45° through the origin, and horizon lines x = ct − d for each distance d given.
   */
  horizons?: Array<{ name: string; distance: number }>;
  /**
   * For curve plots: design limits, each a named result that does not depend on the plot's input,
   * drawn as a horizontal line y = value (in the y axis' unit, the same conversion as the curves').
   */
  limits?: Array<{ name: string; value: number }>;
  /**
   * For curve plots: points of attached data tables (`dataPoints(table.x, table.y)`), drawn as
   * markers without a line; x and y in the axes' units (the table's own numbers when its column is
   * in the axis' unit).
   */
  data?: Array<{ name: string; x: string; y: string; points: Array<[number, number]> }>;
}

export interface StatementResult {
  /** 1-based line in the cell. */
  line: number;
  source: string;
  kind: 'definition' | 'function' | 'expression' | 'criterion' | 'sweep' | 'plot';
  /** The name defined, for definitions and functions. */
  name: string | null;
  /** The formula typeset. */
  tex: string;
  /** The formula with the input values substituted. */
  substitutedTex: string | null;
  value: DisplayValue | null;
  criterion: CriterionResult | null;
  error: string | null;
  /**
   * Warnings of the physics lint (lib/calc/lint.ts): a name read as a unit or a mathematical
   * constant where a physical constant is likely meant. The statement is evaluated as written.
   * Absent in results stored before warnings existed: read absent as none.
   */
  warnings?: string[];
  /** Standard or propagated uncertainty, when the value carries one. */
  uncertainty?: UncertaintyResult | null;
  /** Results of other sheets' issued revisions this statement uses, with their status then. */
  references?: ResolvedReference[];
  /** For `sweep(…)`. */
  table?: StudyTable | null;
  /** For `plot(…)` and `spacetime(…)`. */
  plot?: PlotData | null;
}

export interface CellResult {
  id: string;
  index: number;
  kind: 'calc' | 'text';
  ok: boolean;
  /** The first error of the cell, or why it could not be evaluated. */
  error: string | null;
  statements: StatementResult[];
  /** The statements' warnings, each as "line N: …" (absent in results stored before warnings existed: none). */
  warnings?: string[];
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
