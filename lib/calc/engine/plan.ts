// The plan of a sheet, made from its parsed cells before anything is evaluated: where each name is
// first defined, what kind of statement defines it, the sheet's own functions, the inputs that carry
// an uncertainty and their correlations, and for each calculation cell the names it reads and the
// part of its cache key that does not depend on evaluation (the rest, the keys of the names it
// reads, is added as the sheet is evaluated: run.ts), and the same for each name the cell defines.
import type { MathNode } from 'mathjs';
import type { EngineMath } from '../math-instance';
import { REFUSED_NAMES } from '../math-instance';
import { notDefined } from '../messages';
import { checkDefinitionName } from '../names';
import type { CellInput, InputTable, StatementResult } from '../types';
import type { ParsedStatement } from './statement';

type Position = { cell: number; line: number };

/**
 * A statement that first defines a name, and the part of that name's key known before evaluation
 * (sheet-engine.ts, `definitionKeys`): what its value, or its failure, depends on, without the other
 * statements of its cell.
 */
interface DefinitionPlan {
  name: string;
  /** Index of the statement among its cell's statements. */
  index: number;
  /** Its position and text, its form's key parts, and where the names it reads stand when not above it. */
  staticKey: string;
  /** Names it reads that are defined in a cell above (input tables included): their keys enter its key. */
  above: string[];
  /** Names it reads that are first defined on an earlier line of its own cell: their keys enter its key. */
  inCell: string[];
}

export interface CellPlan {
  /** Names the cell defines. */
  ownNames: string[];
  /** The statements of the cell that first define a name, in order. */
  definitions: DefinitionPlan[];
  /** Names the cell reads from outside itself, sorted (as `CellResult.uses`). */
  external: string[];
  /** Of `external`, those defined above the cell (input tables included): their cells' keys enter its key. */
  definedAbove: string[];
  /** The part of the cell's cache key known before evaluation. */
  staticKey: string;
  /**
   * The cell's key in the last evaluation and what it was made of (run.ts): when the keys of the
   * cells it reads are the same again, so is its key, and it is not hashed again.
   */
  lastKey: { settings: string; monteCarloUsed: number; inputs: string[]; key: string } | null;
}

export interface SheetPlan {
  parsed: ParsedStatement[][];
  tables: ReadonlyMap<string, InputTable>;
  /** Where each name is first defined (input tables at cell −1): to tell "defined below" from "undefined". */
  firstDefinition: ReadonlyMap<string, Position>;
  /** What the sheet's first definition of each name is: a value (`x = …`) cannot be called as `x(…)`. */
  definitionKindOf: ReadonlyMap<string, StatementResult['kind']>;
  /** The sheet's functions, to say what fails inside a call. */
  sheetFunctions: ReadonlyMap<string, { params: string[]; expr: MathNode }>;
  /** Inputs written with an uncertainty (and read without error). */
  staticallyUncertain: ReadonlySet<string>;
  /** Correlations between inputs: the first correlation(x, y, r) of each pair. */
  correlations: ReadonlyMap<string, { r: number; cell: number; line: number }>;
  pairKey(a: string, b: string): string;
  correlationOf(a: string, b: string): number;
  /** The names a statement reads: bare unit names and built-in function names the sheet defines count. */
  usesOf(st: ParsedStatement): readonly string[];
  /** The lint's finding for a name the sheet defines is dropped (the name is the sheet's quantity). */
  lintSilenced(name: string): boolean;
  /** Names a misspelt name may have meant. */
  messageNames: { candidates: () => string[]; caseCandidates: () => string[] };
  calledQuantityMessage(name: string): string;
  /** The correlations as part of every cell's key (they hold for every result). */
  correlationContext: string;
  cells: Array<CellPlan | null>;
  /** What the plan was made from, to make the next plan of the same sheet from it (`planSheet`). */
  basis: { sources: string[]; kinds: string[]; options: string; definitions: Array<string | null> };
}

