// The statements a propagation re-evaluates, compiled a second time to run on plain SI numbers, so
// that the 10 000 draws of a Monte Carlo propagation (and the steps of a first-order one) do not make
// and drop mathjs Units by the hundred thousand.
//
// Why the numbers are the same: mathjs keeps a quantity's value in coherent SI units, and for the
// operations accepted here (×, /, +, −, unary −, `to`, and the library's functions) the value of
// the result is one IEEE operation on the operands' values (Unit.multiply, Unit.divide, addScalar,
// unaryMinus, Unit.to with equal offsets), or the library function itself. So the fast path does the
// same operation on the same doubles, in the same order, and gives the same bits. The dimensions and
// the kinds of the values do not change from one draw to another (only SI values do), so they are
// checked once, on the sheet's own values: each operation is also done with mathjs on those values,
// and the node is refused unless that gives the same kind of result (a number, or a Unit with a
// number) and exactly the same SI value. The statement's last operation (its root) was done with
// mathjs by the sheet itself, on the same values: its result is the sheet's value of the statement,
// which the caller passes in (`known`), so it is checked against that value rather than done again.
//
// Anything else is refused and the propagation re-evaluates the statements with mathjs as before
// (studies.ts, Reevaluator): powers and other mathjs functions, conditionals, indexing, matrices,
// complex numbers, units with an offset (degC, degF), a dimensionless unit with a name (ppm, whose
// product with a number mathjs computes differently, math-instance.ts), functions the sheet defines,
// and a library speed argument that could carry a precise-speed companion (library-adapter.ts): any
// speed argument given as a quantity must be the result of an operation, which has none.
import type { MathJsInstance } from 'mathjs';

/** The node kinds read here (mathjs MathNode, loosely). */
interface Node {
  type: string;
  name?: string;
  fn?: Node | string;
  args?: Node[];
  content?: Node;
  value?: unknown;
}

class Refused extends Error {}

interface UnitLike {
  value: number | null;
  units: Array<{ unit: { offset: number }; power: number }>;
  dimensions: number[];
  clone(): UnitLike;
  _normalize(x: number): number;
}

/** A compiled node: its SI value from the slots, its value at the sheet's values, and whether that is a new object. */
interface Compiled {
  run: (slots: Float64Array) => number;
  nominal: unknown;
  /**
   * The SI number `run` gives at the sheet's values, worked out once from the operands' own (so that
   * checking a node does not run the nodes below it again, library calls included).
   */
  si: number;
  /** The value is made by an operation (no precise-speed companion can be attached to it). */
  made: boolean;
  /** A unit without a value (a unit literal), usable only as a factor or as the target of `to`. */
  valueless?: boolean;
}

const OPERATORS = new Set(['multiply', 'divide', 'add', 'subtract', 'unaryMinus', 'to']);

export interface NumericChainContext {
  math: MathJsInstance;
  /** The sheet's values (what each name evaluated to). */
  base: ReadonlyMap<string, unknown>;
  /** Names of the library's functions (bound by library-adapter.ts). */
  libraryNames: ReadonlySet<string>;
  /** Slot of a name whose value changes from run to run, or undefined for a name read from `base`. */
  slotOf: (name: string) => number | undefined;
  /** Kind of each library function's parameters. */
  paramKinds: (fn: string) => readonly string[] | undefined;
  /**
   * A library function on the arguments' SI numbers, given its arguments at the sheet's values
   * (library-adapter.ts, numericLibraryCall), or null: the call then goes through mathjs.
   */
  libraryNumeric?: (fn: string, nominal: readonly unknown[]) => ((args: readonly number[]) => number) | null;
}

function isPlainUnit(math: MathJsInstance, v: unknown): v is UnitLike {
  return math.isUnit(v) && (v as unknown as UnitLike).units.every((u) => u.unit.offset === 0);
}

/** A value the fast path can hold as an SI number: a finite-or-not number, or an offset-free Unit with a number. */
export function siNumberOf(math: MathJsInstance, v: unknown): number | undefined {
  if (typeof v === 'number') return v;
  if (isPlainUnit(math, v) && typeof v.value === 'number') return v.value;
  return undefined;
}

const dimensionlessNamed = (math: MathJsInstance, v: unknown): boolean =>
  math.isUnit(v) &&
  (v as unknown as UnitLike).units.length > 0 &&
  (v as unknown as UnitLike).dimensions.every((d) => Math.abs(d) < 1e-12);

/**
 * Compiles a statement's tree to a function of the slots giving its SI value, or null when some part
 * of it is refused (see the top of this file). `slots` holds the values at the sheet's values, to check
 * each operation against mathjs.
 */
