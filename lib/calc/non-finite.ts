// A statement's value must be a finite real number or quantity (or a list of them): mathjs gives
// ∞ for a division by zero (`1/(1 m - 1 m)` is ∞ 1/m), NaN for 0/0, and a complex number for the
// square root of a negative quantity (`sqrt(-4 m^2)` is a complex length), all without a word. The
// engine refuses such a value with a message that says what happened and where: it finds the
// innermost part of the formula whose value is not finite and real while its operands are, and
// names that operation and its operands.
import type { MathJsInstance, MathNode, Unit } from 'mathjs';
import { displayValue } from './format';
import { unitOfPlaceholder } from './unit-literals';

type Node = MathNode & {
  type: string;
  name?: string;
  op?: string;
  fn?: Node | string;
  args?: Node[];
  condition?: Node;
  trueExpr?: Node;
  falseExpr?: Node;
  content?: Node;
};

type Problem = 'NaN' | 'infinite' | 'complex';

/** What is wrong with a single value (a number, or a quantity's number), or null when it is finite and real. */
function scalarProblem(math: MathJsInstance, x: unknown): Problem | null {
  if (typeof x === 'number') return Number.isNaN(x) ? 'NaN' : Number.isFinite(x) ? null : 'infinite';
  if (math.isComplex(x)) {
    const c = x as unknown as { re: number; im: number };
    if (Number.isNaN(c.re) || Number.isNaN(c.im)) return 'NaN';
    return c.im !== 0 ? 'complex' : Number.isFinite(c.re) ? null : 'infinite';
  }
  if (math.isUnit(x)) {
    const v = (x as Unit).value as unknown;
    return v === null || v === undefined ? null : scalarProblem(math, v);
  }
  return null;
}

/** The first element (1-based position, as "2" or "2, 3") of a value that is not finite and real. */
function firstProblem(
  math: MathJsInstance,
  value: unknown,
  at: number[] = [],
): { problem: Problem; at: number[] } | null {
  if (math.isMatrix(value)) return firstProblem(math, (value as unknown as { toArray(): unknown[] }).toArray(), at);
  if (Array.isArray(value)) {
    for (const [i, v] of value.entries()) {
      const found = firstProblem(math, v, [...at, i + 1]);
      if (found) return found;
    }
    return null;
  }
  const problem = scalarProblem(math, value);
  return problem ? { problem, at } : null;
}

/** A formula as written (without outer parentheses): unit placeholders back to their units. */
function sourceOf(node: Node): string {
  while (node.type === 'ParenthesisNode') node = node.content!;
  return node.toString().replace(/__u_[0-9a-f]+/g, (p) => unitOfPlaceholder(p) ?? p);
}

/** The SI number of a real scalar (a number or a quantity), or null. */
function siNumber(math: MathJsInstance, x: unknown): number | null {
  if (typeof x === 'number') return x;
  if (math.isUnit(x) && typeof (x as Unit).value === 'number') return (x as Unit).value as number;
  return null;
}

const WORDS: Record<Problem, string> = {
  NaN: 'is not a number (NaN)',
  infinite: 'is infinite',
  complex: 'is a complex number, not a real one',
};

/**
 * Why `value`, the value of `node` evaluated in `scope`, cannot be a statement's result, or null
 * when it is finite and real (booleans, strings and functions are not checked).
 */
