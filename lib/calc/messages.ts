// Error messages in the engineer's words. mathjs reports a failure in its own terms ("Unexpected
// type of argument in function subtractScalar (expected: Unit, actual: number, index: 1)", "Unit in
// function cot is no angle", "Units do not match ('MeV' != '1.6726219259500001 yg')"): none of that
// may reach a person. When a statement fails with such an error, the engine hands it here with the
// statement's parsed tree; `engineerMessage` finds the innermost part of the formula that fails while
// its operands evaluate (evaluating sub-formulas in the sheet's scope, which reads and never writes),
// and says which operands or argument, their units as written and what would work. A message of the
// engine's own or of the library's kernels (already worded for a person) is passed through.
//
// `didYouMean` offers the closest names (sheet names, functions, constants) to a misspelt one.
import type { MathJsInstance, MathNode, Unit } from 'mathjs';
import { displayValue } from './format';
import { unitOfPlaceholder } from './unit-literals';

type Node = MathNode & {
  type: string;
  name?: string;
  op?: string;
  fn?: Node | string;
  args?: Node[];
  content?: Node;
  value?: unknown;
  params?: string[];
  expr?: Node;
  condition?: Node;
  trueExpr?: Node;
  falseExpr?: Node;
  items?: Node[];
  object?: Node;
};

export interface MessageContext {
  math: MathJsInstance;
  /** The formula that was evaluated (a definition's right-hand side, or the statement). */
  node: MathNode;
  /** The sheet's scope at the statement; only read. */
  scope: Map<string, unknown>;
  sig: number;
  /** The sheet's own functions: parameters and body, to say what fails inside a call. */
  sheetFunction?: (name: string) => { params: string[]; expr: MathNode } | null;
  /** False when the node is not a formula whose parts can be evaluated alone (a sweep statement). */
  locate?: boolean;
  /** Names to suggest for an undefined one. */
  candidates?: () => Iterable<string>;
  /** Names suggested only when they differ from an undefined one in case alone (units: `Mev` → `MeV`). */
  caseCandidates?: () => Iterable<string>;
}

/**
 * Words and shapes of mathjs (and JavaScript) internals that must never reach a person: internal
 * function names, typed-function's signature lists, stack-like text.
 */
