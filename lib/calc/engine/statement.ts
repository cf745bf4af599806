// What the engine knows of one statement (one line of a calculation cell) after parsing, and the
// interface every statement form implements (lib/calc/engine/forms/: one file per form).
import type { MathNode } from 'mathjs';
import type { EngineMath } from '../math-instance';
import type { LintFinding } from '../lint';
import type { ResolvedReference, SheetReference, StatementResult } from '../types';
import type { StudyStatement } from '../study-functions';
import type { UnitLiteral } from '../unit-literals';
import type { CellRun, SheetRun } from './run';

export type AnyNode = MathNode & {
  type: string;
  name?: string;
  op?: string;
  fn?: AnyNode | string;
  args?: AnyNode[];
  object?: AnyNode;
  index?: unknown;
  value?: AnyNode;
  params?: AnyNode[] | string[];
  expr?: AnyNode;
  conditionals?: string[];
  implicit?: boolean;
};

export interface ParsedStatement {
  line: number;
  source: string;
  node: AnyNode | null;
  parseError: string | null;
  /** The form that recognised the statement (null when it could not be read). */
  form: StatementForm | null;
  kind: StatementResult['kind'];
  /** Name defined by this statement (definitions and functions). */
  defines: string | null;
  /** Free names it uses (sheet names; units, functions and built-in constants excluded). */
  uses: string[];
  /** Bare names that are also units: quantities where the sheet defines them, units otherwise. */
  unitNamed: string[];
  /** Names called as functions that are built-in functions: the sheet's own where it defines them (names.ts). */
  fnNamed: string[];
  /** Every name called as a function (`f(x)`), to refuse calling a quantity. */
  calls: string[];
  /** Unit expressions written after numbers and after `to`, bound to placeholder symbols. */
  unitLiterals: UnitLiteral[];
  /** A problem found without evaluating (unknown unit in a conversion, a bad assignment target). */
  staticError: string | null;
  /** `table.column` reads, checked against the input tables before evaluating. */
  columns: Array<{ table: string; column: string }>;
  /** A definition `x = value ± u` (or `uncertain(value, u)`): an input with a standard uncertainty. */
  uncertain: boolean;
  /** A definition `x = fromRevision("SHEET", "REV", "name")`: a cited result of another sheet. */
  reference: SheetReference | null;
  /** `correlation(x, y, r)`: the correlation coefficient of two uncertain inputs. */
  correlation: { a: string; b: string; r: number } | null;
  /** `sweep(…)`, `plot(…)` or `spacetime(…)`: the input swept and the results named. */
  study: {
    kind: StudyStatement;
    input: string;
    targets: string[];
    /** `dataPoints(table.x, table.y)` arguments of a plot: columns of input tables. */
    overlays: Array<{ x: { table: string; column: string }; y: { table: string; column: string } }>;
  } | null;
  /** Names read as a unit or mathematical constant where a physical constant is likely meant (lint.ts). */
  lint: LintFinding[];
  /** The compiled expression the form evaluates, made on first use and kept with the parsed statement. */
  compiled?: { evaluate(scope: Map<string, unknown>): unknown };
  /**
   * The statement's formula typeset, with which of its names were values when it was made: the
   * same text reads the same wherever those names are values again (present.ts).
   */
  texMemo?: { values: string; tex: string };
  /** Further compiled parts a form evaluates (a criterion's operands), made on first use. */
  compiledParts?: Array<{ evaluate(scope: Map<string, unknown>): unknown }>;
}

export function blankStatement(line: number, source: string): ParsedStatement {
  return {
    line,
    source,
    node: null,
    parseError: null,
    form: null,
    kind: 'expression',
    defines: null,
    uses: [],
    unitNamed: [],
    fnNamed: [],
    calls: [],
    unitLiterals: [],
    staticError: null,
    columns: [],
    uncertain: false,
    reference: null,
    correlation: null,
    study: null,
    lint: [],
  };
}

/** What a statement's share of its cell's cache key may depend on besides the statement. */
interface KeyContext {
  /** The citations as the server resolved them for this evaluation. */
  resolved: ReadonlyMap<string, ResolvedReference>;
}

/**
 * A statement form: how one kind of statement is recognised, what it adds to its cell's cache key,
 * and how it is evaluated. Adding a form is adding a file to forms/ and listing it in forms/index.ts.
 */
export interface StatementForm {
  /** Name of the form (for messages and the guide). */
  readonly name: string;
  /**
   * Recognises the parsed statement: true when it is this form (the form then sets `kind`, what it
   * defines and its static errors). `node` is the statement's parsed tree.
   */
  recognise(st: ParsedStatement, node: AnyNode, em: EngineMath): boolean;
  /** The form's share of its cell's cache key, beyond text, position and the names it uses. */
  keyParts?(st: ParsedStatement, context: KeyContext): string[];
  /**
   * Evaluates the statement (its uses are known to be available): stores what it defines in the
   * run's scope and the cell's values, sets form-specific fields of `result`, returns the value.
   */
  evaluate(st: ParsedStatement, run: SheetRun, cell: CellRun, result: StatementResult): unknown;
  /** Its value is a result: refused when non-finite, shown with its substitution, given an uncertainty. */
  readonly yieldsValue: boolean;
  /** Its value is shown (criteria and correlations are shown without being checked as results). */
  readonly shown: boolean;
  /** The tree an error message takes apart, and whose value is checked for non-finite results. */
  messageNode(st: ParsedStatement): AnyNode;
  /** Whether an error message may point into the formula (not for sweeps, correlations, citations). */
  readonly locatesErrors: boolean;
}

/** The name of the function a call node calls, when it is a plain name. */
export function calledName(node: AnyNode): string | null {
  return node.type === 'FunctionNode' && (node.fn as AnyNode)?.type === 'SymbolNode'
    ? (node.fn as AnyNode).name!
    : null;
}

/**
 * The statement compiled. Kept with the parsed statement (cached by its cell's text) only by the
 * chain that re-evaluates it many times (sweeps, uncertainty: `keep`) and, so that the chain finds it,
 * by the evaluation of an uncertain input and of a definition below one; otherwise an evaluation of
 * the sheet compiles it afresh, since a compiled statement weighs more than its parse and the caches
 * hold tens of thousands.
 */
export function compiledOnce(st: ParsedStatement, node: () => AnyNode, keep = false) {
  if (st.compiled) return st.compiled;
  const compiled = node().compile();
  if (keep) st.compiled = compiled;
  return compiled;
}