/** Names a misspelt name is compared with: functions, mathematical values and units (any case). */
const builtinNameLists = new WeakMap<EngineMath, { names: string[]; units: string[] }>();
function builtinNamesOf(em: EngineMath): { names: string[]; units: string[] } {
  const known = builtinNameLists.get(em);
  if (known) return known;
  const math = em.math as unknown as Record<string, unknown>;
  const names = Object.keys(math).filter(
    (k) =>
      /^[a-z][A-Za-z0-9]*$/.test(k) &&
      !/Scalar$|Dependencies$|^create[A-Z]/.test(k) &&
      !REFUSED_NAMES.has(k) &&
      (em.isFunctionName(k) || em.isMathConstant(k)),
  );
  const units = (em.math.Unit as unknown as { UNITS: Record<string, { prefixes: Record<string, unknown> }> }).UNITS;
  const unitNames: string[] = [];
  for (const [name, u] of Object.entries(units))
    for (const p of Object.keys(u.prefixes ?? { '': 1 })) unitNames.push(p + name);
  const lists = { names, units: unitNames.filter((n) => em.isUnitName(n)) };
  builtinNameLists.set(em, lists);
  return lists;
}

export interface PlanOptions {
  tables: readonly InputTable[];
  /** The citations as resolved for this evaluation (their resolution is part of citing cells' keys). */
  references: readonly unknown[];
  /** Extra key parts of a statement, by its form (citations: their resolution). */
  formKeyParts: (st: ParsedStatement) => string[];
  monteCarloAlways: boolean;
}

/**
 * What a cell contributes to the sheet's plan beyond its own key: the names it defines, where and
 * how, its inputs with an uncertainty and its correlations; null when it defines a function (whose
 * body the sheet's messages quote).
 */
function definitionsOf(statements: ParsedStatement[]): string | null {
  let text = '';
  for (const st of statements) {
    if (st.kind === 'function') return null;
    if (st.defines) text += `${st.line}:${st.defines}:${st.kind}:${st.uncertain && !st.parseError && !st.staticError}|`;
    if (st.correlation) text += `${st.line}:~${st.correlation.a},${st.correlation.b},${st.correlation.r}|`;
  }
  return text;
}

/**
 * The plan of a sheet. Given the plan of the same sheet's previous evaluation, cells whose text is
 * unchanged keep their part of it when the edited cells define the same names at the same places
 * (the usual edit): the cost then follows the cells edited, not the sheet's length.
 */
export function planSheet(
  em: EngineMath,
  cells: CellInput[],
  parsed: ParsedStatement[][],
  options: PlanOptions,
  previous?: SheetPlan,
): SheetPlan {
  const basisOptions = JSON.stringify([
    options.tables.map((t) => [t.name, t.sha256, t.fileName]),
    options.references,
    options.monteCarloAlways,
  ]);
  if (previous && previous.basis.options === basisOptions && previous.basis.sources.length === cells.length) {
    const reused = replan(em, previous, cells, parsed, options);
    if (reused) return reused;
  }
  return planAnew(em, cells, parsed, options, basisOptions);
}

function replan(
  em: EngineMath,
  previous: SheetPlan,
  cells: CellInput[],
  parsed: ParsedStatement[][],
  options: PlanOptions,
): SheetPlan | null {
  const { basis } = previous;
  const changed: number[] = [];
  for (let ci = 0; ci < cells.length; ci++) {
    if (cells[ci].kind !== basis.kinds[ci]) return null;
    if (cells[ci].source !== basis.sources[ci]) {
      if (changed.length >= 16) return null;
      changed.push(ci);
    }
  }
  const definitions = basis.definitions.slice();
  for (const ci of changed) {
    const now = definitionsOf(parsed[ci]);
    if (now === null || now !== basis.definitions[ci]) return null;
    definitions[ci] = now;
  }
  const plan: SheetPlan = {
    ...previous,
    parsed,
    cells: previous.cells.slice(),
    basis: { sources: cells.map((c) => c.source), kinds: basis.kinds, options: basis.options, definitions },
  };
  for (const ci of changed) plan.cells[ci] = cells[ci].kind === 'text' ? null : cellPlanOf(em, plan, ci, options);
  return plan;
}