const INTERNAL =
  /typed-function|\b\w+Scalar\b|Unexpected type of argument|Too (?:few|many) arguments|\(expected: |actual: |index: \d|\bat \w+ \(|\.(?:js|ts|mjs):\d|TypeError|RangeError|SyntaxError|is no angle|Units do not match|Cannot compare units|different base|Undefined (?:symbol|function)|is not a function|Cannot convert .* to a number|Cannot calculate \w+|unexpected type of argument|\bDenseMatrix\b|\bSparseMatrix\b|\bBigNumber\b|\bFraction\b|\bbigint\b|\bidentifier\b/;

/** True when a message is mathjs's (or JavaScript's) own and must be translated. */
export function isInternalMessage(message: string): boolean {
  return INTERNAL.test(message);
}

/** A formula as written (outer parentheses removed, unit placeholders back to their units). */
function sourceOf(node: MathNode): string {
  let n = node as Node;
  while (n.type === 'ParenthesisNode') n = n.content!;
  return n.toString().replace(/__u_[0-9a-f]+/g, (p) => unitOfPlaceholder(p) ?? p);
}

/** Physical dimensions with a name, from the SI unit that spans each (common practice). */
const DIMENSION_WORDS: ReadonlyArray<[string, string]> = [
  ['a length', 'm'],
  ['a mass', 'kg'],
  ['a time', 's'],
  ['an energy', 'J'],
  ['a momentum', 'kg m/s'],
  ['a speed', 'm/s'],
  ['an acceleration', 'm/s^2'],
  ['a force', 'N'],
  ['a power', 'W'],
  ['a charge', 'C'],
  ['a voltage', 'V'],
  ['a magnetic flux density', 'T'],
  ['a magnetic rigidity', 'T m'],
  ['an angle', 'rad'],
  ['a frequency', 'Hz'],
  ['an angular speed', 'rad/s'],
  ['an area', 'm^2'],
  ['a volume', 'm^3'],
  ['a pressure', 'Pa'],
  ['an electric current', 'A'],
  ['a temperature', 'K'],
  ['an amount of substance', 'mol'],
  ['an action (energy × time)', 'J s'],
  ['a mass density', 'kg/m^3'],
  ['an electric field', 'V/m'],
];

function dimensionWord(math: MathJsInstance, u: Unit): string | null {
  for (const [word, unit] of DIMENSION_WORDS) {
    try {
      if (u.equalBase(math.unit(unit))) return word;
    } catch {
      // a unit this instance lacks: skip it
    }
  }
  return null;
}

/** A value described for a message: "an energy, 1 MeV", "a plain number, 2", "a text". */
function describe(
  math: MathJsInstance,
  value: unknown,
  sig: number,
): { kind: string; shown: string | null; dimensionless: boolean } {
  const shown = (() => {
    try {
      return displayValue(math, value, sig).text;
    } catch {
      return null;
    }
  })();
  if (typeof value === 'number') return { kind: 'a plain number', shown, dimensionless: true };
  if (typeof value === 'boolean') return { kind: 'a truth value', shown: String(value), dimensionless: true };
  if (typeof value === 'string') return { kind: 'a text', shown: JSON.stringify(value), dimensionless: false };
  if (typeof value === 'function') return { kind: 'a function', shown: null, dimensionless: false };
  if (math.isMatrix(value) || Array.isArray(value)) return { kind: 'a list', shown, dimensionless: false };
  if (math.isUnit(value)) {
    const u = value as Unit;
    if (u.value === null) return { kind: `the unit ${u.formatUnits()}`, shown: null, dimensionless: false };
    const dimensionless = (u as unknown as { dimensions: number[] }).dimensions.every((d) => Math.abs(d) < 1e-12);
    const word = dimensionless ? 'a ratio' : dimensionWord(math, u);
    return { kind: word ?? `a quantity in ${u.formatUnits()}`, shown, dimensionless };
  }
  return { kind: 'a value', shown, dimensionless: false };
}

/** A number written with or without its unit (`2.5`, `2.5 m`, `-3 MeV`): its value needs no showing. */
function isLiteral(node: Node): boolean {
  while (node.type === 'ParenthesisNode') node = node.content!;
  if (node.type === 'ConstantNode') return true;
  if (node.type === 'SymbolNode') return unitOfPlaceholder(node.name!) !== null;
  if (node.type === 'OperatorNode' && (node.fn === 'unaryMinus' || node.fn === 'unaryPlus'))
    return isLiteral(node.args![0]);
  if (node.type === 'OperatorNode' && node.fn === 'multiply' && node.args?.length === 2) {
    return (
      node.args[0].type === 'ConstantNode' &&
      node.args[1].type === 'SymbolNode' &&
      unitOfPlaceholder(node.args[1].name!) !== null
    );
  }
  return false;
}

/** "`1 MeV` (an energy)" or "`m_p` (a mass, 1.672 62 × 10⁻²⁷ kg)": the operand as written, its kind and value. */
export function describeOperand(math: MathJsInstance, node: MathNode, value: unknown, sig: number): string {
  const src = sourceOf(node);
  const d = describe(math, value, sig);
  const show = d.shown !== null && !isLiteral(node as Node) && d.shown.replace(/\s+/g, '') !== src.replace(/\s+/g, '');
  return `\`${src}\` (${d.kind}${show ? `, ${d.shown}` : ''})`;
}
const operand = describeOperand;

/** The unit of a quantity as a short string (its own units, e.g. "MeV", "kg"), or null. */
function unitOf(math: MathJsInstance, value: unknown): string | null {
  if (!math.isUnit(value)) return null;
  const u = value as Unit;
  const text = u.formatUnits();
  return text && text !== '' ? text.replace(/\s+/g, '') : null;
}

const ADDITIVE: Record<string, string> = {
  add: 'add',
  subtract: 'subtract',
  addScalar: 'add',
  subtractScalar: 'subtract',
};
const COMPARE = new Set(['smaller', 'larger', 'smallerEq', 'largerEq', 'equal', 'unequal', 'compare', 'max', 'min']);
const TRIG = new Set(['sin', 'cos', 'tan', 'sec', 'csc', 'cot', 'sinh', 'cosh', 'tanh', 'sech', 'csch', 'coth']);
const NUMBER_ONLY = new Set([
  'exp',
  'expm1',
  'log',
  'ln',
  'log10',
  'log2',
  'log1p',
  'asin',
  'acos',
  'atan',
  'asinh',
  'acosh',
  'atanh',
  'gamma',
  'lgamma',
  'erf',
  'factorial',
  'sign',
  'nthRoot',
  'cbrt',
]);

/** Conversions between dimensions that need a power of c: what to write instead. */
function conversionHint(from: string, to: string, src: string, target: string): string | null {
  const p = /[\s+\-*/]/.test(src) ? `(${src})` : src;
  if (from === 'a mass' && to === 'an energy')
    return `a mass cannot be converted to an energy; for the rest energy write \`${p} * c^2 to ${target}\``;
  if (from === 'an energy' && to === 'a mass')
    return `an energy cannot be converted to a mass; for the mass of that rest energy write \`${p} / c^2 to ${target}\``;
  if (from === 'a momentum' && to === 'an energy')
    return `a momentum cannot be converted to an energy; for pc write \`${p} * c to ${target}\``;
  if (from === 'an energy' && to === 'a momentum')
    return `an energy cannot be converted to a momentum; for E/c write \`${p} / c to ${target}\``;
  if (from === 'a mass' && to === 'a momentum')
    return `a mass cannot be converted to a momentum; for mc write \`${p} * c to ${target}\``;
  if (from === 'a momentum' && to === 'a mass')
    return `a momentum cannot be converted to a mass; for p/c write \`${p} / c to ${target}\``;
  return null;
}

/** SI units to suggest as a conversion target for a dimension. */
const TARGET_EXAMPLES: Record<string, string> = {
  'a mass': 'kg or MeV/c^2',
  'an energy': 'J or MeV',
  'a momentum': 'kg m/s or MeV/c',
  'a length': 'm',
  'a time': 's',
  'a speed': 'm/s',
};

type Evaluated = { ok: true; value: unknown } | { ok: false; error: unknown };

/** The message of an error as text (never longer than 500 characters). */
function textOf(error: unknown): string {
  const text = error instanceof Error ? error.message : String(error);
  return text.length > 500 ? `${text.slice(0, 500)}…` : text;
}

/**
 * The engineer's message for `error`, thrown while evaluating `ctx.node`. Messages that are not
 * mathjs's own pass through unchanged.
 */
export function engineerMessage(error: unknown, ctx: MessageContext): string {
  const raw = textOf(error);
  if (!isInternalMessage(raw)) return raw;
  try {
    return (ctx.locate === false ? null : locate(ctx, ctx.node as Node, ctx.scope, 0)) ?? generic(raw, ctx);
  } catch {
    return generic(raw, ctx);
  }
}

/** A message for when no part of the formula can be singled out: no mathjs words in it. */
function generic(raw: string, ctx: MessageContext): string {
  const undefinedName = /Undefined (?:symbol|function) ([^\s]+)/.exec(raw);
  if (undefinedName) return notDefined(undefinedName[1], ctx);
  // Keep what the engine said before mathjs's words ("the uncertainty cannot be propagated: …").
  const internalAt = raw.search(INTERNAL);
  const prefix = raw.slice(0, internalAt).match(/^(.*:)\s*/)?.[1] ?? '';
  const what = /^\s*$/.test(prefix) ? `\`${sourceOf(ctx.node)}\` cannot be evaluated:` : prefix;
  return `${what} its parts do not fit together for the values used (check that the units of each sum, comparison and function argument agree)`;
}

/** "`lorentzfactor` is not defined; did you mean `lorentzFactor`?" */
export function notDefined(name: string, ctx: Pick<MessageContext, 'candidates' | 'caseCandidates'>): string {
  const near = didYouMean(name, ctx.candidates?.() ?? [], ctx.caseCandidates?.() ?? []);
  return `\`${name}\` is not defined${near.length ? `; did you mean ${near.map((n) => `\`${n}\``).join(' or ')}?` : ''}`;
}

/** Edit distance (insertions, deletions, substitutions and swaps of neighbours), or max + 1 beyond `max`. */
function distance(a: string, b: string, max: number): number {
  if (Math.abs(a.length - b.length) > max) return max + 1;
  const d: number[][] = Array.from({ length: a.length + 1 }, (_, i) =>
    Array.from({ length: b.length + 1 }, (_, j) => (i === 0 ? j : j === 0 ? i : 0)),
  );
  for (let i = 1; i <= a.length; i++) {
    let best = Infinity;
    for (let j = 1; j <= b.length; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      d[i][j] = Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1])
        d[i][j] = Math.min(d[i][j], d[i - 2][j - 2] + 1);
      best = Math.min(best, d[i][j]);
    }
    if (best > max) return max + 1;
  }
  return d[a.length][b.length];
}

