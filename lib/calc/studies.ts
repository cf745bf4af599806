// What an engineering study asks of a sheet beyond single values: re-evaluating the statements that
// depend on one input with that input changed. Sweeps and plots do it once per value of the input;
// uncertainty propagation does it for sensitivity coefficients (JCGM 100:2008, 5.1.3) and for each
// Monte Carlo draw (JCGM 101:2008). Every re-evaluation runs the sheet's own compiled statements, so
// a sweep's row equals what the sheet gives when that value is written in.
import type { MathJsInstance, Unit } from 'mathjs';
import { cleanMessage } from './messages';
import {
  displayValue,
  formatFixedTex,
  formatFixedText,
  formatNumberText,
  quantityParts,
  unitTex,
  unitText,
} from './format';
import type { BudgetLine, MonteCarloSummary, PlotData, StudyTable, UncertaintyResult } from './types';
import { nameTex } from './tex';
import { parseUnitString, unitLabel } from './unit-label';
import { firstOrder, monteCarlo, roundExpanded, validateAgainstMonteCarlo, type UncertainInput } from './uncertainty';
import { LIBRARY } from './functions';
import { compileNumeric, siNumberOf, type NumericChainContext } from './numeric-chain';
import { numericLibraryCall } from './library-adapter';

/** A statement that defines a name, as the engine re-evaluates it in a scope of its choosing. */
export interface ChainStatement {
  defines: string;
  /** Sheet names it reads directly. */
  uses: readonly string[];
  /** Evaluates the statement in `scope` and stores what it defines there. */
  run(scope: Map<string, unknown>): void;
  /** The tree `run` evaluates, for a value (not a function or a cited value): compiled on SI numbers where it can be (numeric-chain.ts). */
  node?: unknown;
}

let numericChainOn = true;

/** Statements compiled on SI numbers and chains refused since the process started (for tests and benchmarks). */
export const numericChainCounts = { compiled: 0, refused: 0 };

/** Turns the evaluation on SI numbers off (on by default), so that tests compare it with mathjs's own. */
export function setNumericChain(on: boolean): void {
  numericChainOn = on;
}

const LIBRARY_NAMES: ReadonlySet<string> = new Set(LIBRARY.map((f) => f.name));
const LIBRARY_BY_NAME = new Map(LIBRARY.map((f) => [f.name, f]));
const LIBRARY_KINDS = new Map<string, readonly string[]>(LIBRARY.map((f) => [f.name, f.params.map((p) => p.kind)]));

/**
 * The statements a propagation re-evaluates for one set of inputs, compiled on SI numbers in sheet
 * order, as far as the targets asked for so far; and, for a Monte Carlo series, each statement's value
 * in each draw, so that a later result of the same draws goes on from there.
 */
class NumericChain {
  /** Slot of each changed name: the inputs first, then each statement re-evaluated. */
  private readonly slotOf = new Map<string, number>();
  private readonly steps: Array<{
    slot: number;
    run: (slots: Float64Array) => number;
    /** Slots of the changed names the statement reads (a failure there is its failure). */
    reads: number[];
    column?: Float64Array;
  }> = [];
  /** Values at the sheet's values (to check each compiled statement against what the sheet gave). */
  private nominal: Float64Array;
  /** Position in the chain up to which the statements are compiled. */
  private upTo: number;
  private readonly changed: Set<string>;
  private refused = false;
  /** Per draw: statements evaluated, and the statements that failed in it (by slot, with the error). */
  private done?: Int32Array;
  private readonly drawFailures = new Map<number, Map<number, unknown>>();
  private scratch: Float64Array;

  constructor(
    private readonly math: MathJsInstance,
    private readonly re: Reevaluator,
    private readonly inputs: readonly string[],
    private readonly trials = 0,
  ) {
    this.changed = new Set(inputs);
    this.nominal = new Float64Array(inputs.length + 8);
    this.scratch = new Float64Array(this.nominal.length);
    let first = Infinity;
    inputs.forEach((name, k) => {
      const si = siNumberOf(math, re.base.get(name));
      const at = re.position(name);
      if (si === undefined || at < 0) this.refused = true;
      else this.nominal[k] = si;
      this.slotOf.set(name, k);
      first = Math.min(first, at);
    });
    this.upTo = first;
    if (trials > 0) {
      this.done = new Int32Array(trials);
    }
  }

  private compileContext?: NumericChainContext;

  /** What compileNumeric reads of the sheet, made once per chain. */
  private context(): NumericChainContext {
    const math = this.math;
    return (this.compileContext ??= {
      math,
      base: this.re.base,
      libraryNames: LIBRARY_NAMES,
      slotOf: (name) => this.slotOf.get(name),
      paramKinds: (fn) => LIBRARY_KINDS.get(fn),
      libraryNumeric: (fn, nominal) => {
        const f = LIBRARY_BY_NAME.get(fn);
        return f ? numericLibraryCall(math, f, nominal) : null;
      },
    });
  }

  /** Number of statements to evaluate for `target`, or −1 when the fast path cannot give it. */
  stepsFor(target: string): number {
    if (this.refused) return -1;
    const last = this.re.position(target);
    for (let i = this.upTo + 1; i <= last && !this.refused; i++) {
      const st = this.re.statement(i);
      this.upTo = i;
      if (this.changed.has(st.defines) || !st.uses.some((u) => this.changed.has(u))) continue;
      if (this.re.unavailable(st)) continue;
      this.changed.add(st.defines);
      const slot = this.inputs.length + this.steps.length;
      if (slot >= this.nominal.length) {
        const grown = new Float64Array(this.nominal.length * 2);
        grown.set(this.nominal);
        this.nominal = grown;
        this.scratch = new Float64Array(grown.length);
      }
      // The sheet's value of the statement: the result of its last operation, not done again.
      const value = this.re.base.get(st.defines);
      const run = st.node
        ? compileNumeric(this.context(), st.node as Parameters<typeof compileNumeric>[1], this.nominal, { value })
        : null;
      const si = siNumberOf(this.math, value);
      // The statement on SI numbers must give exactly what the sheet gave at the sheet's values
      // (compileNumeric checks that against `value`, without running the statement again).
      if (!run || si === undefined) {
        this.refused = true;
        numericChainCounts.refused++;
        break;
      }
      numericChainCounts.compiled++;
      this.nominal[slot] = si;
      const reads: number[] = [];
      for (const u of st.uses) {
        const read = this.slotOf.get(u);
        if (read !== undefined) reads.push(read);
      }
      this.slotOf.set(st.defines, slot);
      this.steps.push({ slot, run, reads, column: this.trials > 0 ? new Float64Array(this.trials) : undefined });
    }
    if (this.refused) return -1;
    const slot = this.slotOf.get(target);
    if (slot === undefined || slot < this.inputs.length) return -1;
    return slot - this.inputs.length + 1;
  }