function planAnew(
  em: EngineMath,
  cells: CellInput[],
  parsed: ParsedStatement[][],
  options: PlanOptions,
  basisOptions: string,
): SheetPlan {
  const tables = new Map(options.tables.map((t) => [t.name, t]));
  const firstDefinition = new Map<string, Position>();
  for (const name of tables.keys()) firstDefinition.set(name, { cell: -1, line: 0 });
  const definitionKindOf = new Map<string, StatementResult['kind']>();
  const sheetFunctions = new Map<string, { params: string[]; expr: MathNode }>();
  const staticallyUncertain = new Set<string>();
  parsed.forEach((statements, ci) => {
    for (const st of statements) {
      if (!st.defines) continue;
      if (!firstDefinition.has(st.defines)) firstDefinition.set(st.defines, { cell: ci, line: st.line });
      if (!definitionKindOf.has(st.defines)) definitionKindOf.set(st.defines, st.kind);
      if (st.kind === 'function' && st.node && !sheetFunctions.has(st.defines))
        sheetFunctions.set(st.defines, { params: (st.node.params as string[]) ?? [], expr: st.node.expr! });
      if (st.uncertain && !st.parseError && !st.staticError) staticallyUncertain.add(st.defines);
    }
  });
  const pairKey = (a: string, b: string) => (a < b ? `${a}\0${b}` : `${b}\0${a}`);
  const correlations = new Map<string, { r: number; cell: number; line: number }>();
  parsed.forEach((statements, ci) => {
    for (const st of statements) {
      const c = st.correlation;
      if (c && staticallyUncertain.has(c.a) && staticallyUncertain.has(c.b) && !correlations.has(pairKey(c.a, c.b)))
        correlations.set(pairKey(c.a, c.b), { r: c.r, cell: ci, line: st.line });
    }
  });
  const correlationContext = correlations.size
    ? `correlations:${[...correlations].map(([k, v]) => `${k}=${v.r}`).join(';')}`
    : '';
  const messageNames = {
    candidates: () => [...firstDefinition.keys(), ...em.constants.keys(), ...builtinNamesOf(em).names],
    caseCandidates: () => builtinNamesOf(em).units,
  };
  const lintSilenced = (name: string) => firstDefinition.has(name) && checkDefinitionName(name, em) === null;
  const usesOf = (st: ParsedStatement) =>
    st.unitNamed.length || st.fnNamed.length
      ? [
          ...st.uses,
          ...st.unitNamed.filter((n) => firstDefinition.has(n)),
          ...st.fnNamed.filter((n) => firstDefinition.has(n)),
        ]
      : st.uses;

  const plan: SheetPlan = {
    parsed,
    tables,
    firstDefinition,
    definitionKindOf,
    sheetFunctions,
    staticallyUncertain,
    correlations,
    pairKey,
    correlationOf: (a: string, b: string) => (a === b ? 1 : (correlations.get(pairKey(a, b))?.r ?? 0)),
    usesOf,
    lintSilenced,
    messageNames,
    calledQuantityMessage(name) {
      if (tables.has(name))
        return `\`${name}\` is the input table read from ${tables.get(name)!.fileName}, not a function; read a column as ${name}.column`;
      const at = firstDefinition.get(name)!;
      const where = `cell ${at.cell + 1}, line ${at.line}`;
      if (em.isFunctionName(name)) {
        return `\`${name}\` is this sheet's own quantity (defined in ${where}), not a function: a sheet's definition takes precedence over the built-in function ${name} everywhere in the sheet; to call the built-in function, give the quantity another name (e.g. \`${name}_1\`)`;
      }
      return `\`${name}\` is a quantity (defined in ${where}), not a function: write \`${name} * (…)\` for a product, or define a function such as f(x) = …`;
    },
    cells: [],
    basis: {
      sources: cells.map((c) => c.source),
      kinds: cells.map((c) => c.kind),
      options: basisOptions,
      definitions: parsed.map(definitionsOf),
    },
    correlationContext,
  };
  plan.cells = cells.map((cell, ci) => (cell.kind === 'text' ? null : cellPlanOf(em, plan, ci, options)));
  return plan;
}

