// Sheet evaluation: cells in order, one statement per line, names defined once and only above their
// use, errors kept to the cell (and the statements that depend on it), design criteria compared
// exactly, and a content-addressed cache so that re-evaluating after an edit only evaluates the
// edited cell and what depends on it.
//
// Three steps: parse (engine/parse.ts: each line read and recognised by its statement form,
// engine/forms/), plan (engine/plan.ts: definitions, correlations and the cells' cache keys, before
// anything is evaluated) and evaluate (below: the generic checks every statement passes, then its
// form's evaluation). Typesetting and display formatting are not on this path (engine/present.ts).
import { hash } from 'node:crypto';
import type { MathJsInstance, Unit } from 'mathjs';
import { CONSTANTS_EDITION } from './constants';
import { DISPLAY_UNITS_DEFAULT, setDisplayUnits, type DisplayUnits } from './display-units';
import { LIBRARY } from './functions';
import { bindLibrary } from './library-adapter';
import { installSizeGuards, LIMITS } from './limits';
import { createEngineMath, type EngineMath } from './math-instance';
import { engineerMessage, notDefined } from './messages';
import { nonFiniteReason } from './non-finite';
import { inputUncertainty, MONTE_CARLO_PER_SHEET, propagateUncertainty, siOf } from './studies';
import { studyBindings } from './study-functions';
import { referenceKey } from './references';
import type { CellInput, CellResult, EvaluateOptions, InputTable, SheetResult, StatementResult } from './types';
import { ENGINE_VERSION } from './version';
import { createCellParser } from './engine/parse';
import { planSheet, type CellPlan, type SheetPlan } from './engine/plan';
import { cellResultOf, constantsTexOf, NOT_SHOWN, PresentedStatements, type Presentation } from './engine/present';
import { SheetRun, type CellRun } from './engine/run';
import type { ParsedStatement } from './engine/statement';

function messageOf(error: unknown): string {
  const text = error instanceof Error ? error.message : String(error);
  return text.length > 500 ? `${text.slice(0, 500)}…` : text;
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
  /**
   * Present each cell's statements (typeset, substitute, format) as soon as it is evaluated, inside
   * the cell's time (the sandbox, whose results are all sent); otherwise on first read.
   */
  presentEachCell?: boolean;
}

interface CachedCell {
  result: CellResult;
  /** The names the cell defines and their values, side by side. */
  names: string[];
  values: unknown[];
  failed: Map<string, string>;
  /** Standard uncertainties of the inputs the cell defines (`x = value ± u`). */
  uncertainties: Map<string, unknown>;
  /** Monte Carlo propagations the cell asked for (run or refused), counted towards the sheet's share. */
  monteCarloRequests: number;
  /** The keys of the names the cell first defines (`definitionKeys`), which its own key decides. */
  nameKeys: ReadonlyMap<string, string>;
}

/** A statement's error; what it defines is then unavailable to the statements below. */
function fail(result: StatementResult, st: ParsedStatement, cell: CellRun, message: string): void {
  result.error = message;
  if (st.defines) cell.failed.set(st.defines, `it has an error in cell ${cell.index + 1}, line ${st.line}`);
}