  /** Runs made at given inputs (by their values), as far as they went: the first-order steps are the same for every result. */
  private readonly runs = new Map<string | number, { values: number[]; failed: Map<number, unknown> | null }>();

  /**
   * The target's SI value (the statement `count` − 1) with the inputs at `x`; throws what the target's
   * statement, or a statement it reads, throws. A statement between the inputs and the target that
   * the target does not read may fail without failing the target: it is another result's model.
   */
  evaluate(x: readonly number[], count: number): number {
    const s = this.scratch;
    let atNominal = true;
    for (let k = 0; k < x.length; k++) {
      s[k] = x[k];
      if (!Object.is(x[k], this.nominal[k])) atNominal = false;
    }
    // At the sheet's values every compiled statement gave the sheet's own value (checked in stepsFor).
    if (atNominal) return this.nominal[this.steps[count - 1].slot];
    // One input (the usual case) is keyed by its value itself, without making a string.
    const key = x.length === 1 ? x[0] : x.join('\0');
    let run = this.runs.get(key);
    if (!run) {
      run = { values: [], failed: null };
      if (this.runs.size < REUSED_RUNS_LIMIT) this.runs.set(key, run);
    }
    const { values } = run;
    let k = 0;
    for (const end = Math.min(values.length, count); k < end; k++) s[this.steps[k].slot] = values[k];
    for (; k < count; k++) {
      const step = this.steps[k];
      let v = NaN;
      const upstream = run.failed ? failureRead(run.failed, step.reads) : NO_FAILURE;
      if (upstream !== NO_FAILURE) run.failed!.set(step.slot, upstream);
      else {
        try {
          v = step.run(s);
        } catch (error) {
          (run.failed ??= new Map()).set(step.slot, error);
        }
      }
      s[step.slot] = v;
      values.push(v);
    }
    const target = this.steps[count - 1].slot;
    if (run.failed?.has(target)) throw run.failed.get(target);
    return s[target];
  }

  /** The same in draw `t` of a series, going on from the statements an earlier result evaluated in it. */
  evaluateDraw(t: number, x: readonly number[], count: number): number {
    const s = this.scratch;
    const done = this.done!;
    for (let k = 0; k < x.length; k++) s[k] = x[k];
    let k = 0;
    for (const end = Math.min(done[t], count); k < end; k++) {
      const step = this.steps[k];
      s[step.slot] = step.column![t];
    }
    let failed = this.drawFailures.get(t);
    for (; k < count; k++) {
      const step = this.steps[k];
      let v = NaN;
      const upstream = failed ? failureRead(failed, step.reads) : NO_FAILURE;
      if (upstream !== NO_FAILURE) failed!.set(step.slot, upstream);
      else {
        try {
          v = step.run(s);
        } catch (error) {
          if (!failed) this.drawFailures.set(t, (failed = new Map()));
          failed.set(step.slot, error);
        }
      }
      s[step.slot] = step.column![t] = v;
      done[t] = k + 1;
    }
    const target = this.steps[count - 1].slot;
    if (failed?.has(target)) throw failed.get(target);
    return s[target];
  }
}

const NO_FAILURE = Symbol('no failure');

/** The error of the first of `reads` (slots) that failed, or NO_FAILURE. */
function failureRead(failed: ReadonlyMap<number, unknown>, reads: readonly number[]): unknown {
  for (const r of reads) if (failed.has(r)) return failed.get(r);
  return NO_FAILURE;
}

/** A statement's value in a Monte Carlo draw where it (or a statement it reads) could not be evaluated. */
class FailedInDraw {
  constructor(readonly error: unknown) {}
}

/** A scope that reads through to the sheet's scope and keeps its own writes. */
class OverlayScope extends Map<string, unknown> {
  constructor(private readonly base: ReadonlyMap<string, unknown>) {
    super();
  }
  override get(key: string): unknown {
    return super.has(key) ? super.get(key) : this.base.get(key);
  }
  override has(key: string): boolean {
    return super.has(key) || this.base.has(key);
  }
  /** Written in this scope (changed from the sheet's value). */
  hasOwn(key: string): boolean {
    return super.has(key);
  }
  override keys(): MapIterator<string> {
    return new Set([...this.base.keys(), ...super.keys()]).values();
  }
}

/** Monte Carlo trials per result; fixed, with a fixed seed, so that an evaluation is reproducible. */
const MONTE_CARLO_TRIALS = 10_000;
const MONTE_CARLO_SEED = 20_081_231;
/**
 * Monte Carlo propagations per sheet evaluation (each 10 000 runs of its model). Counted in sheet
 * order, cached cells included, so the same sheet always gets the same ones.
 */
export const MONTE_CARLO_PER_SHEET = 8;

/** Re-evaluations kept per evaluation for propagation (each a handful of values); beyond, none are kept. */
const REUSED_RUNS_LIMIT = 60_000;

export class Reevaluator {
  /**
   * Runs made with a key (the inputs' names and values): the scope they reached and how far, so
   * that a later result of the same inputs goes on from there instead of evaluating the statements
   * above it again. Uncertainty propagation asks for the same draws and steps for every result.
   */
  private readonly reused = new Map<string, RunState>();

  constructor(
    readonly base: ReadonlyMap<string, unknown>,
    private readonly chain: readonly ChainStatement[],
    private readonly index: ReadonlyMap<string, number>,
  ) {}

  /** Position of a name's definition in the sheet, or −1. */
  position(name: string): number {
    return this.index.get(name) ?? -1;
  }