export function compileNumeric(
  ctx: NumericChainContext,
  node: Node,
  slots: Float64Array,
  /**
   * The statement's value as the sheet evaluated it (mathjs on these very values): the result of the
   * root operation, which is then not done again (a library call at the root is not made again; its
   * SI number on the fast path is compared with this value's). The function returned then gives
   * exactly that value's SI number at `slots` (checked here), so the caller need not run it again.
   */
  known?: { value: unknown },
): ((slots: Float64Array) => number) | null {
  try {
    const c = compile(ctx, node, slots, known);
    if (c.valueless || siNumberOf(ctx.math, c.nominal) === undefined) return null;
    // `si` is what `run` gives at `slots`: each node's run does the same IEEE operation (or calls the
    // same pure kernel) on its operands' runs as its `si` does on theirs, and a slot's is checked
    // against the slot itself; so checking `si` checks the run without doing it again.
    if (known && !same(c.si, siNumberOf(ctx.math, known.value))) return null;
    return c.run;
  } catch {
    // Refused, or mathjs or the library threw at the sheet's values (which the sheet evaluated):
    // either way the propagation keeps to mathjs.
    return null;
  }
}

function same(a: number, b: number | undefined): boolean {
  return b !== undefined && Object.is(a, b);
}

type Mathjs = Record<string, (...x: unknown[]) => unknown>;

/** The kind checks of an operator's operands (see the top of the file). */
function operandsAccepted(math: MathJsInstance, fn: string, compiled: readonly Compiled[]): void {
  let allValueless = true;
  for (const c of compiled) {
    if (!(typeof c.nominal === 'number' || isPlainUnit(math, c.nominal))) throw new Refused();
    if (dimensionlessNamed(math, c.nominal)) throw new Refused();
    if (c.valueless && fn !== 'multiply' && fn !== 'divide') throw new Refused();
    if (!c.valueless) allValueless = false;
  }
  if (allValueless) throw new Refused();
}

/**
 * The bound library function `f` called with copies of the arguments' nominal values whose SI numbers
 * are set before each call: at the sheet's values (`atNominal`), or from the slots (`run`, where the
 * kernel has no form on SI numbers).
 */
function boundCall(math: MathJsInstance, name: string, f: (...x: unknown[]) => unknown, compiled: readonly Compiled[]) {
  const scratch: unknown[] = compiled.map((c) => (typeof c.nominal === 'number' ? 0 : (c.nominal as UnitLike).clone()));
  const callWith = (values: (i: number) => number): unknown => {
    for (let i = 0; i < compiled.length; i++) {
      const held = scratch[i];
      if (typeof held === 'number') scratch[i] = values(i);
      else (held as { value: number }).value = values(i);
    }
    return f(...scratch);
  };
  return {
    atNominal: (): unknown => callWith((i) => compiled[i].si),
    run: (s: Float64Array): number => {
      const out = callWith((i) => compiled[i].run(s));
      if (typeof out === 'number') return out;
      const si = siNumberOf(math, out);
      if (si === undefined) throw new Error(`${name} did not give a single value`);
      return si;
    },
  };
}