function remember<K, V>(map: Map<K, V>, key: K, value: V, max: number): void {
  if (map.size >= max) map.delete(map.keys().next().value as K);
  map.set(key, value);
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
  const parser = createCellParser(em);

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
  const recentPlans = new Map<string, SheetPlan>();
  /** The result of a text cell, by its position and id (it says nothing else). */
  const textResults = new Map<string, CellResult>();
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
  // The constants' substituted TeX, per significant figures and display units.
  const constantsTexCache = new Map<string, Map<string, string>>();
  const constantsTex = (sig: number, units: DisplayUnits) => {
    const key = `${sig}:${units}`;
    let known = constantsTexCache.get(key);
    if (!known) constantsTexCache.set(key, (known = constantsTexOf(em, sig, units)));
    return known;
  };

  /**
   * Why a statement cannot be evaluated before evaluating it (a name it reads is unavailable, used
   * before its definition or unknown, a quantity called as a function, a missing table column), or null.
   */
  function unavailable(st: ParsedStatement, run: SheetRun, cell: CellRun): string | null {
    const { plan, tables } = run;
    // `1 T m`: a unit name joined by a space after a number's unit, which the sheet also defines.
    const spacedUnit = st.unitLiterals.find((l) => l.spacedNames?.some((n) => plan.firstDefinition.has(n)));
    if (spacedUnit) {
      const name = spacedUnit.spacedNames!.find((n) => plan.firstDefinition.has(n))!;
      const at = plan.firstDefinition.get(name)!;
      return (
        `\`${spacedUnit.written}\` after a number reads \`${name}\` as a unit, but this sheet also defines a quantity \`${name}\` (${at.cell < 0 ? 'an input table' : `cell ${at.cell + 1}, line ${at.line}`}): ` +
        `write \`${spacedUnit.unit}\` (no spaces) for the unit, or put \`*\` with spaces before the quantity (\`… * ${name}\`)`
      );
    }
    const calledQuantity = st.calls.find(
      (name) => tables.has(name) || (plan.firstDefinition.has(name) && plan.definitionKindOf.get(name) !== 'function'),
    );
    if (calledQuantity) return plan.calledQuantityMessage(calledQuantity);
    for (const name of plan.usesOf(st)) {
      if (run.isDefined(name)) {
        const why = run.failed.get(name) ?? cell.failed.get(name);
        if (why) return `depends on \`${name}\`, which is not available: ${why}`;
        continue;
      }
      const later = plan.firstDefinition.get(name);
      if (later)
        return `\`${name}\` is used before it is defined (cell ${later.cell + 1}, line ${later.line}); define names above where they are used`;
      if (!em.isFunctionName(name)) return notDefined(name, plan.messageNames);
    }
    for (const { table, column } of st.columns) {
      const t = tables.get(table);
      if (!t) {
        if (run.scope.has(table)) return `\`${table}\` is not an input table; \`.\` reads a column of an input table`;
        continue;
      }
      if (!t.columns.some((c) => c.name === column))
        return `the input table \`${table}\` has no column \`${column}\`; its columns are ${t.columns.map((c) => (c.unit ? `${c.name} [${c.unit}]` : c.name)).join(', ')}`;
    }
    return null;
  }

  /** Evaluates one statement that passed the checks: its form, then what every value gets. */
  function evaluateStatement(st: ParsedStatement, run: SheetRun, cell: CellRun, result: StatementResult): unknown {
    const { math, scope, sig } = run;
    const form = st.form!;
    for (const l of st.unitLiterals) if (!scope.has(l.placeholder)) scope.set(l.placeholder, unitLiteral(l.unit));
    const value = form.evaluate(st, run, cell, result);
    // A non-finite or complex value is an error saying what happened (a definition's dependents
    // then say they depend on it); criteria, functions, sweeps and plots are not values to check.
    if (form.yieldsValue) {
      const why = nonFiniteReason(math, form.messageNode(st), scope, value, sig);
      if (why) throw new Error(why);
    }
    if (st.kind !== 'definition') return value;
    if (cell.uncertainties.has(st.defines!)) {
      result.uncertainty = inputUncertainty(math, value, cell.uncertainties.get(st.defines!), sig);
    } else if (run.inputU.size && siOf(math, value) !== null) {
      const inputs = run.uncertainInputsOf(st.defines!);
      if (inputs.length) {
        try {
          result.uncertainty = propagateUncertainty(
            math,
            run.reevaluator(),
            st.defines!,
            value,
            inputs.map((n) => ({ name: n, value: scope.get(n), u: run.inputU.get(n) })),
            sig,
            run.monteCarloMode,
            () => ++run.monteCarloRequests <= MONTE_CARLO_PER_SHEET,
            run.plan.correlations.size ? run.plan.correlationOf : undefined,
          );
        } catch (error) {
          result.uncertainty = null;
          throw new Error(`the uncertainty cannot be propagated: ${messageOf(error)}`, { cause: error });
        }
      }
    }
    return value;
  }

  /**
   * A cell's cache key: the settings, its position and text, the static part of its plan, the keys
   * of the names it reads (run.keyOf: of their defining statements), and how many of the sheet's
   * Monte Carlo propagations are left (which decides which it may run). Hashed again only when one
   * changed.
   */
  function cellKey(cellPlan: CellPlan, settings: string, index: number, source: string, run: SheetRun): string {
    const { failed } = run;
    const monteCarloUsed = run.inputU.size > 0 ? Math.min(run.monteCarloRequests, MONTE_CARLO_PER_SHEET) : -1;
    const last = cellPlan.lastKey;
    if (last && last.settings === settings && last.monteCarloUsed === monteCarloUsed) {
      let same = true;
      for (let i = 0; i < cellPlan.definedAbove.length && same; i++)
        same = (run.keyOf(cellPlan.definedAbove[i]) ?? null) === last.inputs[i];
      if (same) return last.key;
    }
    const inputs = cellPlan.definedAbove.map((n) => run.keyOf(n) ?? `failed:${failed.get(n) ?? ''}`);
    let text = `${settings}\0${index}\0${source}\0${cellPlan.staticKey}`;
    for (let i = 0; i < inputs.length; i++) text += `\0${cellPlan.definedAbove[i]}=${inputs[i]}`;
    if (monteCarloUsed >= 0) text += `\0monteCarloUsed:${monteCarloUsed}`;
    const key = hash('sha256', text, 'base64');
    cellPlan.lastKey = { settings, monteCarloUsed, inputs, key };
    return key;
  }

  /**
   * The keys of the names a cell first defines, which the cells reading them take into their keys
   * (run.keyOf), once the cell is evaluated. A name's key is that of its defining statement alone:
   * the settings, its position and text, its form's key parts, where the names it reads stand when
   * not above it (plan.ts), and the keys of the names it reads (those of its own cell first), so an
   * edit of another statement of the cell leaves it as it was. What the statement gives a reader
   * (its value, or that it failed, which names its cell and line; an input's uncertainty) depends on
   * nothing else, with two exceptions, which take the cell's key: a definition evaluated once the
   * sheet has an uncertain input, whose propagation evaluates other statements that read the same
   * inputs and fails with them (and counts Monte Carlo runs in sheet order); and a cell skipped by
   * the sandbox (every name failed, not cached), whose names' keys say so. A one-statement cell's
   * name takes the cell's key, which then says no more than the statement's would.
   */
  function definitionKeys(
    cellPlan: CellPlan,
    statements: ParsedStatement[],
    settings: string,
    key: string,
    run: SheetRun,
    uncertainFromLine: number,
    cellRun: CellRun,
  ): Map<string, string> {
    const keys = new Map<string, string>();
    for (const d of cellPlan.definitions) {
      const st = statements[d.index];
      let k = key;
      const propagated = st.line >= uncertainFromLine && st.kind === 'definition' && !cellRun.uncertainties.has(d.name);
      if (statements.length > 1 && !propagated) {
        let text = `${settings}\0${d.staticKey}`;
        for (const n of d.above) text += `\0${n}=${run.keyOf(n) ?? `failed:${run.failed.get(n) ?? ''}`}`;
        for (const n of d.inCell) text += `\0${n}=${keys.get(n)}`;
        k = hash('sha256', text, 'base64');
      }
      keys.set(d.name, k);
    }
    return keys;
  }

  function evaluate(cells: CellInput[], options: EvaluateOptions, hooks: EvaluateHooks = {}): SheetResult {
    if (cells.length > LIMITS.maxCells) throw new Error(`a sheet holds at most ${LIMITS.maxCells} cells`);
    const sig = Math.min(15, Math.max(2, Math.round(options.significantFigures)));
    // SI or the trade's units for what this evaluation shows (lib/calc/display-units.ts).
    const displayUnits = options.displayUnits ?? DISPLAY_UNITS_DEFAULT;
    setDisplayUnits(math, displayUnits);
    const resolved = new Map((options.references ?? []).map((r) => [referenceKey(r), r]));

    // Parse, then plan.
    const parsed = cells.map((c) => (c.kind === 'calc' ? parser.parseCell(c.source) : []));
    // The previous plan of the same sheet (same scope, same cells), to plan only what was edited.
    const planKey = `${hooks.cacheScope ?? ''}\0${cells.map((c) => c.id).join('\0')}`;
    const plan: SheetPlan = planSheet(
      em,
      cells,
      parsed,
      {
        tables: options.tables ?? [],
        references: options.references ?? [],
        formKeyParts: (st) => (st.form?.keyParts ? st.form.keyParts(st, { resolved }) : []),
        monteCarloAlways: options.monteCarlo === 'always',
      },
      recentPlans.get(planKey),
    );
    recentPlans.delete(planKey);
    remember(recentPlans, planKey, plan, 16);
    const settings = `${hooks.cacheScope ?? ''}\0${sig}\0${displayUnits}`;
    const run = new SheetRun(em, plan, sig, resolved, options.monteCarlo, unitLiteral);
    const { scope, failed } = run;
    for (const [name, table] of plan.tables) {
      scope.set(name, tableValue(table));
      run.tableKeys.set(name, `table:${table.sha256}:${table.fileName}`);
    }
    const presentation: Presentation = {
      math,
      em,
      sig,
      displayUnits,
      scope,
      plan,
      constantsTex: constantsTex(sig, displayUnits),
      valueTex: new Map(),
    };

    // Evaluate, cell by cell.
    const results: CellResult[] = [];
    let evaluatedCells = 0;
    for (const [ci, cell] of cells.entries()) {
      const cellPlan = plan.cells[ci];
      if (!cellPlan) {
        // The same object for the same cell at the same place, as for a cached calculation cell: a
        // result sent before is not sent again (sandbox/cell-transfer.ts), nor digested again by a save.
        const textKey = `${ci}\0${cell.id}`;
        let text = textResults.get(textKey);
        if (!text) {
          text = {
            id: cell.id,
            index: ci,
            kind: 'text',
            ok: true,
            error: null,
            statements: [],
            warnings: [],
            defines: [],
            uses: [],
          };
          remember(textResults, textKey, text, LIMITS.cellCacheEntries);
        }
        results.push(text);
        continue;
      }
      const statements = parsed[ci];
      run.atCell = ci;
      run.atLine = 0;
      const skipReason = hooks.skip?.get(cell.id);
      // The key covers everything the cell's results depend on: its text, its position (messages
      // name cells by number), the display precision, the keys of the names it uses (of their
      // defining statements; the rest is in the plan), and how many of the sheet's Monte Carlo
      // propagations are left, which decides which this cell may run.
      const key = cellKey(cellPlan, settings, ci, cell.source, run);

      const cached = skipReason ? undefined : cellCache.get(key);
      if (cached) {
        for (let i = 0; i < cached.names.length; i++) scope.set(cached.names[i], cached.values[i]);
        if (cached.failed.size) for (const [name, why] of cached.failed) failed.set(name, why);
        if (cached.uncertainties.size) for (const [name, u] of cached.uncertainties) run.inputU.set(name, u);
        run.monteCarloRequests += cached.monteCarloRequests;
        run.cellKeys[ci] = key;
        run.nameKeys[ci] = cached.nameKeys;
        const r = cached.result;
        results.push(r.id === cell.id ? r : { ...r, id: cell.id, index: ci });
        continue;
      }

      hooks.onCellStart?.(ci);
      evaluatedCells++;
      const cellRun: CellRun = { index: ci, values: new Map(), uncertainties: new Map(), failed: new Map() };
      const requestsBefore = run.monteCarloRequests;
      const out: StatementResult[] = [];
      const shown: unknown[] = [];
      // The first line evaluated once the sheet has an uncertain input (definitions from there on
      // may be given a propagated uncertainty: definitionKeys).
      let uncertainFromLine = Infinity;

      for (const st of statements) {
        run.atLine = st.line;
        if (uncertainFromLine === Infinity && run.inputU.size > 0) uncertainFromLine = st.line;
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
          warnings: st.lint.length ? st.lint.filter((f) => !plan.lintSilenced(f.name)).map((f) => f.message) : [],
        };
        out.push(result);
        shown.push(NOT_SHOWN);
        // Register the definition first, so that later uses of a name whose statement fails read
        // "depends on …, which has an error" rather than "not defined".
        if (st.defines) {
          const earlier = plan.firstDefinition.get(st.defines)!;
          if (earlier.cell !== ci || earlier.line !== st.line) {
            const table = plan.tables.get(st.defines);
            result.error = table
              ? `\`${st.defines}\` is the input table read from the attachment ${table.fileName}; a name is defined once per sheet`
              : `\`${st.defines}\` is already defined in cell ${earlier.cell + 1}, line ${earlier.line}; a name is defined once per sheet`;
            continue;
          }
        }
        const problem = skipReason
          ? skipReason
          : st.parseError
            ? `cannot read this line: ${st.parseError}`
            : (st.staticError ?? unavailable(st, run, cellRun));
        if (problem) {
          fail(result, st, cellRun, problem);
          continue;
        }
        try {
          const value = evaluateStatement(st, run, cellRun, result);
          if (st.form!.shown) shown[shown.length - 1] = value;
        } catch (error) {
          // mathjs's own wording never reaches a person (messages.ts); the engine's and the
          // library's messages pass through.
          fail(
            result,
            st,
            cellRun,
            engineerMessage(error, {
              math,
              node: st.form!.messageNode(st),
              locate: st.form!.locatesErrors,
              scope,
              sig,
              sheetFunction: (name) => plan.sheetFunctions.get(name) ?? null,
              candidates: plan.messageNames.candidates,
              caseCandidates: plan.messageNames.caseCandidates,
            }),
          );
        }
      }

      for (const [name, why] of cellRun.failed) failed.set(name, why);
      run.cellKeys[ci] = key;
      // A skipped cell is not cached, and its names failed only because it was skipped: their key
      // is not the one the cell's evaluation gives them.
      const nameKeys = skipReason
        ? new Map(
            cellPlan.definitions.map((d) => [
              d.name,
              hash('sha256', `${key}\0skipped:${skipReason}\0${d.name}`, 'base64'),
            ]),
          )
        : definitionKeys(cellPlan, statements, settings, key, run, uncertainFromLine, cellRun);
      run.nameKeys[ci] = nameKeys;
      const presented = new PresentedStatements(out, { presentation, cell: ci, parsed: statements, shown });
      // Presented at once, a value that cannot be shown is the cell's error too.
      if (hooks.presentEachCell) presented.get();
      const firstError = out.find((s) => s.error)?.error ?? null;
      const cellResult = cellResultOf(
        {
          id: cell.id,
          index: ci,
          kind: 'calc',
          ok: firstError === null,
          error: firstError,
          warnings: out.flatMap((s) => (s.warnings ?? []).map((w) => `line ${s.line}: ${w}`)),
          defines: cellPlan.ownNames,
          uses: cellPlan.external,
        },
        presented,
      );
      results.push(cellResult);
      if (!skipReason) {
        remember(
          cellCache,
          key,
          {
            result: cellResult,
            names: [...cellRun.values.keys()],
            values: [...cellRun.values.values()],
            failed: cellRun.failed,
            uncertainties: cellRun.uncertainties,
            monteCarloRequests: run.monteCarloRequests - requestsBefore,
            nameKeys,
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
      recentPlans.clear();
      textResults.clear();
      parser.clear();
    },
  };
}