  /** The definition at a position of the chain. */
  statement(i: number): ChainStatement {
    return this.chain[i];
  }

  /**
   * A definition the sheet could not evaluate (its name has no value): nothing evaluated reads it, so
   * no result a propagation asks for depends on it, and it is not evaluated again. Before, a failed
   * statement between an uncertain input and an unrelated result (z = y + x with y undefined, above
   * w = f(x)) made the result's propagation fail with the other statement's error, and whether it
   * did depended on which cells came from the cache.
   */
  unavailable(st: ChainStatement): boolean {
    return !this.base.has(st.defines);
  }

  private readonly numericChains = new Map<string, NumericChain>();
  private readonly numericSeries = new Map<string, NumericChain>();

  /**
   * The SI value of `target` as a function of the inputs' SI values, evaluated on plain numbers
   * (numeric-chain.ts), or null where the statements cannot be (then `run` is the way).
   */
  numericModel(
    math: MathJsInstance,
    inputs: readonly string[],
    target: string,
  ): ((x: readonly number[]) => number) | null {
    if (!numericChainOn) return null;
    const key = inputs.join('\0');
    let chain = this.numericChains.get(key);
    if (!chain) this.numericChains.set(key, (chain = new NumericChain(math, this, inputs)));
    const count = chain.stepsFor(target);
    if (count < 0) return null;
    const c = chain;
    return (x) => c.evaluate(x, count);
  }

  /**
   * The same for the draws of a Monte Carlo series (see runInSeries): draw `t` of the series with the
   * inputs at `x`, going on from the statements an earlier result of the series evaluated.
   */
  numericSeriesModel(
    math: MathJsInstance,
    series: string,
    trials: number,
    inputs: readonly string[],
    target: string,
  ): ((t: number, x: readonly number[]) => number) | null {
    if (!numericChainOn) return null;
    let chain = this.numericSeries.get(series);
    if (!chain) {
      chain = new NumericChain(math, this, inputs, trials);
      if (this.numericSeries.size < SERIES_LIMIT) this.numericSeries.set(series, chain);
    }
    const count = chain.stepsFor(target);
    if (count < 0) return null;
    const c = chain;
    return (t, x) => c.evaluateDraw(t, x, count);
  }

  /**
   * The values of `targets` with the inputs in `overrides` replaced: every statement between the
   * first input and the last target that reads a changed name is evaluated again, in sheet order.
   * Throws the error of the first target that failed, or that reads a statement that failed (one
   * the targets do not read may fail: it is another result's model). With `key` (naming the overrides exactly), the run is kept and a
   * later run with the same key goes on from where it stopped (the overrides, given as a function,
   * are then made only when the key is new).
   */
  run(
    overrides: ReadonlyMap<string, unknown> | (() => ReadonlyMap<string, unknown>),
    targets: readonly string[],
    key?: string,
  ): Map<string, unknown> {
    const state = this.advance(overrides, targets, key === undefined ? undefined : this.reused.get(key), key);
    for (const t of targets) if (state.failed.has(t)) throw state.failed.get(t);
    const out = new Map<string, unknown>();
    for (const t of targets) out.set(t, state.scope.get(t));
    return out;
  }

  /**
   * The value of `target` in run `index` of the numbered series `series` (the draws of one Monte Carlo
   * propagation: the same inputs, distributions and seed give the same draw at the same index for every
   * result). Kept in an array rather than under a key made of the draw's values, so that a later result
   * of the same draws goes on from where an earlier one stopped without building and hashing a key.
   */
  runInSeries(series: string, index: number, overrides: () => ReadonlyMap<string, unknown>, target: string): unknown {
    let runs = this.series.get(series);
    if (!runs) {
      runs = { columns: new Map(), done: [], scope: new OverlayScope(this.base) };
      if (this.series.size < SERIES_LIMIT) this.series.set(series, runs);
    }
    const { columns, scope } = runs;
    let done = runs.done[index];
    scope.clear();
    if (done === undefined) {
      let first = Infinity;
      for (const [name, value] of overrides()) {
        let column = columns.get(name);
        if (!column) columns.set(name, (column = []));
        column[index] = value;
        first = Math.min(first, this.position(name));
      }
      done = Math.max(-1, first);
    }
    // A draw's values so far, one column per changed name (no scope or set kept per draw).
    for (const [name, column] of columns) if (index in column) scope.set(name, column[index]);
    const last = this.position(target);
    for (let i = done + 1; i <= last; i++) {
      const st = this.chain[i];
      if (!scope.hasOwn(st.defines) && !this.unavailable(st)) {
        let reads = false;
        for (let k = 0; k < st.uses.length && !reads; k++) reads = scope.hasOwn(st.uses[k]);
        if (reads) {
          // A statement that fails, or reads one that did, is failed in this draw; only a target
          // that is (or reads) it fails with it.
          let value: unknown;
          for (let k = 0; k < st.uses.length && value === undefined; k++) {
            const read = scope.get(st.uses[k]);
            if (read instanceof FailedInDraw) value = read;
          }
          if (value === undefined) {
            try {
              st.run(scope);
              value = scope.get(st.defines);
            } catch (error) {
              value = new FailedInDraw(error);
            }
          }
          scope.set(st.defines, value);
          let column = columns.get(st.defines);
          if (!column) columns.set(st.defines, (column = []));
          column[index] = value;
        }
      }
      done = i;
    }
    runs.done[index] = Math.max(done, runs.done[index] ?? -1);
    const value = scope.get(target);
    if (value instanceof FailedInDraw) throw value.error;
    return value;
  }

  private readonly series = new Map<string, Series>();