/**
 * The names closest to a misspelt one: the same name in another case first (`lorentzfactor` →
 * `lorentzFactor`), then those within one edit (two for names of six letters or more). At most three.
 */
export function didYouMean(
  name: string,
  candidates: Iterable<string>,
  caseCandidates: Iterable<string> = [],
): string[] {
  const lower = name.toLowerCase();
  const max = name.length >= 6 ? 2 : 1;
  const scored: Array<[string, number]> = [];
  const seen = new Set<string>();
  for (const c of caseCandidates) {
    if (c !== name && c.toLowerCase() === lower && !seen.has(c)) {
      seen.add(c);
      // Among names that differ in case only, the one agreeing in more letters first (Mev → MeV).
      scored.push([c, -2 - [...c].filter((ch, i) => ch === name[i]).length / (c.length + 1)]);
    }
  }
  for (const c of candidates) {
    if (c === name || seen.has(c) || c.startsWith('__')) continue;
    seen.add(c);
    if (c.toLowerCase() === lower) {
      scored.push([c, -1]);
      continue;
    }
    if (name.length < 2) continue;
    const d = distance(lower, c.toLowerCase(), max);
    if (d <= max) scored.push([c, d]);
  }
  scored.sort((a, b) => a[1] - b[1] || a[0].localeCompare(b[0]));
  return scored.slice(0, 3).map(([c]) => c);
}