export function nonFiniteReason(
  math: MathJsInstance,
  node: MathNode,
  scope: Map<string, unknown>,
  value: unknown,
  sig: number,
): string | null {
  const found = firstProblem(math, value);
  if (!found) return null;
  const shown = (x: unknown) => {
    try {
      return displayValue(math, x, sig).text;
    } catch {
      return String(x);
    }
  };
  const evaluate = (n: Node): { ok: true; value: unknown } | { ok: false } => {
    try {
      return { ok: true, value: n.compile().evaluate(scope) };
    } catch {
      return { ok: false };
    }
  };
  const bad = (n: Node) => {
    const r = evaluate(n);
    return r.ok && firstProblem(math, r.value) !== null;
  };
  // The parts of a formula whose values make up its value.
  const partsOf = (n: Node): Node[] => {
    if (n.type === 'FunctionAssignmentNode' || n.type === 'AssignmentNode') return [];
    if (n.type === 'OperatorNode' && (n.op === 'to' || n.op === 'in')) return [n.args![0]];
    if (n.type === 'ConditionalNode') {
      const c = evaluate(n.condition!);
      return c.ok ? [c.value ? n.trueExpr! : n.falseExpr!] : [];
    }
    if (n.type === 'AccessorNode') return [(n as unknown as { object: Node }).object];
    const out: Node[] = [];
    n.forEach((child: MathNode) => out.push(child as Node));
    return out;
  };
  // The innermost part whose value is not finite and real while its own parts are.
  let origin = node as Node;
  for (let depth = 0; depth < 200; depth++) {
    const next = partsOf(origin).find(bad);
    if (!next) break;
    origin = next;
  }
  while (origin.type === 'ParenthesisNode') origin = origin.content!;

  const problemOf = (n: Node) => {
    const r = evaluate(n);
    return r.ok ? (firstProblem(math, r.value)?.problem ?? null) : null;
  };
  const cause = ((): string => {
    const src = `\`${sourceOf(origin)}\``;
    const args = (origin.args ?? []).map(evaluate);
    const argValue = (i: number) => {
      const a = args[i];
      return a && a.ok ? a.value : undefined;
    };
    const fnName = origin.type === 'FunctionNode' ? (origin.fn as Node)?.name : null;
    const op = origin.type === 'OperatorNode' ? (origin.fn as string) : null;
    const negative = (x: unknown) => {
      const n = siNumber(math, x);
      return n !== null && n < 0;
    };
    const kindOf = (x: unknown) => (math.isUnit(x) ? 'quantity' : 'number');
    if ((op === 'divide' || fnName === 'divide') && siNumber(math, argValue(1)) === 0) {
      return `division by zero: the divisor \`${sourceOf(origin.args![1])}\` is zero`;
    }
    if ((op === 'mod' || fnName === 'mod') && siNumber(math, argValue(1)) === 0) {
      return `division by zero: the divisor \`${sourceOf(origin.args![1])}\` of the modulo is zero`;
    }
    if (fnName === 'sqrt' && negative(argValue(0))) {
      return `the square root of a negative ${kindOf(argValue(0))} (${shown(argValue(0))}) is not real: ${src}`;
    }
    if (op === 'pow' || fnName === 'pow') {
      const base = argValue(0);
      const exponent = siNumber(math, argValue(1));
      if (negative(base) && exponent !== null && !Number.isInteger(exponent)) {
        return `a negative ${kindOf(base)} (${shown(base)}) raised to the non-integer power ${shown(exponent)} is not real: ${src}`;
      }
      if (siNumber(math, base) === 0 && exponent !== null && exponent < 0)
        return `zero raised to a negative power (${shown(exponent)}) is a division by zero: ${src}`;
    }
    if (fnName && ['log', 'ln', 'log10', 'log2', 'log1p'].includes(fnName)) {
      const x = siNumber(math, argValue(0));
      if (x !== null && (fnName === 'log1p' ? x === -1 : x === 0)) return `the logarithm of zero is −∞: ${src}`;
      if (x !== null && (fnName === 'log1p' ? x < -1 : x < 0))
        return `the logarithm of a negative number (${shown(argValue(0))}) is not real: ${src}`;
    }
    if (fnName && ['asin', 'acos', 'acosh', 'atanh', 'asec', 'acsc'].includes(fnName)) {
      return `${fnName} of ${shown(argValue(0))} is outside the function's real domain: ${src}`;
    }
    if (origin.type === 'SymbolNode') {
      const name = origin.name!;
      if (name === 'i') return '`i` is the imaginary unit: a sheet computes real quantities';
      return `\`${name}\` ${WORDS[problemOf(origin) ?? found.problem]}`;
    }
    // Arithmetic on finite, real operands with an infinite result: the number overflowed.
    const problem = problemOf(origin) ?? found.problem;
    const arithmetic =
      origin.type === 'OperatorNode' ||
      (!!fnName && ['exp', 'pow', 'multiply', 'add', 'subtract', 'cube', 'square', 'sinh', 'cosh'].includes(fnName));
    if (
      problem === 'infinite' &&
      arithmetic &&
      args.length > 0 &&
      args.every((a) => a.ok && firstProblem(math, a.value) === null)
    ) {
      return `${src} overflows: its value (in SI units) is beyond the largest double-precision number, about 1.8 × 10³⁰⁸`;
    }
    return `${src} ${WORDS[problem]}`;
  })();
  const where = found.at.length ? `element ${found.at.join(', ')} of the list: ` : '';
  return `${where}${cause}`;
}