  private advance(
    overrides: ReadonlyMap<string, unknown> | (() => ReadonlyMap<string, unknown>),
    targets: readonly string[],
    state: RunState | undefined,
    key?: string,
  ): RunState {
    if (!state) {
      if (typeof overrides === 'function') overrides = overrides();
      const scope = new OverlayScope(this.base);
      const changed = new Set<string>();
      let first = Infinity;
      for (const [name, value] of overrides) {
        scope.set(name, value);
        changed.add(name);
        first = Math.min(first, this.position(name));
      }
      state = { scope, changed, done: Math.max(-1, first), failed: new Map() };
      if (key !== undefined && this.reused.size < REUSED_RUNS_LIMIT) this.reused.set(key, state);
    }
    const { scope, changed } = state;
    let last = -1;
    for (const t of targets) last = Math.max(last, this.position(t));
    for (let i = state.done + 1; i <= last; i++) {
      const st = this.chain[i];
      if (!changed.has(st.defines) && !this.unavailable(st)) {
        let reads = false;
        for (let k = 0; k < st.uses.length && !reads; k++) reads = changed.has(st.uses[k]);
        if (reads) {
          // A statement that fails, or reads one that did, is failed in this run; only a target
          // that is (or reads) it fails with it (run).
          let upstream: unknown = NO_FAILURE;
          if (state.failed.size)
            for (let k = 0; k < st.uses.length && upstream === NO_FAILURE; k++)
              if (state.failed.has(st.uses[k])) upstream = state.failed.get(st.uses[k]);
          if (upstream !== NO_FAILURE) state.failed.set(st.defines, upstream);
          else {
            try {
              st.run(scope);
            } catch (error) {
              state.failed.set(st.defines, error);
            }
          }
          changed.add(st.defines);
        }
      }
      state.done = i;
    }
    return state;
  }
}

/** The draws of one Monte Carlo series: each changed name's value per draw, and how far each draw has gone. */
interface Series {
  columns: Map<string, unknown[]>;
  done: number[];
  /** Scratch scope, refilled for each draw. */
  scope: OverlayScope;
}

interface RunState {
  scope: OverlayScope;
  changed: Set<string>;
  done: number;
  /** Statements that failed in the run, or read one that did, with the error. */
  failed: Map<string, unknown>;
}

/** Monte Carlo series kept per evaluation (each MONTE_CARLO_TRIALS runs); beyond, none are kept. */
const SERIES_LIMIT = MONTE_CARLO_PER_SHEET;

function messageOf(error: unknown): string {
  // A row's error is shown to a person: never mathjs's own wording (messages.ts).
  return cleanMessage(error);
}

/** A scalar's SI number (mathjs keeps a unit's value in SI), or null for anything else. */
export function siOf(math: MathJsInstance, v: unknown): number | null {
  if (typeof v === 'number') return v;
  if (math.isUnit(v) && (v as Unit).value !== null) return (v as Unit).value as number;
  return null;
}

/** A value like `template` with the SI number `si`. */
function withSi(template: unknown, si: number): unknown {
  if (typeof template === 'number') return si;
  const u = (template as Unit).clone();
  (u as unknown as { value: number }).value = si;
  return u;
}

/** How a scalar is displayed: its unit string, its unit as text and TeX, and SI per display unit. */
interface DisplayUnit {
  unit: string | null;
  text: string;
  tex: string;
  /** SI value of one display unit. */
  factor: number;
  /** An SI number in the display unit, converted as mathjs converts it for display. */
  fromSi: (si: number) => number;
}

/**
 * The budget's and the uncertainty lines' figures are short summaries at three or four digits, not
 * the sheet's significant figures: written without trailing zeros (0.5 MeV, not 0.500 MeV, which
 * would claim a precision the uncertainty does not have; JCGM 100:2008, 7.2.6).
 */
const SUMMARY = { trailingZeros: false } as const;

const SUPERSCRIPT: Record<string, string> = {
  '-': '⁻',
  '0': '⁰',
  '1': '¹',
  '2': '²',
  '3': '³',
  '4': '⁴',
  '5': '⁵',
  '6': '⁶',
  '7': '⁷',
  '8': '⁸',
  '9': '⁹',
  '.': '·',
};

/** The unit of a sensitivity coefficient, result unit per input unit, with like factors cancelled: (MeV/c)/MeV is 1/c. */
function quotientText(dy: DisplayUnit, dx: DisplayUnit): string {
  const top = dy.unit ? parseUnitString(dy.unit) : [];
  const bottom = dx.unit ? parseUnitString(dx.unit) : [];
  if (top && bottom) {
    const powers = new Map<string, number>();
    for (const p of top) powers.set(p.name, (powers.get(p.name) ?? 0) + p.power);
    for (const p of bottom) powers.set(p.name, (powers.get(p.name) ?? 0) - p.power);
    const parts = [...powers].filter(([, power]) => power !== 0).map(([name, power]) => ({ name, power }));
    if (!parts.length) return '';
    // Only a denominator: c⁻¹ rather than "1/c", which would read as a number beside the coefficient.
    if (parts.every((p) => p.power < 0))
      return parts
        .map(
          (p) =>
            `${unitText([{ name: p.name, power: 1 }])}${[...String(p.power)].map((ch) => SUPERSCRIPT[ch] ?? ch).join('')}`,
        )
        .join('·');
    return unitText(parts);
  }
  return dy.text && dx.text ? `${dy.text}/${dx.text}` : dy.text || (dx.text ? `1/${dx.text}` : '');
}

// Each engine's parsed unit of one display unit, by unit string: parsing it is most of what a display
// unit costs, and a sheet cannot define units (createUnit is disabled for sheet code), so the same
// string always parses to the same unit in one mathjs instance.
const displayTemplates = new WeakMap<MathJsInstance, Map<string, Unit & { _denormalize(x: number): number }>>();

function displayTemplate(math: MathJsInstance, unitString: string): Unit & { _denormalize(x: number): number } {
  let byString = displayTemplates.get(math);
  if (!byString) displayTemplates.set(math, (byString = new Map()));
  let template = byString.get(unitString);
  if (!template) {
    template = math.unit(1, unitString) as Unit & { _denormalize(x: number): number };
    byString.set(unitString, template);
  }
  return template;
}