function compile(ctx: NumericChainContext, node: Node, slots: Float64Array, known?: { value: unknown }): Compiled {
  const { math } = ctx;
  switch (node.type) {
    case 'ParenthesisNode':
      return compile(ctx, node.content!, slots, known);
    case 'ConstantNode': {
      const c = node.value;
      if (typeof c !== 'number') throw new Refused();
      return { run: () => c, nominal: c, si: c, made: false };
    }
    case 'SymbolNode': {
      const name = node.name!;
      if (!ctx.base.has(name)) throw new Refused();
      const nominal = ctx.base.get(name);
      if (math.isUnit(nominal) && isPlainUnit(math, nominal) && nominal.value === null) {
        if (ctx.slotOf(name) !== undefined) throw new Refused();
        // A unit literal: mathjs multiplies and divides by its value in SI, _normalize(1).
        const factor = nominal._normalize(1);
        return { run: () => factor, nominal, si: factor, made: false, valueless: true };
      }
      const si = siNumberOf(math, nominal);
      if (si === undefined) throw new Refused();
      const slot = ctx.slotOf(name);
      if (slot === undefined) return { run: () => si, nominal, si, made: false };
      if (!same(slots[slot], si)) throw new Refused();
      return { run: (s) => s[slot], nominal, si, made: false };
    }
    case 'OperatorNode': {
      const fn = typeof node.fn === 'string' ? node.fn : '';
      const args = node.args ?? [];
      if (!OPERATORS.has(fn)) throw new Refused();
      if (fn === 'to') {
        if (args.length !== 2) throw new Refused();
        const a = compile(ctx, args[0], slots);
        const b = compile(ctx, args[1], slots);
        // Unit.to keeps the SI value when neither unit has an offset (checked: plain units only).
        if (a.valueless || !b.valueless || !math.isUnit(a.nominal)) throw new Refused();
        const nominal = known ? known.value : (math as unknown as Mathjs).to(a.nominal, b.nominal);
        if (!isPlainUnit(math, nominal) || !same(a.si, siNumberOf(math, nominal))) throw new Refused();
        return { run: a.run, nominal, si: a.si, made: true };
      }
      const compiled = args.map((a) => compile(ctx, a, slots));
      operandsAccepted(math, fn, compiled);
      const nominal = known ? known.value : (math as unknown as Mathjs)[fn](...compiled.map((c) => c.nominal));
      // Each operation twice: as the run's closure, and on the operands' values at the sheet's values
      // (the same IEEE operation; stepsFor then checks the whole run against the sheet's value).
      let run: (s: Float64Array) => number;
      let si: number;
      if (fn === 'unaryMinus' && compiled.length === 1) {
        const a = compiled[0].run;
        run = (s) => -a(s);
        si = -compiled[0].si;
      } else if (compiled.length === 2) {
        const a = compiled[0].run;
        const b = compiled[1].run;
        const x = compiled[0].si;
        const y = compiled[1].si;
        if (fn === 'multiply') [run, si] = [(s) => a(s) * b(s), x * y];
        else if (fn === 'divide') [run, si] = [(s) => a(s) / b(s), x / y];
        else if (fn === 'add') [run, si] = [(s) => a(s) + b(s), x + y];
        else if (fn === 'subtract') [run, si] = [(s) => a(s) - b(s), x - y];
        else throw new Refused();
      } else {
        throw new Refused();
      }
      if (dimensionlessNamed(math, nominal) || !same(si, siNumberOf(math, nominal))) throw new Refused();
      return { run, nominal, si, made: true };
    }
    case 'FunctionNode': {
      const callee = node.fn as Node | undefined;
      const name = callee?.type === 'SymbolNode' ? callee.name! : '';
      // A name the sheet defines (a function of its own) is called instead of the library's.
      if (!ctx.libraryNames.has(name) || ctx.base.has(name)) throw new Refused();
      const kinds = ctx.paramKinds(name);
      const args = node.args ?? [];
      if (!kinds || kinds.length !== args.length) throw new Refused();
      const compiled = args.map((a) => compile(ctx, a, slots));
      for (let i = 0; i < compiled.length; i++) {
        const c = compiled[i];
        if (c.valueless) throw new Refused();
        if (typeof c.nominal === 'number') continue;
        if (!isPlainUnit(math, c.nominal)) throw new Refused();
        // A speed given as a quantity may be one the library returned, with its precise companion.
        if (kinds[i] === 'speed' && !c.made) throw new Refused();
      }
      const f = (math as unknown as Mathjs)[name];
      // The call at the sheet's values: at the root, the sheet's own value of the statement (the bound
      // function on the sheet's arguments); inside a statement, the bound function on copies of the
      // arguments, which differ from the sheet's own objects only by a precise-speed companion, refused above.
      let bound: ReturnType<typeof boundCall> | undefined;
      const nominal = known ? known.value : (bound = boundCall(math, name, f, compiled)).atNominal();
      const si = siNumberOf(math, nominal);
      if (si === undefined) throw new Refused();
      // The same kernel on the SI numbers, without a Unit per argument and per result, where it gives
      // exactly the bound function's SI value at the sheet's values.
      const numeric = ctx.libraryNumeric?.(
        name,
        compiled.map((c) => c.nominal),
      );
      if (numeric && same(numeric(compiled.map((c) => c.si)), si)) {
        const runs = compiled.map((c) => c.run);
        const buffer = new Array<number>(runs.length);
        const direct = (s: Float64Array): number => {
          for (let i = 0; i < runs.length; i++) buffer[i] = runs[i](s);
          return numeric(buffer);
        };
        return { run: direct, nominal, si, made: false };
      }
      // Else the bound function itself, on copies; at the root, checked against the sheet's value here.
      if (!bound) {
        bound = boundCall(math, name, f, compiled);
        if (!same(si, siNumberOf(math, bound.atNominal()))) throw new Refused();
      }
      // A library result is a new object, but a speed may carry a companion: not `made`.
      return { run: bound.run, nominal, si, made: false };
    }
    default:
      throw new Refused();
  }
}
