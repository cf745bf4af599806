// What a person sees of a statement: its formula typeset, the formula with the values substituted,
// its value formatted to the sheet's significant figures, and its uncertainty's budget and text.
// None of it decides a value, so it is made only when a cell's statements are first read (shown,
// sent, stored or printed) and then kept with the cell's cached result: a cell answered from the
// cache is never typeset again.
import type { MathJsInstance } from 'mathjs';
import { CONSTANTS } from '../constants';
import { displayUnitsOf, setDisplayUnits, tradeDisplay, type DisplayUnits } from '../display-units';
import { displayValue, formatNumberTex, unitTexOf } from '../format';
import type { EngineMath } from '../math-instance';
import { presentUncertainty } from '../studies';
import { formulaTex, substitutedTex, substitutionTex, type TexContext } from '../tex';
import type { CellResult, DisplayValue, StatementResult } from '../types';
import type { SheetPlan } from './plan';
import type { ParsedStatement } from './statement';

/** What one evaluation's presentation needs: its scope (values never change once defined) and plan. */
export interface Presentation {
  math: MathJsInstance;
  em: EngineMath;
  sig: number;
  displayUnits: DisplayUnits;
  scope: ReadonlyMap<string, unknown>;
  plan: SheetPlan;
  /** TeX of the built-in constants as substituted (per significant figures and display units). */
  constantsTex: ReadonlyMap<string, string>;
  /** TeX of each defined value as substituted, made once per evaluation. */
  valueTex: Map<string, string | undefined>;
}

interface Pending {
  presentation: Presentation;
  cell: number;
  parsed: ParsedStatement[];
  /** The value each statement shows, or `NOT_SHOWN`. */
  shown: unknown[];
}

export const NOT_SHOWN = Symbol('not shown');

/** A calculation cell's statements, presented on first read. */
export class PresentedStatements {
  private pending: Pending | null;
  constructor(
    private readonly statements: StatementResult[],
    pending: Pending,
  ) {
    this.pending = pending;
  }

  get(): StatementResult[] {
    if (this.pending) {
      present(this.statements, this.pending);
      this.pending = null; // the scope and plan are no longer held
    }
    return this.statements;
  }
}

/** Constants are substituted in the SI unit they are defined in; in the trade's units masses in MeV/c². */
export function constantsTexOf(em: EngineMath, sig: number, displayUnits: DisplayUnits): Map<string, string> {
  const math = em.math;
  return new Map(
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
}

function valueTexOf(p: Presentation, name: string): string | undefined {
  const constant = p.constantsTex.get(name);
  if (constant !== undefined) return constant;
  if (p.valueTex.has(name)) return p.valueTex.get(name);
  let tex: string | undefined;
  if (p.scope.has(name) && !p.plan.tables.has(name)) {
    const v = p.scope.get(name);
    // Lists stay as their names in substituted formulas: their values are shown as results.
    if (typeof v !== 'function' && !p.math.isMatrix(v) && !Array.isArray(v))
      tex = substitutionTex(displayValue(p.math, v, p.sig).tex);
  }
  p.valueTex.set(name, tex);
  return tex;
}

/** Every name written in the statement (each once), found once per statement text. */
const symbolNames = new WeakMap<ParsedStatement, string[]>();
function symbolsOf(st: ParsedStatement): string[] {
  let names = symbolNames.get(st);
  if (!names) {
    const found = new Set<string>();
    st.node!.traverse((n) => {
      if ((n as { type: string }).type === 'SymbolNode') found.add((n as unknown as { name: string }).name);
    });
    symbolNames.set(st, (names = [...found]));
  }
  return names;
}

function present(statements: StatementResult[], pending: Pending): void {
  const { presentation: p, cell, parsed, shown } = pending;
  const { math, em, plan } = p;
  // A name is a value (not a unit or function) where the sheet defines it in this cell or above,
  // or it is a constant or an input table.
  const texCtx: TexContext = {
    isValueName: (n) => {
      if (em.constants.has(n) || plan.tables.has(n)) return true;
      const at = plan.firstDefinition.get(n);
      return at !== undefined && at.cell <= cell;
    },
    valueTex: (n) => valueTexOf(p, n),
    unitTex: (unit) => unitTexOf(math, unit),
  };
  const before = displayUnitsOf(math);
  setDisplayUnits(math, p.displayUnits);
  try {
    statements.forEach((result, i) => {
      const st = parsed[i];
      const node = st.node;
      try {
        presentUncertainty(result.uncertainty);
      } catch (error) {
        // Its figures in the display unit are made here (studies.ts, presentLater): never a blank
        // where they should be, the statement says why it shows none.
        result.uncertainty = null;
        result.error ??= `the uncertainty cannot be shown: ${error instanceof Error ? error.message : String(error)}`;
      }
      if (node) {
        // Typeset once per statement text and reading of its names (a cell evaluated again
        // because a value above changed reads the same; its substitution is made again).
        let values = '';
        for (const n of symbolsOf(st)) values += texCtx.isValueName(n) ? '1' : '0';
        if (st.texMemo?.values === values) result.tex = st.texMemo.tex;
        else {
          try {
            result.tex = formulaTex(node, texCtx);
          } catch {
            result.tex = '';
          }
          st.texMemo = { values, tex: result.tex };
        }
      }
      if (shown[i] === NOT_SHOWN || !node) return;
      try {
        result.value = displayValue(math, shown[i], p.sig) as DisplayValue;
      } catch (error) {
        // Never a blank where a value should be: the statement says why it shows none.
        result.error = `the value cannot be shown: ${error instanceof Error ? error.message : String(error)}`;
        return;
      }
      try {
        result.substitutedTex = substitutedTex(node, texCtx);
      } catch {
        result.substitutedTex = null;
      }
    });
  } finally {
    setDisplayUnits(math, before);
  }
}

/** A calculation cell's result whose `statements` are presented on first read. */
export function cellResultOf(fields: Omit<CellResult, 'statements'>, statements: PresentedStatements): CellResult {
  const result = {
    id: fields.id,
    index: fields.index,
    kind: fields.kind,
    ok: fields.ok,
    error: fields.error,
    statements: undefined as unknown as StatementResult[],
    warnings: fields.warnings,
    defines: fields.defines,
    uses: fields.uses,
  };
  Object.defineProperty(result, 'statements', {
    enumerable: true,
    configurable: true,
    get: () => statements.get(),
  });
  return result;
}