function displayUnitOf(math: MathJsInstance, v: unknown): DisplayUnit {
  if (typeof v === 'number' || !math.isUnit(v)) return { unit: null, text: '', tex: '', factor: 1, fromSi: (si) => si };
  const q = quantityParts(math, v as Unit);
  if (!q.unitString)
    return {
      unit: null,
      text: '',
      tex: '',
      factor: ((v as Unit).value as number) / (q.number || 1),
      fromSi: (si) => si / (((v as Unit).value as number) / (q.number || 1)),
    };
  const template = displayTemplate(math, q.unitString);
  const factor = template.value as number;
  // The text and TeX are wanted only when the result is presented: made then, once.
  let text: string | undefined;
  let tex: string | undefined;
  return {
    unit: q.unitString,
    get text() {
      return (text ??= unitText(q.parts));
    },
    get tex() {
      return (tex ??= unitTex(q.parts));
    },
    factor,
    fromSi: (si) => template._denormalize(si),
  };
}

/** "value ± U" with the value rounded to the last digit of U (two significant digits, JCGM 100 7.2.6). */
function measuredText(y: number, U: number, unit: { text: string; tex: string }): { text: string; tex: string } {
  const { U: Ur, lastDigitExponent: e } = roundExpanded(U);
  const scale =
    Math.abs(y) >= 1e6 || (Math.abs(y) < 1e-3 && Math.abs(Ur) < 1e-3) || e < -9
      ? Math.floor(Math.log10(Math.max(Math.abs(y), Ur) || 1))
      : 0;
  const decimals = Math.max(0, scale - e);
  const ys = y / 10 ** scale;
  const Us = Ur / 10 ** scale;
  const round = (x: number) => (e > scale ? Math.round(x / 10 ** (e - scale)) * 10 ** (e - scale) : x);
  const yText = formatFixedText(round(ys), decimals);
  const uText = formatFixedText(round(Us), decimals);
  const yTex = formatFixedTex(round(ys), decimals);
  const uTex = formatFixedTex(round(Us), decimals);
  const pow = scale ? ` × 10${String(scale).replace(/[-0-9]/g, (d) => '⁻⁰¹²³⁴⁵⁶⁷⁸⁹'['-0123456789'.indexOf(d)])}` : '';
  const powTex = scale ? ` \\times 10^{${scale}}` : '';
  const grouped = pow || unit.text;
  const text = `${grouped ? '(' : ''}${yText} ± ${uText}${grouped ? ')' : ''}${pow}${unit.text ? ` ${unit.text}` : ''} (k = 2)`;
  const tex = `${grouped ? '\\left(' : ''}${yTex} \\pm ${uTex}${grouped ? '\\right)' : ''}${powTex}${unit.tex ? `\\ ${unit.tex}` : ''}\\ (k = 2)`;
  return { text, tex };
}

/**
 * The words and TeX of uncertainties (an input's "u = …; y ± U"; a propagated one's budget lines,
 * "y ± U" and Monte Carlo summary), made when their statement is presented (engine/present.ts),
 * under the display units of the evaluation that made them; none of it decides a value.
 */
const unpresented = new WeakMap<UncertaintyResult, () => void>();

/**
 * Above this standard uncertainty (in SI), an uncertainty's figures in the display unit are worked out
 * as it is evaluated, so that one too large to be shown (U = 2u in the display unit not finite,
 * refused by roundExpanded) is the statement's error as it always was; at or below it they are worked
 * out when the statement is presented. Below it, U overflows only in a display unit under 10⁻²⁰⁸ of
 * the SI unit (a unit written so, `to qm^7`); presenting it then says the uncertainty cannot be shown.
 */
const FIGURES_WHEN_PRESENTED = 1e100;

/**
 * A display-dependent part of an uncertainty (`figures`: u, U and the unit in the display unit; `words`:
 * text, TeX, budget), run when the statement is presented, or the figures at once when they must be.
 */
function presentLater(result: UncertaintyResult, uSi: number, figures: () => void, words: () => void): void {
  if (uSi <= FIGURES_WHEN_PRESENTED) {
    unpresented.set(result, () => {
      figures();
      words();
    });
  } else {
    figures();
    unpresented.set(result, words);
  }
}

/** An input's own standard uncertainty, for display beside its value. */
export function inputUncertainty(math: MathJsInstance, value: unknown, u: unknown, sig: number): UncertaintyResult {
  const ySi = siOf(math, value) ?? 0;
  const uSi = siOf(math, u) ?? 0;
  const result: UncertaintyResult = {
    kind: 'input',
    u: 0,
    U: 0,
    k: 2,
    unit: null,
    text: '',
    tex: '',
    budget: [],
    nonLinear: false,
    monteCarlo: null,
    warning: null,
  };
  // The figures in the value's display unit, and the words and TeX, when the statement is presented
  // (presentUncertainty), as for a propagated one; none of it decides a value.
  let du: DisplayUnit;
  let U = 0;
  presentLater(
    result,
    uSi,
    () => {
      du = displayUnitOf(math, value);
      const uu = uSi / du.factor;
      U = 2 * uu;
      result.u = uu;
      result.U = roundExpanded(U).U;
      result.unit = du.unit;
    },
    () => {
      const shown = measuredText(ySi / du.factor, U, du);
      result.text = `standard uncertainty u = ${formatNumberText(result.u, Math.min(sig, 3), SUMMARY)}${du.text ? ` ${du.text}` : ''}; ${shown.text}`;
      result.tex = shown.tex;
    },
  );
  return result;
}

export interface PropagationInput {
  name: string;
  value: unknown;
  u: unknown;
}

/**
 * The combined standard uncertainty of `target` (value `y`) from the uncertain inputs it depends
 * on, with the budget; a Monte Carlo propagation as well when the model is markedly non-linear or
 * when asked for, and a warning when the two disagree.
 */
