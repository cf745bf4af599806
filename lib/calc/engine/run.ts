// The state of one evaluation of a sheet: the scope of values, where each name was defined, which
// names failed and why, the standard uncertainties of inputs, and (made only when a sweep, plot or
// uncertainty asks for it) the chain of definitions that re-evaluates what depends on an input.
import type { MathJsInstance, Unit } from 'mathjs';
import type { EngineMath } from '../math-instance';
import { Reevaluator, type ChainStatement } from '../studies';
import type { EvaluateOptions, ResolvedReference } from '../types';
import type { SheetPlan } from './plan';
import { compiledOnce, type ParsedStatement } from './statement';

/** What one calculation cell defines as it is evaluated: kept with its cached result. */
export interface CellRun {
  index: number;
  values: Map<string, unknown>;
  uncertainties: Map<string, unknown>;
  /** Names of this cell that are unavailable, with why. */
  failed: Map<string, string>;
}

interface Chain {
  statements: ChainStatement[];
  index: Map<string, number>;
  /** Names each definition reads directly. What depends on what further is worked out on demand. */
  directUses: Map<string, readonly string[]>;
}

/** The tree a definition's chain statement evaluates (the value, the value before ±, the function). */
function chainNode(st: ParsedStatement) {
  const node = st.node!;
  return st.kind === 'function' ? node : st.uncertain ? node.value!.args![0] : node.value!;
}

export class SheetRun {
  readonly math: MathJsInstance;
  readonly scope: Map<string, unknown>;
  /** The statement being evaluated (cell −1 before the first): what is defined is what stands up to it. */
  atCell = -1;
  atLine = 0;
  /** Names whose value is unavailable, with why. */
  readonly failed = new Map<string, string>();
  /** Cache key of each cell evaluated so far. */
  readonly cellKeys: string[] = [];
  /**
   * Per cell evaluated so far, the key of each name it first defines, from the defining statement
   * (sheet-engine.ts, `definitionKeys`; kept with the cell's cached result): a cell reading the name
   * takes this key, so an edit of another statement of the defining cell leaves the reader's key as
   * it was.
   */
  readonly nameKeys: Array<ReadonlyMap<string, string>> = [];
  /** Keys of the input tables, which are defined before the first cell. */
  readonly tableKeys = new Map<string, string>();
  /** Standard uncertainties of the inputs that carry one, by name. */
  readonly inputU = new Map<string, unknown>();
  readonly resolved: ReadonlyMap<string, ResolvedReference>;
  readonly monteCarloMode: NonNullable<EvaluateOptions['monteCarlo']>;
  monteCarloRequests = 0;
  private chainMade: Chain | null = null;
  private reevaluatorMade: Reevaluator | null = null;
  private readonly uncertainMemo = new Map<string, readonly string[]>();

  constructor(
    readonly em: EngineMath,
    readonly plan: SheetPlan,
    readonly sig: number,
    resolved: ReadonlyMap<string, ResolvedReference>,
    monteCarloMode: EvaluateOptions['monteCarlo'],
    readonly unitLiteral: (text: string) => Unit,
  ) {
    this.math = em.math;
    this.scope = new Map<string, unknown>(em.constants);
    this.resolved = resolved;
    this.monteCarloMode = monteCarloMode ?? 'auto';
  }

  get tables() {
    return this.plan.tables;
  }

  /**
   * Is the name defined at the statement being evaluated (its first definition stands at or above
   * it, or it is an input table)? A name defined again later is still defined where it first was.
   */
  isDefined(name: string): boolean {
    const at = this.plan.firstDefinition.get(name);
    return at !== undefined && (at.cell < this.atCell || (at.cell === this.atCell && at.line <= this.atLine));
  }

  /**
   * The key of a name's first definition (or of the input table), if evaluated: the key of its
   * statement, or of its cell where the statement's result may depend on others of the cell.
   */
  keyOf(name: string): string | undefined {
    const at = this.plan.firstDefinition.get(name);
    if (at === undefined) return undefined;
    if (at.cell < 0) return this.tableKeys.get(name);
    return this.nameKeys[at.cell]?.get(name) ?? this.cellKeys[at.cell];
  }

  /** Stores a value the cell defines. */
  define(name: string, value: unknown, cell: CellRun): void {
    this.scope.set(name, value);
    cell.values.set(name, value);
  }

  /** Stores the standard uncertainty of an input the cell defines. */
  defineUncertainty(name: string, u: unknown, cell: CellRun): void {
    cell.uncertainties.set(name, u);
    this.inputU.set(name, u);
  }

  /** Every name's definition in sheet order, and what each reads: made on first use. */
  chain(): Chain {
    if (this.chainMade) return this.chainMade;
    const chain: Chain = { statements: [], index: new Map(), directUses: new Map() };
    const { scope, unitLiteral } = this;
    for (const statements of this.plan.parsed) {
      for (const st of statements) {
        if (!st.defines || chain.index.has(st.defines) || !st.node || st.parseError || st.staticError) continue;
        const direct = this.plan.usesOf(st);
        const name = st.defines;
        chain.directUses.set(name, direct);
        chain.index.set(name, chain.statements.length);
        chain.statements.push({
          defines: name,
          uses: direct,
          ...(st.kind !== 'function' && !st.reference ? { node: chainNode(st) } : {}),
          run: (sc) => {
            for (const l of st.unitLiterals)
              if (!scope.has(l.placeholder)) scope.set(l.placeholder, unitLiteral(l.unit));
            if (st.reference) return; // a cited value depends on nothing in this sheet
            const value = compiledOnce(st, () => chainNode(st), true).evaluate(sc);
            if (st.kind !== 'function') sc.set(name, value);
          },
        });
      }
    }
    this.chainMade = chain;
    return chain;
  }

  reevaluator(): Reevaluator {
    const chain = this.chain();
    this.reevaluatorMade ??= new Reevaluator(this.scope, chain.statements, chain.index);
    return this.reevaluatorMade;
  }

  /** The uncertain inputs a name depends on (directly or through other names), memoised. */
  uncertainInputsOf(name: string): readonly string[] {
    let known = this.uncertainMemo.get(name);
    if (known) return known;
    const { directUses, index } = this.chain();
    const found = new Set<string>();
    for (const u of directUses.get(name) ?? []) {
      if (this.inputU.has(u)) found.add(u);
      for (const x of this.uncertainInputsOf(u)) found.add(x);
    }
    known = [...found].sort((a, b) => index.get(a)! - index.get(b)!);
    this.uncertainMemo.set(name, known);
    return known;
  }

  /** Does `name` depend on `input` (directly or through other names)? */
  dependsOn(name: string, input: string, memo = new Map<string, boolean>()): boolean {
    const known = memo.get(name);
    if (known !== undefined) return known;
    memo.set(name, false);
    const answer = (this.chain().directUses.get(name) ?? []).some((u) => u === input || this.dependsOn(u, input, memo));
    memo.set(name, answer);
    return answer;
  }
}