/**
 * The message for the innermost failing part of `node`, or null when none can be singled out.
 * Parts are evaluated in `scope`, which is only read.
 */
function locate(ctx: MessageContext, node: Node, scope: Map<string, unknown>, depth: number): string | null {
  const { math } = ctx;
  if (depth > 4) return null;
  const memo = new Map<Node, Evaluated>();
  const evaluate = (n: Node): Evaluated => {
    let r = memo.get(n);
    if (!r) {
      try {
        r = { ok: true, value: n.compile().evaluate(scope) };
      } catch (error) {
        r = { ok: false, error };
      }
      memo.set(n, r);
    }
    return r;
  };
  const partsOf = (n: Node): Node[] => {
    if (n.type === 'FunctionAssignmentNode' || n.type === 'AssignmentNode') return [];
    if (n.type === 'OperatorNode' && (n.op === 'to' || n.op === 'in')) return [n.args![0]];
    if (n.type === 'ConditionalNode') {
      const c = evaluate(n.condition!);
      return c.ok ? [n.condition!, c.value ? n.trueExpr! : n.falseExpr!] : [n.condition!];
    }
    const out: Node[] = [];
    n.forEach((child: MathNode) => out.push(child as Node));
    return out;
  };
  // The innermost failing part whose own parts all evaluate.
  let origin = node;
  if (evaluate(origin).ok) return null;
  for (let i = 0; i < 200; i++) {
    const next = partsOf(origin).find((p) => !evaluate(p).ok);
    if (!next) break;
    origin = next;
  }
  while (origin.type === 'ParenthesisNode') origin = origin.content!;
  const failure = evaluate(origin);
  const raw = failure.ok ? '' : textOf(failure.error);
  if (!isInternalMessage(raw)) return raw || null;

  const src = `\`${sourceOf(origin)}\``;
  const args = origin.args ?? [];
  const values = args.map((a) => {
    const r = evaluate(a);
    return r.ok ? r.value : undefined;
  });
  const fnName = origin.type === 'FunctionNode' ? ((origin.fn as Node)?.name ?? null) : null;
  const op = origin.type === 'OperatorNode' ? (origin.fn as string) : null;
  const fn = op ?? fnName;
  const sig = ctx.sig;
  const describeArg = (i: number) => operand(math, args[i], values[i], sig);

  if (origin.type === 'SymbolNode') {
    const m = /Undefined symbol (\S+)/.exec(raw);
    return notDefined(m ? m[1] : origin.name!, ctx);
  }

  // A call of the sheet's own function: what fails inside it, with the arguments bound.
  if (fnName && ctx.sheetFunction && !/Undefined function/.test(raw)) {
    const own = ctx.sheetFunction(fnName);
    if (own && own.params.length === args.length && scope.has(fnName)) {
      const inner = new Map(scope);
      own.params.forEach((p, i) => inner.set(p, values[i]));
      const message = locate(ctx, own.expr as Node, inner, depth + 1);
      if (message)
        return `in ${src}, with ${own.params.map((p, i) => `${p} = ${describe(math, values[i], sig).shown ?? sourceOf(args[i])}`).join(', ')}: ${message}`;
    }
  }
  if (fnName && /Undefined function/.test(raw)) return notDefined(fnName, ctx);

  // Sums and differences of different dimensions.
  if (fn && fn in ADDITIVE && args.length === 2) {
    const [a, b] = values;
    const da = describe(math, a, sig);
    const db = describe(math, b, sig);
    const verb = ADDITIVE[fn];
    const pair =
      verb === 'subtract'
        ? `subtract ${describeArg(1)} from ${describeArg(0)}`
        : `add ${describeArg(0)} and ${describeArg(1)}`;
    const textAt = values.findIndex((v) => typeof v === 'string');
    if (textAt >= 0) return `cannot ${pair}: a text is not a number`;
    if (values.some((v) => math.isMatrix(v) || Array.isArray(v)))
      return `cannot ${pair}: every element of a list must have the dimension of the other term`;
    const plain = typeof a === 'number' ? 0 : typeof b === 'number' ? 1 : -1;
    const other = values[1 - plain];
    if (plain >= 0 && math.isUnit(other) && (other as Unit).value !== null) {
      const unit = unitOf(math, other);
      const literal = args[plain].type === 'ConstantNode' ? sourceOf(args[plain]) : null;
      const fix =
        unit && literal
          ? `write the unit with the number (\`${literal} ${unit}\`)`
          : `give ${sourceOf(args[plain])} a unit of ${describe(math, other, sig).kind.replace(/^an? /, 'the same kind, ')}, or divide the quantity by a unit to make it a plain number`;
      return `cannot ${pair}: a plain number and a quantity cannot be ${verb === 'subtract' ? 'subtracted' : 'added'}; ${fix}`;
    }
    return `cannot ${pair}: the terms of a ${verb === 'subtract' ? 'difference' : 'sum'} must have the same dimension (${da.kind} and ${db.kind})`;
  }

  // Unit conversions.
  if ((op === 'to' || fnName === 'to' || fnName === 'number') && args.length === 2) {
    const [a, b] = values;
    const target = fnName === 'number' && typeof b === 'string' ? b : sourceOf(args[1]);
    let targetUnit: unknown = b;
    try {
      if (typeof b === 'string') targetUnit = math.unit(b);
    } catch {
      return `\`${target}\` is not a unit`;
    }
    const from = describe(math, a, sig).kind;
    const to = describe(
      math,
      math.isUnit(targetUnit) ? math.unit(1, (targetUnit as Unit).formatUnits() || '') : targetUnit,
      sig,
    ).kind;
    const hint = conversionHint(from, to, sourceOf(args[0]), target);
    if (hint) return `cannot convert ${describeArg(0)} to ${target} (${to}): ${hint}`;
    if (typeof a === 'number')
      return `cannot convert ${describeArg(0)} to ${target} (${to}): a plain number has no unit to convert; write the number with its unit`;
    const examples = TARGET_EXAMPLES[from];
    return `cannot convert ${describeArg(0)} to ${target} (${to}): convert to a unit of ${from.replace(/^an? /, '')}${examples ? ` (e.g. ${examples})` : ''}`;
  }

  // Comparisons (and max/min) of different dimensions.
  if (fn && COMPARE.has(fn)) {
    const shownArgs = args.map((_, i) => describeArg(i));
    return `cannot compare ${shownArgs.join(' and ')}: they must have the same dimension`;
  }

  // Trigonometric functions take an angle or a plain number (radians).
  if (fnName && TRIG.has(fnName) && values.some((v) => math.isUnit(v))) {
    return `${fnName} takes an angle (rad, deg) or a plain number (read as radians); ${describeArg(0)} is not an angle`;
  }

  // Powers: the exponent is a plain number.
  if ((op === 'pow' || fnName === 'pow') && args.length === 2 && math.isUnit(values[1])) {
    return `the exponent ${describeArg(1)} must be a plain number: ${src}`;
  }

  // Functions of plain numbers given a quantity.
  const unitArg = values.findIndex(
    (v) => math.isUnit(v) && (v as Unit).value !== null && !describe(math, v, sig).dimensionless,
  );
  if (
    fnName &&
    unitArg >= 0 &&
    (NUMBER_ONLY.has(fnName) || /Unexpected type of argument|Too few arguments/.test(raw))
  ) {
    const unit = unitOf(math, values[unitArg]);
    const example = args
      .map((a, i) =>
        i === unitArg ? `${/[+-]/.test(sourceOf(a)) ? `(${sourceOf(a)})` : sourceOf(a)} / (1 ${unit})` : sourceOf(a),
      )
      .join(', ');
    const reference = unit ? ` divide it by a reference quantity first, e.g. \`${fnName}(${example})\`` : '';
    return `${fnName} takes a plain number; ${describeArg(unitArg)} is a quantity:${reference || ' divide it by a reference quantity first'}`;
  }

  // Wrong number of arguments.
  const count = /Too (few|many) arguments in function \w+ \(expected: (\d+)?/.exec(raw);
  if (fnName && count) {
    return count[2]
      ? `${fnName} takes ${count[2]} argument${count[2] === '1' ? '' : 's'}; ${src} has ${args.length}`
      : `${fnName} takes ${count[1] === 'few' ? 'more' : 'fewer'} arguments than the ${args.length} of ${src}`;
  }

  // Texts where numbers are expected.
  const textAt = values.findIndex((v) => typeof v === 'string');
  if (textAt >= 0 && /Cannot convert/.test(raw)) return `\`${sourceOf(args[textAt])}\` is a text, not a number: ${src}`;

  // Anything else: name the part and its operands, never mathjs's words.
  const shownArgs = args.map((_, i) => describeArg(i));
  const what = fnName ? `${fnName} cannot take these arguments` : 'these operands do not fit together';
  return `${src}: ${what}${shownArgs.length ? ` (${shownArgs.join(', ')})` : ''}`;
}

/** mathjs's parse errors, in words (the position is given for the line as written). */
const PARSE_WORDS: ReadonlyArray<[RegExp, string]> = [
  [/^Unexpected end of expression/, 'the line ends where a value or a closing bracket is expected'],
  [/^Value expected/, 'a value is expected'],
  [/^Parenthesis \) expected/, 'a closing parenthesis ) is missing'],
  [/^Parenthesis \] expected|^End of matrix \] expected/, 'a closing bracket ] is missing'],
  [/^Unexpected operator (\S+)/, 'the operator $1 is not expected here'],
  [/^Unexpected part "([^"]*)"/, '"$1" is not expected here (a missing operator?)'],
  [/^Digit expected, got "([^"]*)"/, 'a digit is expected, not "$1"'],
  [/^False part of conditional expression expected/, 'a conditional needs its second part (a ? b : c)'],
];