export function propagateUncertainty(
  math: MathJsInstance,
  re: Reevaluator,
  target: string,
  y: unknown,
  inputs: readonly PropagationInput[],
  sig: number,
  monteCarloMode: 'auto' | 'always',
  /** Asked before each Monte Carlo run: false once the sheet has used its share (MONTE_CARLO_PER_SHEET). */
  takeMonteCarloSlot: () => boolean = () => true,
  /** Correlation coefficient of two inputs by name (1 for the same, 0 when none is given). */
  correlationOf?: (a: string, b: string) => number,
): UncertaintyResult {
  const ySi = siOf(math, y);
  if (ySi === null) throw new Error('an uncertainty is propagated to single values only (not to lists)');
  const xs: UncertainInput[] = inputs.map((i) => ({ value: siOf(math, i.value)!, u: Math.abs(siOf(math, i.u)!) }));
  // The same inputs at the same values give every result of the sheet from one run (Reevaluator).
  const names = inputs.map((i) => i.name).join('\0');
  const numeric = re.numericModel(
    math,
    inputs.map((i) => i.name),
    target,
  );
  const slow = (x: readonly number[]): number => {
    const out = re
      .run(() => new Map(inputs.map((i, k) => [i.name, withSi(i.value, x[k])])), [target], `${names}\0${x.join('\0')}`)
      .get(target);
    const si = siOf(math, out);
    if (si === null) throw new Error(`${target} is not a single value`);
    return si;
  };
  const model = numeric ?? slow;
  const correlation =
    correlationOf && inputs.length > 1
      ? inputs.map((a) => inputs.map((b) => correlationOf(a.name, b.name)))
      : undefined;
  const correlated = correlation?.some((row, i) => row.some((r, j) => i !== j && r !== 0)) ? correlation : undefined;
  const fo = firstOrder(model, xs, correlated ? { correlation: correlated } : undefined);
  // Everything below in the display unit of the result (dy) is made when the statement is presented
  // (presentLater): the figures, the budget's lines, the words and TeX.
  let dy: DisplayUnit;
  const budgetOf = (): BudgetLine[] =>
    inputs.map((input, k) => {
      const dx = displayUnitOf(math, input.value);
      // An input with u = 0 contributes nothing; its sensitivity is not evaluated (NaN from firstOrder).
      const c = Number.isFinite(fo.sensitivities[k]) ? fo.sensitivities[k] : 0;
      const cShown = (c * dx.factor) / dy.factor;
      const unitOfC = quotientText(dy, dx);
      const contribution = Math.abs(fo.contributions[k]) / dy.factor;
      return {
        name: input.name,
        valueText: displayValue(math, input.value, sig).text,
        uText: `${formatNumberText(xs[k].u / dx.factor, Math.min(sig, 3), SUMMARY)}${dx.text ? ` ${dx.text}` : ''}`,
        sensitivity: c,
        sensitivityText: Number.isFinite(fo.sensitivities[k])
          ? `${formatNumberText(cShown, Math.min(sig, 4), SUMMARY)}${unitOfC ? ` ${unitOfC}` : ''}`
          : 'not evaluated (u = 0)',
        contribution,
        contributionText: `${formatNumberText(contribution, Math.min(sig, 3), SUMMARY)}${dy.text ? ` ${dy.text}` : ''}`,
        share: fo.shares[k],
      };
    });
  let mc: MonteCarloSummary | null = null;
  let warning: string | null = null;
  /** The Monte Carlo figures in SI, converted to the display unit with the others. */
  let mcSi: { r: ReturnType<typeof monteCarlo>; v: ReturnType<typeof validateAgainstMonteCarlo> } | null = null;
  const wanted = fo.nonLinear || monteCarloMode === 'always';
  if (wanted && !takeMonteCarloSlot()) {
    warning = fo.nonLinear
      ? `the model is markedly non-linear here and the first-order result may be poor; the Monte Carlo check was not run (at most ${MONTE_CARLO_PER_SHEET} per sheet, to stay within the evaluation time limit)`
      : null;
  } else if (wanted) {
    // The draws depend only on the inputs, their correlation and the seed: every result of the same
    // inputs sees the same draw at the same index, so each goes on from the statements evaluated for it.
    const series = `${names}\0${xs.map((x) => `${x.value}\0${x.u}`).join('\0')}\0${correlated ? correlated.join(';') : ''}`;
    // monteCarlo calls the model once per trial, in order, so a count names the draw.
    let trial = 0;
    const numericDraw = re.numericSeriesModel(
      math,
      series,
      MONTE_CARLO_TRIALS,
      inputs.map((i) => i.name),
      target,
    );
    const drawn = numericDraw
      ? (x: readonly number[]): number => numericDraw(trial++, x)
      : (x: readonly number[]): number => {
          const out = re.runInSeries(
            series,
            trial++,
            () => new Map(inputs.map((i, k) => [i.name, withSi(i.value, x[k])])),
            target,
          );
          const si = siOf(math, out);
          if (si === null) throw new Error(`${target} is not a single value`);
          return si;
        };
    const r = monteCarlo(drawn, xs, {
      trials: MONTE_CARLO_TRIALS,
      seed: MONTE_CARLO_SEED,
      ...(correlated ? { correlation: correlated } : {}),
    });
    if (r.valid < 2) {
      warning = `the Monte Carlo propagation could not evaluate the model for ${r.outOfDomain} of ${r.trials} draws (outside a function's domain); the first-order result is not reliable here`;
    } else {
      const v = validateAgainstMonteCarlo(ySi, 2 * fo.uc, fo.uc, r);
      mcSi = { r, v };
      mc = {
        trials: r.trials,
        outOfDomain: r.outOfDomain,
        seed: MONTE_CARLO_SEED,
        mean: r.mean,
        u: r.u,
        low: r.low,
        high: r.high,
        tolerance: v.tolerance,
        dLow: v.dLow,
        dHigh: v.dHigh,
        agrees: v.agrees && r.outOfDomain === 0,
        text: '',
      };
      if (r.outOfDomain > 0) {
        warning = `${r.outOfDomain} of ${r.trials} Monte Carlo draws fell outside the model's domain and were left out; the uncertainty is too large for this model near its limit`;
      }
    }
  }
  const result: UncertaintyResult = {
    kind: 'propagated',
    u: 0,
    U: 0,
    k: 2,
    unit: null,
    text: '',
    tex: '',
    budget: [],
    ...(correlated
      ? {
          correlations: inputs.flatMap((a, i) =>
            inputs
              .slice(i + 1)
              .flatMap((b, k) =>
                correlated[i][i + 1 + k] !== 0 ? [{ a: a.name, b: b.name, r: correlated[i][i + 1 + k] }] : [],
              ),
          ),
        }
      : {}),
    nonLinear: fo.nonLinear,
    monteCarlo: mc,
    warning,
  };
  let U = 0;
  const d = (si: number) => formatNumberText(si / dy.factor, Math.min(sig, 4), SUMMARY);
  presentLater(
    result,
    fo.uc,
    () => {
      dy = displayUnitOf(math, y);
      const uc = fo.uc / dy.factor;
      U = 2 * uc;
      result.u = uc;
      result.U = roundExpanded(U).U;
      result.unit = dy.unit;
      if (mc && mcSi) {
        const { r, v } = mcSi;
        mc.mean = r.mean / dy.factor;
        mc.u = r.u / dy.factor;
        mc.low = r.low / dy.factor;
        mc.high = r.high / dy.factor;
        mc.tolerance = v.tolerance / dy.factor;
        mc.dLow = v.dLow / dy.factor;
        mc.dHigh = v.dHigh / dy.factor;
        if (r.outOfDomain === 0 && !v.agrees)
          result.warning = `the first-order (GUM) interval differs from the Monte Carlo interval by more than ${d(v.tolerance)}${dy.text ? ` ${dy.text}` : ''} (JCGM 101, 8.2): use the Monte Carlo result`;
      }
    },
    () => {
      if (mc && mcSi) {
        const { r } = mcSi;
        const unit = dy.text ? ` ${dy.text}` : '';
        mc.text = `Monte Carlo (JCGM 101, ${r.trials.toLocaleString('en').replace(/,/g, '\u202f')} draws): mean ${d(r.mean)}${unit}, u = ${d(r.u)}${unit}, 95.45 % interval [${d(r.low)}, ${d(r.high)}]${unit}`;
      }
      const shown = measuredText(ySi / dy.factor, U, dy);
      result.text = shown.text;
      result.tex = shown.tex;
      result.budget = budgetOf();
    },
  );
  return result;
}