/** A calculation cell's names and the part of its cache key known before evaluation. */
function cellPlanOf(em: EngineMath, plan: SheetPlan, ci: number, options: PlanOptions): CellPlan {
  const { firstDefinition, usesOf, lintSilenced, correlationContext } = plan;
  const statements = plan.parsed[ci];
  const ownNames: string[] = [];
  for (const st of statements) if (st.defines && !ownNames.includes(st.defines)) ownNames.push(st.defines);
  const used: string[] = [];
  for (const st of statements) for (const n of usesOf(st)) if (!used.includes(n)) used.push(n);
  if (used.length > 1) used.sort();
  const external: string[] = [];
  const definedAbove: string[] = [];
  const parts: string[] = [];
  for (const n of used) {
    const at = firstDefinition.get(n);
    const above = at !== undefined && at.cell < ci;
    if (above) definedAbove.push(n);
    if (ownNames.includes(n) && !above) continue;
    external.push(n);
    if (above) continue;
    // An undefined name's message suggests names of the sheet: the suggestion is part of the key.
    parts.push(`${n}=${whereNotAbove(em, plan, n)}`);
  }
  for (const n of ownNames) {
    const at = firstDefinition.get(n)!;
    parts.push(`own:${n}=${at.cell < ci ? `${at.cell}:${at.line}` : 'new'}`);
  }
  for (const st of statements) {
    if (st.form?.keyParts) parts.push(...options.formKeyParts(st));
    // A second correlation of a pair names where the first stands: that place is part of the key.
    if (st.correlation) {
      const first = plan.correlations.get(plan.pairKey(st.correlation.a, st.correlation.b));
      if (first) parts.push(`correlation-first:${first.cell}:${first.line}`);
    }
    // Whether the sheet defines a name the lint flags decides whether the warning shows.
    for (const f of st.lint) parts.push(`lint:${f.name}=${lintSilenced(f.name)}`);
    // Whether and where the sheet defines a unit name written after a number's unit with a space
    // (`1 T m`): the refusal names the definition's place.
    parts.push(...spacedParts(plan, st));
  }
  if (options.monteCarloAlways && ownNames.length) parts.push('monteCarlo:always');
  if (correlationContext) parts.push(correlationContext);
  const definitions: DefinitionPlan[] = [];
  statements.forEach((st, index) => {
    const at = st.defines ? firstDefinition.get(st.defines) : undefined;
    if (!at || at.cell !== ci || at.line !== st.line) return;
    const above: string[] = [];
    const inCell: string[] = [];
    const own = [`${ci}:${st.line}`, st.source];
    if (st.form?.keyParts) own.push(...options.formKeyParts(st));
    own.push(...spacedParts(plan, st));
    for (const n of usesOf(st)) {
      const from = firstDefinition.get(n);
      if (from && from.cell < ci) above.push(n);
      else if (from && from.cell === ci && from.line < st.line) inCell.push(n);
      else
        own.push(`${n}=${from && from.cell === ci && from.line === st.line ? 'itself' : whereNotAbove(em, plan, n)}`);
    }
    definitions.push({ name: st.defines!, index, staticKey: own.join('\0'), above, inCell });
  });
  return { ownNames, definitions, external, definedAbove, staticKey: parts.join('\0'), lastKey: null };
}

/**
 * Where a name read but not defined above stands, as its messages say it: defined later (its place,
 * and its kind, which decides whether calling it is "a quantity, not a function" or "used before it
 * is defined"), or not defined (the message suggests names of the sheet).
 */
function whereNotAbove(em: EngineMath, plan: SheetPlan, n: string): string {
  const at = plan.firstDefinition.get(n);
  if (at) return `later:${at.cell}:${at.line}:${plan.definitionKindOf.get(n)}`;
  return `undefined:${em.isFunctionName(n) ? '' : notDefined(n, plan.messageNames)}`;
}

/** Unit names written after a number's unit with a space, and where the sheet defines them, if it does. */
function spacedParts(plan: SheetPlan, st: ParsedStatement): string[] {
  const parts: string[] = [];
  for (const l of st.unitLiterals)
    for (const n of l.spacedNames ?? []) {
      const at = plan.firstDefinition.get(n);
      parts.push(`spaced:${n}=${at ? `${at.cell}:${at.line}` : 'none'}`);
    }
  return parts;
}