/**
 * A parse error of a line, in words, with its position in the line as written (`text`): mathjs's
 * own position counts the placeholders that stand for units, so the line is parsed again as written
 * to find it.
 */
export function parseMessage(error: unknown, text: string, parse: (expr: string) => MathNode): string {
  let raw = textOf(error);
  try {
    parse(text);
  } catch (again) {
    const original = textOf(again);
    if (original.replace(/\s*\(char \d+\)/, '') === raw.replace(/\s*\(char \d+\)/, '')) raw = original;
    else raw = raw.replace(/\s*\(char \d+\)/, '');
  }
  const at = /\(char (\d+)\)/.exec(raw);
  const bare = raw.replace(/\s*\(char \d+\)/, '');
  const rule = PARSE_WORDS.find(([re]) => re.test(bare));
  const words = rule
    ? rule[0].exec(bare)![0].replace(rule[0], rule[1])
    : isInternalMessage(bare)
      ? 'the line is not a formula the engine can read'
      : bare;
  if (!at) return words;
  const pos = Number(at[1]);
  const excerpt =
    pos > text.length
      ? 'at the end of the line'
      : `at character ${pos} (\`${text.slice(Math.max(0, pos - 1), pos + 11)}\`)`;
  return `${words}, ${excerpt}`;
}

/**
 * A message with no formula at hand to take apart (a row of a sweep): passed through when it is
 * already in words, otherwise said in words without mathjs's own.
 */
export function cleanMessage(error: unknown): string {
  const raw = textOf(error);
  if (!isInternalMessage(raw)) return raw;
  const undefinedName = /Undefined (?:symbol|function) (\S+)/.exec(raw);
  if (undefinedName) return `\`${undefinedName[1]}\` is not defined`;
  if (/is no angle/.test(raw)) return 'a trigonometric function was given a quantity that is not an angle';
  if (/Units do not match|Cannot compare units|different base|addScalar|subtractScalar/.test(raw))
    return 'quantities of different dimensions were added, compared or converted';
  return 'a step of the calculation cannot take the values it was given (check the units of each sum, comparison and function argument)';
}