/** Fills in the text of an uncertainty propagated by propagateUncertainty, once; nothing for any other. */
export function presentUncertainty(u: UncertaintyResult | null | undefined): void {
  if (!u) return;
  const present = unpresented.get(u);
  if (!present) return;
  unpresented.delete(u);
  present();
}

export interface StudyRequest {
  kind: 'sweep' | 'plot' | 'spacetime';
  input: string;
  values: unknown[];
  targets: readonly string[];
  /** Plots only: columns of input tables to overlay as points (`dataPoints(table.x, table.y)`). */
  overlays?: ReadonlyArray<{ x: OverlayColumn; y: OverlayColumn }>;
  /** Does a target depend on the input (transitively)? */
  dependsOnInput: (name: string) => boolean;
}

/** A column of an input table as the sheet reads it (`table.column`), with the table's own numbers. */
interface OverlayColumn {
  /** `table.column`, for the legend and messages. */
  label: string;
  /** The column's elements as the sheet has them (quantities, or numbers for a column without unit). */
  values: unknown[];
  /** The attachment's numbers and unit, as read from the file. */
  raw: { unit: string | null; values: number[] };
}

/** What a dimension is, for messages: its display unit, or "a plain number". */
function dimensionWords(math: MathJsInstance, v: unknown): string {
  const unit = displayUnitOf(math, v).unit;
  return unit ? `in ${unitLabel(unit)}` : 'a plain number';
}

/**
 * A column of an input table in an axis' display unit. Where one of the column's unit is one of the
 * axis' (the same SI factor, no offset), the numbers are the table's own, unconverted; otherwise each
 * element's SI value is converted as the curves' are. Refused, naming the column, when an element
 * is not of the axis' dimension.
 */
function columnOnAxis(
  math: MathJsInstance,
  column: OverlayColumn,
  axis: DisplayUnit,
  template: unknown,
  axisName: string,
): number[] {
  if (!column.values.length) throw new Error(`\`${column.label}\` is empty; dataPoints needs at least one row`);
  const sample = column.values[0];
  const same =
    typeof template === 'number'
      ? typeof sample === 'number'
      : math.isUnit(sample) && (sample as Unit).value !== null && (sample as Unit).equalBase(template as Unit);
  if (!same)
    throw new Error(
      `\`${column.label}\` is ${dimensionWords(math, sample)}, not of the dimension of ${axisName} (${dimensionWords(math, template)})`,
    );
  const { unit, values } = column.raw;
  if (values.length === column.values.length) {
    if (unit === null && axis.unit === null && axis.factor === 1) return [...values];
    if (unit !== null && axis.unit !== null) {
      const one = math.unit(1, unit);
      const offset = one.units.some((u) => (u.unit as unknown as { offset: number }).offset !== 0);
      if (!offset && one.value === axis.factor) return [...values];
    }
  }
  return column.values.map((v) => axis.fromSi(siOf(math, v)!));
}

/** Light-year in metres (c × Julian year), the unit of long space-time diagrams. */
const LIGHT_YEAR_M = 299_792_458 * 365.25 * 86_400;

