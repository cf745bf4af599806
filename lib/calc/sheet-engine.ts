// Sheet evaluation: cells in order, one statement per line, names defined once and only above their
// use, errors kept to the cell (and the statements that depend on it), design criteria compared
// exactly, and a content-addressed cache so that re-evaluating after an edit only evaluates the
// edited cell and what depends on it.
import { createHash } from 'node:crypto';
import type { MathJsInstance, MathNode, Unit } from 'mathjs';
import { CONSTANTS, CONSTANTS_EDITION } from './constants';
import { displayValue, formatNumberTex, formatNumberText, unitTexOf } from './format';
import { LIBRARY } from './functions';
import { bindLibrary } from './library-adapter';
import { bidiRefusalReason, findBidiControl } from './bidi-controls';
import { createEngineMath, REFUSED_NAMES, type EngineMath } from './math-instance';
import { checkDefinitionName } from './names';
import { NAME_CHAR, NAME_START } from './name-syntax';
import { formulaTex, substitutedTex, substitutionTex, type TexContext } from './tex';
import type {
  CellInput,
  CellResult,
  CriterionResult,
  DisplayValue,
  EvaluateOptions,
  InputTable,
  SheetReference,
  SheetResult,
  StatementResult,
} from './types';
import { REFERENCE_FUNCTION, referenceKey, stripComment } from './references';
import {
  computeStudy,
  inputUncertainty,
  MONTE_CARLO_PER_SHEET,
  propagateUncertainty,
  Reevaluator,
  siOf,
  type ChainStatement,
} from './studies';
import { STUDY_STATEMENTS, studyBindings, type StudyStatement } from './study-functions';
import { ENGINE_VERSION } from './version';
import { installSizeGuards, LIMITS } from './limits';
import { extractUnitLiterals, UNIT_PLACEHOLDER_PREFIX, type UnitLiteral } from './unit-literals';
import { lintExpression, type LintFinding } from './lint';
import { describeOperand, engineerMessage, notDefined, parseMessage } from './messages';
import { nonFiniteReason } from './non-finite';
import { DISPLAY_UNITS_DEFAULT, setDisplayUnits, tradeDisplay } from './display-units';