/** Evaluates a sweep, a plot or a space-time diagram. */
export function computeStudy(
  math: MathJsInstance,
  re: Reevaluator,
  scope: ReadonlyMap<string, unknown>,
  request: StudyRequest,
): { table: StudyTable | null; plot: PlotData | null } {
  const { input, values, targets } = request;
  const base = scope.get(input);
  if (siOf(math, base) === null) throw new Error(`\`${input}\` must be a single value to be swept`);
  for (const [k, v] of values.entries()) {
    const same =
      typeof base === 'number'
        ? typeof v === 'number'
        : math.isUnit(v) && (v as Unit).value !== null && (v as Unit).equalBase(base as Unit);
    if (!same) throw new Error(`value ${k + 1} of the list is not of the dimension of \`${input}\``);
  }
  for (const t of targets) {
    if (siOf(math, scope.get(t)) === null) throw new Error(`\`${t}\` is not a single value`);
  }
  const varying = targets.filter((t) => request.dependsOnInput(t));
  const rows: Array<Array<number | null>> = [];
  const errors: Array<string | null> = [];
  const raw: Array<Map<string, unknown> | null> = [];
  for (const v of values) {
    try {
      const out = varying.length ? re.run(new Map([[input, v]]), varying) : new Map<string, unknown>();
      for (const t of varying)
        if (siOf(math, out.get(t)) === null) throw new Error(`\`${t}\` is not a single value for this input`);
      raw.push(out);
      errors.push(null);
    } catch (error) {
      raw.push(null);
      errors.push(messageOf(error));
    }
  }
  const valueOf = (row: number, t: string): unknown => (request.dependsOnInput(t) ? raw[row]?.get(t) : scope.get(t));

  if (request.kind === 'sweep') {
    const units = [input, ...targets].map((n) => displayUnitOf(math, scope.get(n)));
    values.forEach((v, r) => {
      rows.push([
        // The swept value as written: a unit conversion there and back can leave a last-bit
        // residue (190 MeV → 190.000 000 000 000 03), which 15 significant digits drop.
        Number(units[0].fromSi(siOf(math, v)!).toPrecision(15)),
        ...targets.map((t, k) => {
          const x = raw[r] ? siOf(math, valueOf(r, t)) : null;
          return x === null ? null : units[k + 1].fromSi(x);
        }),
      ]);
    });
    return {
      table: {
        columns: [input, ...targets].map((n, k) => ({ name: n, unit: units[k].unit, tex: nameTex(n) })),
        rows,
        errors,
      },
      plot: null,
    };
  }

  if (request.kind === 'plot') {
    // A result that does not depend on the input is a design limit: a horizontal line at its value.
    const curves = targets.filter((t) => request.dependsOnInput(t));
    const limits = targets.filter((t) => !request.dependsOnInput(t));
    if (!curves.length)
      throw new Error(
        `none of ${targets.map((t) => `\`${t}\``).join(', ')} depends on \`${input}\`; a plot needs at least one curve (a result that does not depend on the input is drawn as a design limit)`,
      );
    const first = scope.get(curves[0]);
    const sameAsFirst = (v: unknown) =>
      typeof first === 'number' ? typeof v === 'number' : math.isUnit(v) && (v as Unit).equalBase(first as Unit);
    for (const t of targets) {
      if (t === curves[0] || sameAsFirst(scope.get(t))) continue;
      throw new Error(
        limits.includes(t)
          ? `\`${t}\` does not depend on \`${input}\`, so it is drawn as a design limit on the axis of the curves, but it is ${dimensionWords(math, scope.get(t))} and \`${curves[0]}\` is ${dimensionWords(math, first)}; a limit must be of the curves' dimension`
          : `the curves of one plot share an axis: \`${t}\` is not of the dimension of \`${curves[0]}\`; draw it in a plot of its own`,
      );
    }
    const dx = displayUnitOf(math, base);
    const dy = displayUnitOf(math, first);
    const data = (request.overlays ?? []).map(({ x, y }) => {
      const xs = columnOnAxis(math, x, dx, base, `the input \`${input}\``);
      const ys = columnOnAxis(math, y, dy, first, `the curves (\`${curves[0]}\`)`);
      if (xs.length !== ys.length)
        throw new Error(
          `\`${x.label}\` has ${xs.length} rows and \`${y.label}\` has ${ys.length}; dataPoints pairs them row by row`,
        );
      return {
        name: y.label,
        x: x.label,
        y: y.label,
        points: xs.map((v, k) => [v, ys[k]] as [number, number]),
      };
    });
    return {
      table: null,
      plot: {
        kind: 'curve',
        x: { label: input, unit: dx.unit },
        y: { label: curves.join(', '), unit: dy.unit },
        series: curves.map((t) => ({
          name: t,
          points: values.flatMap((v, r) => {
            const y = raw[r] ? siOf(math, valueOf(r, t)) : null;
            return y === null || !Number.isFinite(y)
              ? []
              : [[Number(dx.fromSi(siOf(math, v)!).toPrecision(15)), dy.fromSi(y)] as [number, number]];
          }),
        })),
        ...(limits.length
          ? { limits: limits.map((t) => ({ name: t, value: dy.fromSi(siOf(math, scope.get(t))!) })) }
          : {}),
        ...(data.length ? { data } : {}),
      },
    };
  }

  // A space-time diagram: x across, ct up, one length unit on both axes.
  const second = math.unit(1, 's');
  const metre = math.unit(1, 'm');
  if (!math.isUnit(base) || !(base as Unit).equalBase(second))
    throw new Error(`a space-time diagram sweeps a time; \`${input}\` is not a time`);
  const lines: string[] = [];
  const horizons: string[] = [];
  for (const t of targets) {
    const v = scope.get(t);
    if (!math.isUnit(v) || !(v as Unit).equalBase(metre))
      throw new Error(`\`${t}\` is not a length; a space-time diagram draws distances against time`);
    (request.dependsOnInput(t) ? lines : horizons).push(t);
  }
  if (!lines.length)
    throw new Error(
      `none of ${targets.map((t) => `\`${t}\``).join(', ')} depends on \`${input}\`; name at least one distance that does`,
    );
  const c = 299_792_458;
  let extent = 0;
  values.forEach((v, r) => {
    extent = Math.max(extent, Math.abs(siOf(math, v)! * c));
    for (const t of lines) extent = Math.max(extent, Math.abs(raw[r] ? (siOf(math, valueOf(r, t)) ?? 0) : 0));
  });
  for (const t of horizons) extent = Math.max(extent, Math.abs(siOf(math, scope.get(t))!));
  const [unit, factor] = extent >= 0.01 * LIGHT_YEAR_M ? ['ly', LIGHT_YEAR_M] : extent >= 1e4 ? ['km', 1e3] : ['m', 1];
  return {
    table: null,
    plot: {
      kind: 'spacetime',
      x: { label: 'x', unit },
      y: { label: 'ct', unit },
      series: lines.map((t) => ({
        name: t,
        points: values.flatMap((v, r) => {
          const x = raw[r] ? siOf(math, valueOf(r, t)) : null;
          return x === null || !Number.isFinite(x)
            ? []
            : [[x / factor, (siOf(math, v)! * c) / factor] as [number, number]];
        }),
      })),
      horizons: horizons.map((t) => ({ name: t, distance: siOf(math, scope.get(t))! / factor })),
    },
  };
}