type AnyNode = MathNode & {
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

const RELATIONAL_FNS: Record<string, (a: number, b: number) => boolean> = {
  smaller: (a, b) => a < b,
  larger: (a, b) => a > b,
  smallerEq: (a, b) => a <= b,
  largerEq: (a, b) => a >= b,
  equal: (a, b) => a === b,
  unequal: (a, b) => a !== b,
};

interface ParsedStatement {
  line: number;
  source: string;
  node: AnyNode | null;
  parseError: string | null;
  kind: StatementResult['kind'];
  /** Name defined by this statement (definitions and functions). */
  defines: string | null;
  /** Free names it uses (sheet names; units, functions and built-in constants excluded). */
  uses: string[];
  /** Bare names that are also units: quantities where the sheet defines them, units otherwise. */
  unitNamed: string[];
  /** Names called as functions that are built-in functions: the sheet's own where it defines them (names.ts). */
  fnNamed?: string[];
  /** Every name called as a function (`f(x)`), to refuse calling a quantity. */
  calls?: string[];
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
  correlation?: { a: string; b: string; r: number };
  /** `sweep(…)`, `plot(…)` or `spacetime(…)`: the input swept and the results named. */
  study: { kind: StudyStatement; input: string; targets: string[] } | null;
  /** Names read as a unit or mathematical constant where a physical constant is likely meant (lint.ts). */
  lint?: LintFinding[];
  /** The compiled right-hand side (definitions) or statement (functions), made on first use. */
  compiled?: { evaluate(scope: Map<string, unknown>): unknown };
}

/**
 * `x = value ± u` written as `x = uncertain(value, u)` for the parser; a `±` anywhere else is refused.
 * Returns the line unchanged when it holds no `±`.
 */
function rewritePlusMinus(line: string): { text: string; error: string | null } {
  // `+/-` is read as `±` for keyboards without it (it means nothing else in a formula).
  const text = line.includes('+/-') ? line.replace(/\+\/-/g, '±') : line;
  if (!text.includes('±')) return { text, error: null };
  const m = new RegExp(`^\\s*([${NAME_START}][${NAME_CHAR}]*)\\s*=(?!=)([^±]+)±([^±]+)$`).exec(text);
  if (!m || /["']/.test(text))
    return { text, error: '± gives an input its standard uncertainty: write name = value ± u, one ± per line' };
  return { text: `${m[1]} = uncertain(${m[2].trim()}, ${m[3].trim()})`, error: null };
}

function messageOf(error: unknown): string {
  const text = error instanceof Error ? error.message : String(error);
  return text.length > 500 ? `${text.slice(0, 500)}…` : text;
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

export interface SheetEngine {
  readonly em: EngineMath;
  evaluate(cells: CellInput[], options: EvaluateOptions, hooks?: EvaluateHooks): SheetResult;
  /** Number of cached cell results (for tests and benchmarks). */
  cacheSize(): number;
  clearCache(): void;
}

interface EvaluateHooks {
  /** Called before a cell is evaluated (not for cache hits); the sandbox uses it to know which cell runs. */
  onCellStart?: (index: number) => void;
  /** Cells not to evaluate, with the reason (set by the sandbox after a cell exceeded a limit). */
  skip?: ReadonlyMap<string, string>;
  /**
   * Partition of the cell cache (the server passes the project): a cell is answered from the cache
   * only for a sheet of the same scope, so no one learns another project's cells from a fast answer.
   */
  cacheScope?: string;
}

interface CachedCell {
  result: CellResult;
  values: Map<string, unknown>;
  failed: Map<string, string>;
  /** TeX of each defined value as substituted into later formulas, made once when cached. */
  substitutions: Array<[string, string]>;
  /** Standard uncertainties of the inputs the cell defines (`x = value ± u`). */
  uncertainties: Map<string, unknown>;
  /** Monte Carlo propagations the cell asked for (run or refused), counted towards the sheet's share. */
  monteCarloRequests: number;
}

export function createSheetEngine(): SheetEngine {
  // The library is bound to a mathjs instance that exists before the engine instance: the adapter
  // only needs `unit`, `isUnit` and `matrix`, which do not depend on the later configuration.
  const bootstrap = createEngineMath([]);
  const em: EngineMath = createEngineMath(
    [...bindLibrary(bootstrap.math, LIBRARY), ...studyBindings(bootstrap.math)],
    installSizeGuards,
  );
  const math: MathJsInstance = em.math;

  const parseCache = new Map<string, ParsedStatement[]>();
  // Valueless units are never changed by arithmetic (it returns new units), so one per string serves all.
  const unitLiteralCache = new Map<string, Unit>();
  const unitLiteral = (text: string): Unit => {
    let u = unitLiteralCache.get(text);
    if (!u) {
      u = math.unit(text);
      if (unitLiteralCache.size < 10_000) unitLiteralCache.set(text, u);
    }
    return u;
  };
  const cellCache = new Map<string, CachedCell>();
  // An input table's value (columns as vectors of quantities), built once per attachment content.
  const tableCache = new Map<string, Record<string, unknown>>();
  const tableValue = (table: InputTable): Record<string, unknown> => {
    const key = `${table.sha256}\0${table.name}`;
    let value = tableCache.get(key);
    if (!value) {
      value = {};
      for (const column of table.columns) {
        const template = column.unit ? math.unit(1, column.unit) : null;
        const offset = template?.units.some((u) => (u.unit as unknown as { offset: number }).offset !== 0) ?? false;
        value[column.name] = math.matrix(
          column.values.map((v) => {
            if (!template) return v;
            if (offset) return math.unit(v, column.unit!);
            const u = template.clone();
            // Same as math.unit(v, unit), without parsing the unit again for every row.
            (u as unknown as { value: number }).value = (template.value as number) * v;
            return u;
          }),
        );
      }
      remember(tableCache, key, value, 50);
    }
    return value;
  };

  function remember<K, V>(map: Map<K, V>, key: K, value: V, max: number): void {
    if (map.size >= max) map.delete(map.keys().next().value as K);
    map.set(key, value);
  }

  function analyse(node: AnyNode, statement: ParsedStatement): void {
    const uses = new Set<string>();
    const unitNamed = new Set<string>();
    const fnNamed = new Set<string>();
    const calls = new Set<string>();
    const visit = (n: AnyNode, locals: ReadonlySet<string>) => {
      switch (n.type) {
        case 'SymbolNode': {
          const name = n.name!;
          if (REFUSED_NAMES.has(name)) {
            statement.staticError ??= `The function ${name} is not available in calculation sheets.`;
            return;
          }
          if (
            name.startsWith(UNIT_PLACEHOLDER_PREFIX) ||
            locals.has(name) ||
            em.constants.has(name) ||
            em.isMathConstant(name)
          )
            return;
          if (em.isUnitName(name)) unitNamed.add(name);
          else uses.add(name);
          return;
        }
        case 'FunctionNode': {
          const fn = n.fn as AnyNode;
          if (fn && fn.type === 'SymbolNode') {
            const name = fn.name!;
            if (REFUSED_NAMES.has(name)) {
              statement.staticError ??= `The function ${name} is not available in calculation sheets.`;
              return;
            }
            if (!locals.has(name)) {
              calls.add(name);
              if (em.isFunctionName(name)) fnNamed.add(name);
              else uses.add(name);
            }
          } else if (fn) visit(fn, locals);
          for (const a of n.args ?? []) visit(a, locals);
          return;
        }
        case 'OperatorNode': {
          if ((n.op === 'to' || n.op === 'in') && n.args) {
            visit(n.args[0], locals);
            n.args[1].traverse((u: MathNode) => {
              const un = u as AnyNode;
              if (
                un.type === 'SymbolNode' &&
                !un.name!.startsWith(UNIT_PLACEHOLDER_PREFIX) &&
                !em.isUnitName(un.name!)
              ) {
                statement.staticError ??= `\`${un.name}\` after "${n.op}" is not a unit`;
              }
            });
            return;
          }
          for (const a of n.args ?? []) visit(a, locals);
          return;
        }
        case 'FunctionAssignmentNode': {
          const params = (n.params as string[]) ?? [];
          visit(n.expr!, new Set([...locals, ...params]));
          return;
        }
        case 'AccessorNode': {
          // `table.column` (a column of an input table) and `v[k]` (an element of a list).
          const index = n.index as { dotNotation?: boolean; dimensions?: AnyNode[] } | undefined;
          const object = n.object as AnyNode;
          if (index?.dotNotation && object.type !== 'SymbolNode') {
            statement.staticError ??= 'a column is read from an input table by its name: table.column';
            return;
          }
          visit(object, locals);
          if (index?.dotNotation) {
            const column = (index.dimensions?.[0] as { value?: unknown } | undefined)?.value;
            statement.columns.push({ table: object.name!, column: String(column) });
          }
          if (!index?.dotNotation) for (const d of index?.dimensions ?? []) visit(d, new Set([...locals, 'end']));
          return;
        }
        case 'AssignmentNode':
        case 'BlockNode':
          statement.staticError ??= 'only one plain statement per line is allowed here';
          return;
        default:
          n.forEach((child: MathNode) => visit(child as AnyNode, locals));
      }
    };
    visit(node, new Set());
    statement.uses = [...uses];
    statement.unitNamed = [...unitNamed];
    statement.fnNamed = [...fnNamed];
    statement.calls = [...calls];
  }

  function parseCell(source: string): ParsedStatement[] {
    const cached = parseCache.get(source);
    if (cached) return cached;
    if (source.length > LIMITS.maxCellSourceChars) {
      const out = [
        {
          line: 1,
          source: source.slice(0, 80),
          node: null,
          parseError: `the cell is longer than ${LIMITS.maxCellSourceChars} characters`,
          kind: 'expression' as const,
          defines: null,
          uses: [],
          unitNamed: [],
          unitLiterals: [],
          staticError: null,
          columns: [],
          uncertain: false,
          reference: null,
          study: null,
        },
      ];
      return out;
    }
    const statements: ParsedStatement[] = [];
    const lines = source.split(/\r?\n/);
    for (const [i, raw] of lines.entries()) {
      const text = stripComment(raw).trim();
      // A bidirectional control character, even in a comment, can make the line read differently
      // from what is evaluated (lib/calc/bidi-controls.ts): the line is an error, never evaluated.
      const control = findBidiControl(raw);
      if (!text && !control) continue;
      const st: ParsedStatement = {
        line: i + 1,
        source: raw.trim(),
        node: null,
        parseError: null,
        kind: 'expression',
        defines: null,
        uses: [],
        unitNamed: [],
        unitLiterals: [],
        staticError: null,
        columns: [],
        uncertain: false,
        reference: null,
        study: null,
      };
      statements.push(st);
      if (control) {
        st.parseError = bidiRefusalReason(control, false);
        continue;
      }
      if (statements.length > LIMITS.maxStatementsPerCell) {
        st.parseError = `a cell holds at most ${LIMITS.maxStatementsPerCell} statements`;
        break;
      }
      if (text.length > LIMITS.maxLineChars) {
        st.parseError = `a line holds at most ${LIMITS.maxLineChars} characters`;
        continue;
      }
      try {
        const pm = rewritePlusMinus(text);
        if (pm.error) {
          st.parseError = pm.error;
          continue;
        }
        const { text: rewritten, literals } = extractUnitLiterals(pm.text, em.isUnitName);
        st.unitLiterals = literals;
        st.node = em.parse(rewritten) as AnyNode;
      } catch (error) {
        // mathjs's position counts the unit placeholders; the message is said for the line as written.
        st.parseError = parseMessage(error, text, em.parse);
        continue;
      }
      const node = st.node;
      if (node.type === 'AssignmentNode') {
        const target = node.object!;
        if (target.type !== 'SymbolNode' || node.index) {
          st.staticError = 'only plain names can be defined (no indexes or properties)';
        } else {
          st.kind = 'definition';
          st.defines = target.name!;
          analyse(node.value!, st);
          const value = node.value!;
          const fnName =
            value.type === 'FunctionNode' && (value.fn as AnyNode)?.type === 'SymbolNode'
              ? (value.fn as AnyNode).name
              : null;
          if (fnName === 'uncertain') {
            if ((value.args?.length ?? 0) !== 2)
              st.staticError ??= 'write an input with its standard uncertainty as name = value ± u';
            else st.uncertain = true;
          } else if (fnName === REFERENCE_FUNCTION) {
            const args = (value.args ?? []).map((a) =>
              a.type === 'ConstantNode' ? (a as AnyNode & { value?: unknown }).value : undefined,
            );
            if (args.length !== 3 || !args.every((a) => typeof a === 'string' && (a as string).trim() !== '')) {
              st.staticError ??=
                'cite an issued result with three quoted texts: fromRevision("PROJ-CALC-0003", "B", "name")';
            } else {
              const [sheet, revision, name] = (args as unknown as string[]).map((a) => a.trim());
              st.reference = { sheet: sheet.toUpperCase(), revision: revision.toUpperCase(), name };
            }
          }
        }
      } else if (node.type === 'FunctionAssignmentNode') {
        st.kind = 'function';
        st.defines = node.name!;
        analyse(node, st);
      } else {
        st.kind = isCriterion(node) ? 'criterion' : 'expression';
        analyse(node, st);
        const fnName =
          node.type === 'FunctionNode' && (node.fn as AnyNode)?.type === 'SymbolNode'
            ? (node.fn as AnyNode).name!
            : null;
        if (fnName === 'correlation') {
          const args = (node.args ?? []) as AnyNode[];
          const literal = (a: AnyNode | undefined): number | null => {
            if (a?.type === 'ConstantNode' && typeof (a as AnyNode & { value?: unknown }).value === 'number')
              return (a as AnyNode & { value: number }).value;
            if (a?.type === 'OperatorNode' && a.fn === 'unaryMinus' && a.args?.length === 1) {
              const inner = literal(a.args[0] as AnyNode);
              return inner === null ? null : -inner;
            }
            return null;
          };
          const r = literal(args[2]);
          if (args.length !== 3 || args[0].type !== 'SymbolNode' || args[1].type !== 'SymbolNode' || r === null) {
            st.staticError ??=
              'write correlation(x, y, r) with the names of two inputs that carry an uncertainty and a number r';
          } else if (!(Math.abs(r) <= 1)) {
            st.staticError ??= 'a correlation coefficient lies between −1 and 1';
          } else if (args[0].name === args[1].name) {
            st.staticError ??= 'a correlation is between two different inputs';
          } else {
            st.correlation = { a: args[0].name!, b: args[1].name!, r };
          }
        } else if (fnName && (STUDY_STATEMENTS as readonly string[]).includes(fnName)) {
          const kind = fnName as StudyStatement;
          st.kind = kind === 'sweep' ? 'sweep' : 'plot';
          const args = node.args ?? [];
          const names = [args[0], ...args.slice(2)].map((a) => (a?.type === 'SymbolNode' ? a.name! : null));
          if (args.length < 3 || names.some((n) => n === null)) {
            st.staticError ??= `write ${fnName}(input, values, result1, result2, …) with the names of an input and of results defined above`;
          } else if (args.length - 2 > 12) {
            st.staticError ??= `${fnName} shows at most 12 results; split it`;
          } else {
            st.study = { kind, input: names[0]!, targets: names.slice(1) as string[] };
          }
        }
      }
      if (st.defines) st.staticError ??= checkDefinitionName(st.defines, em);
      try {
        st.lint = lintExpression(node.type === 'AssignmentNode' ? node.value! : node, em);
      } catch {
        st.lint = [];
      }
    }
    remember(parseCache, source, statements, LIMITS.parseCacheEntries);
    return statements;
  }

  function isCriterion(node: AnyNode): boolean {
    if (node.type === 'RelationalNode') return true;
    return (
      node.type === 'OperatorNode' &&
      typeof node.fn === 'string' &&
      node.fn in RELATIONAL_FNS &&
      (node.args?.length ?? 0) === 2
    );
  }

  function criterionOperands(node: AnyNode): { operands: AnyNode[]; fns: string[] } {
    if (node.type === 'RelationalNode') return { operands: node.params as AnyNode[], fns: node.conditionals! };
    return { operands: node.args!, fns: [node.fn as string] };
  }

  function siNumber(value: unknown, side: string): { si: number; unit: Unit | null } {
    if (typeof value === 'number') return { si: value, unit: null };
    if (math.isUnit(value)) {
      const u = value as Unit;
      if (u.value === null) throw new Error(`the ${side} of the criterion is a bare unit`);
      return { si: u.value as number, unit: u };
    }
    throw new Error(`the ${side} of a criterion must be a number or a quantity`);
  }

  function evaluateCriterion(
    node: AnyNode,
    scope: Map<string, unknown>,
  ): { value: boolean; criterion: CriterionResult } {
    const { operands, fns } = criterionOperands(node);
    const values = operands.map((o) => o.compile().evaluate(scope));
    let pass = true;
    let margin: number | null = null;
    for (let i = 0; i < fns.length; i++) {
      const a = siNumber(values[i], i === 0 ? 'left side' : 'middle');
      const b = siNumber(values[i + 1], 'right side');
      if ((a.unit === null) !== (b.unit === null) || (a.unit && b.unit && !a.unit.equalBase(b.unit))) {
        const sig = 6;
        throw new Error(
          `the two sides of the criterion have different dimensions: ${describeOperand(math, operands[i], values[i], sig)} and ${describeOperand(math, operands[i + 1], values[i + 1], sig)}; compare quantities of one kind`,
        );
      }
      const holds = RELATIONAL_FNS[fns[i]](a.si, b.si);
      pass &&= holds;
      // Relative margin to the limit: how far the left side is from the right, as a fraction of it.
      if (fns[i] !== 'equal' && fns[i] !== 'unequal' && b.si !== 0) {
        const towardsPass = fns[i] === 'smaller' || fns[i] === 'smallerEq' ? b.si - a.si : a.si - b.si;
        const m = towardsPass / Math.abs(b.si);
        margin = margin === null ? m : Math.min(margin, m);
      }
    }
    const marginText =
      margin === null
        ? 'compared exactly (no tolerance)'
        : `margin ${formatNumberText(margin * 100, 3)} % of the limit, compared exactly (no tolerance)`;
    return { value: pass, criterion: { pass, comparison: 'exact', margin, marginText } };
  }

  function evaluate(cells: CellInput[], options: EvaluateOptions, hooks: EvaluateHooks = {}): SheetResult {
    if (cells.length > LIMITS.maxCells) throw new Error(`a sheet holds at most ${LIMITS.maxCells} cells`);
    const sig = Math.min(15, Math.max(2, Math.round(options.significantFigures)));
    // SI or the trade's units for what this evaluation shows (lib/calc/display-units.ts).
    const displayUnits = options.displayUnits ?? DISPLAY_UNITS_DEFAULT;
    setDisplayUnits(math, displayUnits);
    const parsed = cells.map((c) => (c.kind === 'calc' ? parseCell(c.source) : []));

    // Where each name is first defined in the whole sheet: to tell "defined below" from "undefined".
    const firstDefinition = new Map<string, { cell: number; line: number }>();
    // Input tables are defined before the first cell (cell index -1).
    const tables = new Map((options.tables ?? []).map((t) => [t.name, t]));
    for (const name of tables.keys()) firstDefinition.set(name, { cell: -1, line: 0 });
    parsed.forEach((statements, ci) => {
      for (const st of statements)
        if (st.defines && !firstDefinition.has(st.defines))
          firstDefinition.set(st.defines, { cell: ci, line: st.line });
    });

    // The lint's findings for a name the sheet defines are dropped: the name is the sheet's quantity
    // (a name that cannot be redefined, such as `e`, stays flagged).
    // For messages: the sheet's functions (to say what fails inside a call) and the names a misspelt
    // one may have meant (the sheet's, the functions', the constants'; a unit in another case).
    const sheetFunctions = new Map<string, { params: string[]; expr: MathNode }>();
    for (const statements of parsed) {
      for (const st of statements) {
        if (st.kind === 'function' && st.node && st.defines && !sheetFunctions.has(st.defines))
          sheetFunctions.set(st.defines, { params: (st.node.params as string[]) ?? [], expr: st.node.expr! });
      }
    }
    const messageNames = {
      candidates: () => [...firstDefinition.keys(), ...em.constants.keys(), ...builtinNamesOf(em).names],
      caseCandidates: () => builtinNamesOf(em).units,
    };
    const calledQuantityMessage = (name: string): string => {
      if (tables.has(name))
        return `\`${name}\` is the input table read from ${tables.get(name)!.fileName}, not a function; read a column as ${name}.column`;
      const at = firstDefinition.get(name)!;
      const where = `cell ${at.cell + 1}, line ${at.line}`;
      if (em.isFunctionName(name)) {
        return `\`${name}\` is this sheet's own quantity (defined in ${where}), not a function: a sheet's definition takes precedence over the built-in function ${name} everywhere in the sheet; to call the built-in function, give the quantity another name (e.g. \`${name}_1\`)`;
      }
      return `\`${name}\` is a quantity (defined in ${where}), not a function: write \`${name} * (…)\` for a product, or define a function such as f(x) = …`;
    };
    const lintSilenced = (name: string) => firstDefinition.has(name) && checkDefinitionName(name, em) === null;
    const warningsOf = (st: ParsedStatement) =>
      (st.lint ?? []).filter((f) => !lintSilenced(f.name)).map((f) => f.message);
    // A bare name that is also a unit is a quantity when the sheet defines it anywhere; so is a
    // name of a built-in function the sheet defines (its definition takes precedence: names.ts).
    const usesOf = (st: ParsedStatement) =>
      st.unitNamed.length || st.fnNamed?.length
        ? [
            ...st.uses,
            ...st.unitNamed.filter((n) => firstDefinition.has(n)),
            ...(st.fnNamed ?? []).filter((n) => firstDefinition.has(n)),
          ]
        : st.uses;
    // What the sheet's first definition of each name is: a value (`x = …`) cannot be called as `x(…)`.
    const definitionKindOf = new Map<string, StatementResult['kind']>();
    for (const statements of parsed)
      for (const st of statements)
        if (st.defines && !definitionKindOf.has(st.defines)) definitionKindOf.set(st.defines, st.kind);
    const scope = new Map<string, unknown>(em.constants);
    const monteCarloMode = options.monteCarlo ?? 'auto';
    const resolved = new Map((options.references ?? []).map((r) => [referenceKey(r), r]));
    /** Standard uncertainties of the inputs that carry one, by name. */
    const inputU = new Map<string, unknown>();
    let monteCarloRequests = 0;

    // Every name's definition in sheet order, and what each depends on (directly and through other
    // names), for re-evaluating what depends on an input: sweeps, plots, uncertainty propagation.
    const chain: ChainStatement[] = [];
    const chainIndex = new Map<string, number>();
    /** Names each definition reads directly. What depends on what further is worked out on demand. */
    const directUses = new Map<string, readonly string[]>();
    const compiledOf = (st: ParsedStatement) => {
      if (!st.compiled) {
        const node = st.node!;
        st.compiled =
          st.kind === 'function'
            ? node.compile()
            : st.uncertain
              ? node.value!.args![0].compile()
              : node.value!.compile();
      }
      return st.compiled;
    };
    for (const statements of parsed) {
      for (const st of statements) {
        if (!st.defines || chainIndex.has(st.defines) || !st.node || st.parseError || st.staticError) continue;
        const direct = usesOf(st);
        directUses.set(st.defines, direct);
        chainIndex.set(st.defines, chain.length);
        const name = st.defines;
        chain.push({
          defines: name,
          uses: direct,
          run: (sc) => {
            for (const l of st.unitLiterals)
              if (!scope.has(l.placeholder)) scope.set(l.placeholder, unitLiteral(l.unit));
            if (st.reference) return; // a cited value depends on nothing in this sheet
            const value = compiledOf(st).evaluate(sc);
            if (st.kind !== 'function') sc.set(name, value);
          },
        });
      }
    }
    const reevaluator = new Reevaluator(scope, chain, chainIndex);
    // Correlations between inputs, from every correlation(x, y, r) of the sheet (the first one of a
    // pair counts): they hold for every result, wherever the statement stands.
    const staticallyUncertain = new Set(
      parsed
        .flat()
        .filter((st) => st.uncertain && st.defines && !st.parseError && !st.staticError)
        .map((st) => st.defines!),
    );
    const correlations = new Map<string, { r: number; cell: number; line: number }>();
    const pairKey = (a: string, b: string) => (a < b ? `${a}\0${b}` : `${b}\0${a}`);
    parsed.forEach((statements, ci) => {
      for (const st of statements) {
        const c = st.correlation;
        if (c && staticallyUncertain.has(c.a) && staticallyUncertain.has(c.b) && !correlations.has(pairKey(c.a, c.b)))
          correlations.set(pairKey(c.a, c.b), { r: c.r, cell: ci, line: st.line });
      }
    });
    const correlationContext = correlations.size
      ? [`correlations:${[...correlations].map(([k, v]) => `${k}=${v.r}`).join(';')}`]
      : [];
    const correlationOf = (a: string, b: string) => (a === b ? 1 : (correlations.get(pairKey(a, b))?.r ?? 0));
    // The uncertain inputs a name depends on (directly or through other names), memoised: asked for
    // only once the sheet has an uncertain input, and only for names defined above the one asking.
    const uncertainMemo = new Map<string, readonly string[]>();
    const uncertainInputsOf = (name: string): readonly string[] => {
      let known = uncertainMemo.get(name);
      if (known) return known;
      const found = new Set<string>();
      for (const u of directUses.get(name) ?? []) {
        if (inputU.has(u)) found.add(u);
        for (const x of uncertainInputsOf(u)) found.add(x);
      }
      known = [...found].sort((a, b) => chainIndex.get(a)! - chainIndex.get(b)!);
      uncertainMemo.set(name, known);
      return known;
    };
    /** Does `name` depend on `input` (directly or through other names)? */
    const dependsOn = (name: string, input: string, memo = new Map<string, boolean>()): boolean => {
      const known = memo.get(name);
      if (known !== undefined) return known;
      memo.set(name, false);
      const answer = (directUses.get(name) ?? []).some((u) => u === input || dependsOn(u, input, memo));
      memo.set(name, answer);
      return answer;
    };
    const definedAt = new Map<string, { cell: number; line: number }>();
    /** Names whose value is unavailable, with why. */
    const failed = new Map<string, string>();
    /** Cache key of the cell that defined each name, so a dependent cell's key changes with it. */
    const nameKey = new Map<string, string>();
    const results: CellResult[] = [];
    let evaluatedCells = 0;
    for (const [name, table] of tables) {
      scope.set(name, tableValue(table));
      definedAt.set(name, { cell: -1, line: 0 });
      nameKey.set(name, `table:${table.sha256}:${table.fileName}`);
    }

    // Constants are substituted in the SI unit they are defined in (the elementary charge as
    // 1.602 18 × 10⁻¹⁹ C, not in zeptocoulombs as mathjs's choice of prefix would have it); in the
    // trade's units the particle masses are in MeV/c² (m_p as 938.272 MeV/c²).
    const texValue = new Map<string, string>(
      CONSTANTS.map((k) => {
        const value = em.constants.get(k.name)!;
        const trade = displayUnits === 'trade' && typeof value !== 'number' ? tradeDisplay(math, value) : null;
        const tex = trade
          ? `${formatNumberTex(trade.number, sig)}\\ ${unitTexOf(math, trade.unitString)}`
          : k.unit === ''
            ? formatNumberTex(k.value, sig)
            : `${formatNumberTex(k.value, sig)}\\ ${unitTexOf(math, k.unit)}`;
        return [k.name, substitutionTex(tex)];
      }),
    );
    const valueTexOf = (name: string): string | undefined => {
      const cachedTex = texValue.get(name);
      if (cachedTex !== undefined) return cachedTex;
      if (!scope.has(name) || tables.has(name)) return undefined;
      const v = scope.get(name);
      // Lists stay as their names in substituted formulas: their values are shown as results.
      if (typeof v === 'function' || math.isMatrix(v) || Array.isArray(v)) return undefined;
      const tex = substitutionTex(displayValue(math, v, sig).tex);
      texValue.set(name, tex);
      return tex;
    };

    for (const [ci, cell] of cells.entries()) {
      const statements = parsed[ci];
      if (cell.kind === 'text') {
        results.push({
          id: cell.id,
          index: ci,
          kind: 'text',
          ok: true,
          error: null,
          statements: [],
          warnings: [],
          defines: [],
          uses: [],
        });
        continue;
      }
      const ownNames = new Set(statements.map((s) => s.defines).filter((n): n is string => !!n));
      const external = [...new Set(statements.flatMap(usesOf))]
        .filter((n) => !ownNames.has(n) || definedAt.has(n))
        .sort();
      const skipReason = hooks.skip?.get(cell.id);
      // The key covers everything the cell's results depend on: its text, its position (messages
      // name cells by number), the display precision, the keys of the cells that defined what it
      // uses, and where its own names and not-yet-defined names stand in the sheet.
      const context = [
        ...external.map((n) => {
          if (definedAt.has(n)) return `${n}=${nameKey.get(n) ?? `failed:${failed.get(n) ?? ''}`}`;
          const later = firstDefinition.get(n);
          // An undefined name's message suggests names of the sheet: the suggestion is part of the key.
          return `${n}=${later ? `later:${later.cell}:${later.line}` : `undefined:${em.isFunctionName(n) ? '' : notDefined(n, messageNames)}`}`;
        }),
        ...[...ownNames].map((n) => {
          const at = definedAt.get(n);
          return `own:${n}=${at ? `${at.cell}:${at.line}` : 'new'}`;
        }),
        // Cited results as resolved now (a withdrawal or a new issue changes what the cell shows).
        ...statements
          .filter((st) => st.reference)
          .map((st) => `ref:${JSON.stringify(resolved.get(referenceKey(st.reference!)) ?? null)}`),
        ...(monteCarloMode === 'always' && statements.some((st) => st.defines) ? ['monteCarlo:always'] : []),
        // How many of the sheet's Monte Carlo propagations are left decides which this cell may run.
        ...(inputU.size > 0 ? [`monteCarloUsed:${Math.min(monteCarloRequests, MONTE_CARLO_PER_SHEET)}`] : []),
        ...correlationContext,
        // Whether the sheet defines a name the lint flags decides whether the warning shows.
        ...[...new Set(statements.flatMap((st) => (st.lint ?? []).map((f) => f.name)))].map(
          (n) => `lint:${n}=${lintSilenced(n)}`,
        ),
        // Whether the sheet defines a unit name written after a number's unit with a space (`1 T m`).
        ...[...new Set(statements.flatMap((st) => st.unitLiterals.flatMap((l) => l.spacedNames ?? [])))].map(
          (n) => `spaced:${n}=${firstDefinition.has(n)}`,
        ),
      ];
      const key = createHash('sha256')
        .update(`${hooks.cacheScope ?? ''}\0${sig}\0${displayUnits}\0${ci}\0${cell.source}\0${context.join('\0')}`)
        .digest('base64');

      const cached = skipReason ? undefined : cellCache.get(key);
      if (cached) {
        for (const [name, value] of cached.values) {
          scope.set(name, value);
          texValue.delete(name);
        }
        for (const [name, tex] of cached.substitutions) texValue.set(name, tex);
        for (const [name, why] of cached.failed) failed.set(name, why);
        for (const [name, u] of cached.uncertainties) inputU.set(name, u);
        monteCarloRequests += cached.monteCarloRequests;
        for (const st of statements)
          if (st.defines && !definedAt.has(st.defines)) definedAt.set(st.defines, { cell: ci, line: st.line });
        for (const name of ownNames) nameKey.set(name, key);
        results.push({ ...cached.result, id: cell.id, index: ci });
        continue;
      }

      hooks.onCellStart?.(ci);
      evaluatedCells++;
      const values = new Map<string, unknown>();
      const uncertainties = new Map<string, unknown>();
      const requestsBefore = monteCarloRequests;
      const cellFailed = new Map<string, string>();
      const out: StatementResult[] = [];
      const texCtx: TexContext = {
        isValueName: (n) => scope.has(n) || definedAt.has(n) || ownNames.has(n),
        valueTex: valueTexOf,
        unitTex: (unit) => unitTexOf(math, unit),
      };

      for (const st of statements) {
        const result: StatementResult = {
          line: st.line,
          source: st.source,
          kind: st.kind,
          name: st.defines,
          tex: '',
          substitutedTex: null,
          value: null,
          criterion: null,
          error: null,
          warnings: warningsOf(st),
        };
        out.push(result);
        const fail = (message: string) => {
          result.error = message;
          if (st.defines) cellFailed.set(st.defines, `it has an error in cell ${ci + 1}, line ${st.line}`);
        };
        if (st.node) {
          try {
            result.tex = formulaTex(st.node, texCtx);
          } catch {
            result.tex = '';
          }
        }
        // Register the definition first, so that later uses of a name whose statement fails read
        // "depends on …, which has an error" rather than "not defined".
        if (st.defines) {
          const earlier = definedAt.get(st.defines);
          if (earlier) {
            const table = tables.get(st.defines);
            result.error = table
              ? `\`${st.defines}\` is the input table read from the attachment ${table.fileName}; a name is defined once per sheet`
              : `\`${st.defines}\` is already defined in cell ${earlier.cell + 1}, line ${earlier.line}; a name is defined once per sheet`;
            continue;
          }
          definedAt.set(st.defines, { cell: ci, line: st.line });
        }
        if (skipReason) {
          fail(skipReason);
          continue;
        }
        if (st.parseError) {
          fail(`cannot read this line: ${st.parseError}`);
          continue;
        }
        if (st.staticError) {
          fail(st.staticError);
          continue;
        }
        // `1 T m`: a unit name joined by a space after a number's unit, which the sheet also defines.
        const spacedUnit = st.unitLiterals.find((l) => l.spacedNames?.some((n) => firstDefinition.has(n)));
        if (spacedUnit) {
          const name = spacedUnit.spacedNames!.find((n) => firstDefinition.has(n))!;
          const at = firstDefinition.get(name)!;
          fail(
            `\`${spacedUnit.written}\` after a number reads \`${name}\` as a unit, but this sheet also defines a quantity \`${name}\` (${at.cell < 0 ? 'an input table' : `cell ${at.cell + 1}, line ${at.line}`}): ` +
              `write \`${spacedUnit.unit}\` (no spaces) for the unit, or put \`*\` with spaces before the quantity (\`… * ${name}\`)`,
          );
          continue;
        }
        const calledQuantity = (st.calls ?? []).find(
          (name) => tables.has(name) || (firstDefinition.has(name) && definitionKindOf.get(name) !== 'function'),
        );
        const problem = (calledQuantity ? [calledQuantity] : usesOf(st))
          .map((name) => {
            if (name === calledQuantity) return calledQuantityMessage(name);
            if (definedAt.has(name)) {
              const why = failed.get(name) ?? cellFailed.get(name);
              return why ? `depends on \`${name}\`, which is not available: ${why}` : null;
            }
            const later = firstDefinition.get(name);
            if (later)
              return `\`${name}\` is used before it is defined (cell ${later.cell + 1}, line ${later.line}); define names above where they are used`;
            return em.isFunctionName(name) ? null : notDefined(name, messageNames);
          })
          .find((p) => p !== null);
        const columnProblem = st.columns
          .map(({ table, column }) => {
            const t = tables.get(table);
            if (!t)
              return scope.has(table)
                ? `\`${table}\` is not an input table; \`.\` reads a column of an input table`
                : null;
            if (t.columns.some((c) => c.name === column)) return null;
            return `the input table \`${table}\` has no column \`${column}\`; its columns are ${t.columns.map((c) => (c.unit ? `${c.name} [${c.unit}]` : c.name)).join(', ')}`;
          })
          .find((p) => p !== null);
        if (problem || columnProblem) {
          fail((problem ?? columnProblem)!);
          continue;
        }
        try {
          const node = st.node!;
          for (const l of st.unitLiterals) if (!scope.has(l.placeholder)) scope.set(l.placeholder, unitLiteral(l.unit));
          let value: unknown;
          if (st.kind === 'criterion') {
            const c = evaluateCriterion(node, scope);
            value = c.value;
            result.criterion = c.criterion;
          } else if (st.correlation) {
            const { a, b, r } = st.correlation;
            for (const name of [a, b]) {
              if (!definedAt.has(name)) throw new Error(`\`${name}\` is not defined above`);
              if (!staticallyUncertain.has(name))
                throw new Error(`\`${name}\` carries no standard uncertainty (write it as ${name} = value ± u)`);
            }
            const first = correlations.get(pairKey(a, b))!;
            if (first.cell !== ci || first.line !== st.line)
              throw new Error(
                `the correlation of \`${a}\` and \`${b}\` is already given in cell ${first.cell + 1}, line ${first.line}`,
              );
            value = r;
          } else if (st.study) {
            const listValue = (node.args![1] as AnyNode).compile().evaluate(scope);
            const list = math.isMatrix(listValue)
              ? (listValue as { toArray(): unknown[] }).toArray()
              : Array.isArray(listValue)
                ? listValue
                : null;
            if (!list || list.some((x) => Array.isArray(x) || math.isMatrix(x)))
              throw new Error(
                'the second argument is the list of values to sweep, e.g. steps(70 MeV, 250 MeV, 20 MeV)',
              );
            if (list.length > 2000) throw new Error('a sweep or a plot takes at most 2000 values');
            const { input, targets } = st.study;
            if (tables.has(input) || !chainIndex.has(input))
              throw new Error(`\`${input}\` must be a value defined above to be swept`);
            for (const t of targets) {
              if (!definedAt.has(t) || tables.has(t)) throw new Error(`\`${t}\` is not a result defined above`);
            }
            const out = computeStudy(math, reevaluator, scope, {
              kind: st.study.kind,
              input,
              values: list,
              targets,
              dependsOnInput: (() => {
                const memo = new Map<string, boolean>();
                return (t: string) => t === input || dependsOn(t, input, memo);
              })(),
            });
            result.table = out.table;
            result.plot = out.plot;
            value = undefined;
          } else if (st.kind === 'definition' && st.reference) {
            const ref = resolved.get(referenceKey(st.reference));
            result.references = ref ? [ref] : [];
            if (!ref)
              throw new Error(
                `${st.reference.sheet} rev. ${st.reference.revision}, ${st.reference.name}: citations of issued revisions are resolved within the sheet's project; save the sheet in a project to use it`,
              );
            if (ref.error || !ref.value) throw new Error(ref.error ?? 'the cited result has no value');
            value = ref.value.unit ? math.unit(ref.value.number, ref.value.unit) : ref.value.number;
            scope.set(st.defines!, value);
            texValue.delete(st.defines!);
            values.set(st.defines!, value);
            if (ref.value.uncertainty !== null && ref.value.uncertainty > 0) {
              const u = ref.value.unit ? math.unit(ref.value.uncertainty, ref.value.unit) : ref.value.uncertainty;
              uncertainties.set(st.defines!, u);
              inputU.set(st.defines!, u);
            }
          } else if (st.kind === 'definition' && st.uncertain) {
            const [valueNode, uNode] = node.value!.args! as AnyNode[];
            value = compiledOf(st).evaluate(scope);
            const u = uNode.compile().evaluate(scope);
            void valueNode;
            const v = siOf(math, value);
            const us = siOf(math, u);
            if (v === null) throw new Error('the value before ± must be a single number or quantity');
            if (us === null) throw new Error('the standard uncertainty after ± must be a single number or quantity');
            const sameDimension =
              typeof value === 'number'
                ? typeof u === 'number'
                : math.isUnit(u) && (u as Unit).equalBase(value as Unit);
            if (!sameDimension)
              throw new Error('the standard uncertainty after ± must have the dimension of the value');
            if (!(us >= 0) || !Number.isFinite(us) || !Number.isFinite(v))
              throw new Error('the standard uncertainty must be a finite number ≥ 0');
            scope.set(st.defines!, value);
            texValue.delete(st.defines!);
            values.set(st.defines!, value);
            uncertainties.set(st.defines!, u);
            inputU.set(st.defines!, u);
          } else if (st.kind === 'definition') {
            value = node.value!.compile().evaluate(scope);
            if (typeof value === 'function') throw new Error('define functions with the form f(x) = …');
            scope.set(st.defines!, value);
            texValue.delete(st.defines!);
            values.set(st.defines!, value);
          } else if (st.kind === 'function') {
            value = node.compile().evaluate(scope);
            values.set(st.defines!, scope.get(st.defines!));
          } else {
            value = node.compile().evaluate(scope);
          }
          // A non-finite or complex value is an error saying what happened (a definition's dependents
          // then say they depend on it); criteria, functions, sweeps and plots are not values to check.
          if ((st.kind === 'definition' || st.kind === 'expression') && !st.study && !st.correlation) {
            const why = nonFiniteReason(
              math,
              st.kind === 'definition' ? (st.uncertain ? node.value!.args![0] : node.value!) : node,
              scope,
              value,
              sig,
            );
            if (why) throw new Error(why);
          }
          if (st.kind === 'definition' && uncertainties.has(st.defines!)) {
            result.uncertainty = inputUncertainty(math, value, uncertainties.get(st.defines!), sig);
          } else if (st.kind === 'definition' && siOf(math, value) !== null) {
            const inputs = inputU.size ? uncertainInputsOf(st.defines!) : [];
            if (inputs.length) {
              try {
                result.uncertainty = propagateUncertainty(
                  math,
                  reevaluator,
                  st.defines!,
                  value,
                  inputs.map((n) => ({ name: n, value: scope.get(n), u: inputU.get(n) })),
                  sig,
                  monteCarloMode,
                  () => ++monteCarloRequests <= MONTE_CARLO_PER_SHEET,
                  correlations.size ? correlationOf : undefined,
                );
              } catch (error) {
                result.uncertainty = null;
                throw new Error(`the uncertainty cannot be propagated: ${messageOf(error)}`, { cause: error });
              }
            }
          }
          if (st.study) {
            // The table or plot is the result.
          } else if (st.kind !== 'function') {
            result.value = displayValue(math, value, sig) as DisplayValue;
            // The substituted formulas below reuse this display instead of formatting the value again.
            if (st.kind === 'definition' && result.value.kind !== 'matrix')
              texValue.set(st.defines!, substitutionTex(result.value.tex));
            try {
              result.substitutedTex = substitutedTex(node, texCtx);
            } catch {
              result.substitutedTex = null;
            }
          }
        } catch (error) {
          // mathjs's own wording never reaches a person (messages.ts); the engine's and the
          // library's messages pass through.
          fail(
            engineerMessage(error, {
              math,
              // A sweep, plot or correlation is not a formula to take apart: its message is only cleaned.
              node: st.kind === 'definition' ? (st.uncertain ? st.node!.value!.args![0] : st.node!.value!) : st.node!,
              locate: !st.study && !st.correlation && !st.reference,
              scope,
              sig,
              sheetFunction: (name) => sheetFunctions.get(name) ?? null,
              candidates: messageNames.candidates,
              caseCandidates: messageNames.caseCandidates,
            }),
          );
        }
      }

      for (const [name, why] of cellFailed) failed.set(name, why);
      for (const name of ownNames) nameKey.set(name, key);
      const firstError = out.find((s) => s.error)?.error ?? null;
      const cellResult: CellResult = {
        id: cell.id,
        index: ci,
        kind: 'calc',
        ok: firstError === null,
        error: firstError,
        statements: out,
        warnings: out.flatMap((s) => (s.warnings ?? []).map((w) => `line ${s.line}: ${w}`)),
        defines: [...ownNames],
        uses: external,
      };
      results.push(cellResult);
      if (!skipReason) {
        const substitutions = out
          .filter((st) => st.kind === 'definition' && st.name && st.value && !st.error)
          .map((st) => [st.name!, substitutionTex(st.value!.tex)] as [string, string]);
        remember(
          cellCache,
          key,
          {
            result: cellResult,
            values,
            failed: cellFailed,
            substitutions,
            uncertainties,
            monteCarloRequests: monteCarloRequests - requestsBefore,
          },
          LIMITS.cellCacheEntries,
        );
      }
    }

    return {
      ok: results.every((r) => r.ok),
      cells: results,
      engineVersion: ENGINE_VERSION,
      constantsEdition: CONSTANTS_EDITION,
      evaluatedCells,
    };
  }

  return {
    em,
    evaluate,
    cacheSize: () => cellCache.size,
    clearCache: () => {
      cellCache.clear();
      parseCache.clear();
    },
  };
}
