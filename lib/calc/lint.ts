// A physics-aware lint: names that mathjs reads as a unit or a mathematical constant where a sheet
// author most likely meant a physical constant. `h * c / (500 nm)` is a plain number because `h` is
// the hour, `hbar * c` is in hectobar, `e * 1 V` is 2.718 V. Such a statement still evaluates (the
// author may mean it), but carries a warning that names the symbol, what it means here and the name
// of the constant the author probably wants.
//
// A name is flagged only when it is used by itself: not a unit written after a number (`2 h` and
// `2*h` are two hours; `2 e` is still flagged), not the base of a power for `e`/`E` (`e^x` is Euler's number used as meant), not in a
// `to`/`in` target, not a parameter of the function being defined, and not a name the sheet defines
// (the sheet's own quantity; the engine filters those, since that needs the whole sheet).
import type { MathNode } from 'mathjs';
import type { EngineMath } from './math-instance';

export interface LintFinding {
  /** The name as written. */
  name: string;
  /** The warning shown beside the statement. */
  message: string;
}

type Node = MathNode & {
  type: string;
  name?: string;
  op?: string;
  fn?: Node | string;
  args?: Node[];
  params?: string[];
  expr?: Node;
  value?: unknown;
  implicit?: boolean;
};

/**
 * The names flagged, with the constant the author most likely meant. A name is flagged only when
 * the engine reads it as a unit or a mathematical constant; one that is neither is an undefined
 * name, which is an error of its own.
 */
export const SUSPECT_NAMES: ReadonlyMap<string, { means?: string; intended: string }> = new Map([
  ['h', { means: 'the hour (a unit of time)', intended: 'the Planck constant is `h_P`' }],
  [
    'hbar',
    {
      means: 'the hectobar (a unit of pressure, 10⁷ Pa)',
      intended: 'the reduced Planck constant is `hbar_P` (or `ħ`)',
    },
  ],
  [
    'e',
    {
      means: 'Euler’s number 2.718…',
      intended: 'the elementary charge is `q_e` (Euler’s number as the base of a power, `e^x`, is fine)',
    },
  ],
  [
    'E',
    {
      means: 'Euler’s number 2.718…',
      intended:
        'the elementary charge is `q_e`; a quantity of the sheet (an energy) needs a name of its own, such as `E_k`',
    },
  ],
  ['g', { means: 'the gram (a unit of mass)', intended: 'the standard acceleration of gravity is `g_n`' }],
  [
    'kB',
    { means: 'the kilobyte (a unit of information, 8000 bits)', intended: 'the Boltzmann constant is `boltzmann`' },
  ],
  // Not units or constants of mathjs today (a bare one is "not defined"); flagged if one becomes a unit.
  ['G', { intended: 'the Newtonian constant of gravitation is `gravitationConstant`' }],
  ['k', { intended: 'the Boltzmann constant is `boltzmann`' }],
  ['R', { intended: 'the molar gas constant is `gasConstant`' }],
]);

function isNumberLiteral(n: Node | undefined): boolean {
  if (!n) return false;
  if (n.type === 'ConstantNode') return typeof n.value === 'number';
  if (n.type === 'ParenthesisNode') return isNumberLiteral((n as unknown as { content: Node }).content);
  return (
    n.type === 'OperatorNode' &&
    (n.fn === 'unaryMinus' || n.fn === 'unaryPlus') &&
    n.args?.length === 1 &&
    isNumberLiteral(n.args[0])
  );
}

const isProduct = (n: Node | undefined) => n?.type === 'OperatorNode' && (n.fn === 'multiply' || n.fn === 'divide');

/** What `name` is to the engine, in words, or null when it is neither a unit nor a mathematical constant. */
function meaningOf(name: string, em: EngineMath, given: string | undefined): string | null {
  if (em.constants.has(name)) return null;
  if (em.isUnitName(name)) {
    if (given) return given;
    try {
      const unit = em.math.unit(name) as unknown as { units: Array<{ unit: { base: { key: string } } }> };
      const dimension = unit.units[0]?.unit.base.key.toLowerCase().replace(/_/g, ' ');
      return dimension ? `the unit ${name} (a unit of ${dimension})` : `the unit ${name}`;
    } catch {
      return `the unit ${name}`;
    }
  }
  if (em.isMathConstant(name)) {
    if (given) return given;
    const value = (em.math as unknown as Record<string, unknown>)[name];
    return typeof value === 'number' ? `the number ${value}` : `mathjs’s value \`${name}\``;
  }
  return null;
}

/**
 * The lint findings of one statement's expression (for a definition, its right-hand side), at
 * most one per name. The engine drops the findings for names the sheet defines.
 */
/** A name the lint looks for, as a whole word: a line without one needs no lint. */
const SUSPECT_WORD = new RegExp(
  `(?<![\\p{L}\\p{N}_])(?:${[...SUSPECT_NAMES.keys()].map((n) => n.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')).join('|')})(?![\\p{L}\\p{N}_])`,
  'u',
);

/** Whether a line may hold a name the lint looks for (false: `lintExpression` finds nothing). */
export function mayNeedLint(text: string): boolean {
  return SUSPECT_WORD.test(text);
}

export function lintExpression(node: MathNode, em: EngineMath): LintFinding[] {
  const found = new Map<string, string>();
  // `slot` is the node as its parent holds it: `n` itself, or the parenthesis around it.
  const visit = (
    n: Node,
    parent: Node | null,
    grandparent: Node | null,
    locals: ReadonlySet<string>,
    slot: Node = n,
  ) => {
    switch (n.type) {
      case 'SymbolNode': {
        const name = n.name!;
        const suspect = SUSPECT_NAMES.get(name);
        if (!suspect || locals.has(name) || found.has(name)) return;
        // A unit written after a number: `2*h`, `-3*g` (unless the product goes on: `2*h*c`). Not
        // a constant: `2 e` is twice Euler's number, where two elementary charges are likely meant.
        if (
          em.isUnitName(name) &&
          parent?.type === 'OperatorNode' &&
          parent.fn === 'multiply' &&
          parent.args?.[1] === slot &&
          isNumberLiteral(parent.args[0])
        ) {
          if (!(isProduct(grandparent ?? undefined) && grandparent!.args?.[0] === parent)) return;
        }
        // Euler's number as the base of a power, or as the base of a logarithm.
        if ((name === 'e' || name === 'E') && parent) {
          if (parent.type === 'OperatorNode' && parent.fn === 'pow' && parent.args?.[0] === slot) return;
          if (parent.type === 'FunctionNode' && (parent.fn as Node)?.name === 'log' && parent.args?.[1] === slot)
            return;
        }
        const means = meaningOf(name, em, suspect.means);
        if (means) found.set(name, `\`${name}\` here is ${means}; ${suspect.intended}`);
        return;
      }
      case 'OperatorNode': {
        // What follows `to`/`in` is units.
        if ((n.op === 'to' || n.op === 'in') && n.args) {
          visit(n.args[0], n, parent, locals);
          return;
        }
        for (const a of n.args ?? []) visit(a, n, parent, locals);
        return;
      }
      case 'FunctionNode': {
        // The function's own name is not a value.
        for (const a of n.args ?? []) visit(a, n, parent, locals);
        return;
      }
      case 'FunctionAssignmentNode': {
        visit(n.expr!, n, parent, new Set([...locals, ...(n.params ?? [])]));
        return;
      }
      case 'ParenthesisNode': {
        // `(h)` is as bare as `h`; a number before the parenthesis still counts as "after a number".
        const content = (n as unknown as { content: Node }).content;
        visit(content, parent, grandparent, locals, slot);
        return;
      }
      default:
        n.forEach((child: MathNode) => visit(child as Node, n, parent, locals));
    }
  };
  visit(node as Node, null, null, new Set());
  return [...found].map(([name, message]) => ({ name, message }));
}

/**
 * The lint's examples for the function reference (app/reference/page.tsx), each with the warning
 * it gives (null: none); tests/calc/lint-and-nonfinite.test.ts evaluates every one.
 */
export const LINT_EXAMPLES: ReadonlyArray<{ source: string; warning: string | null }> = [
  { source: 'E_ph = h * c / (500 nm)', warning: '`h` here is the hour (a unit of time); the Planck constant is `h_P`' },
  { source: 'E_ph = h_P * c / (500 nm) to eV', warning: null },
  {
    source: 'x = hbar * c',
    warning:
      '`hbar` here is the hectobar (a unit of pressure, 10⁷ Pa); the reduced Planck constant is `hbar_P` (or `ħ`)',
  },
  {
    source: 'U_1 = e * 1 V',
    warning:
      '`e` here is Euler’s number 2.718…; the elementary charge is `q_e` (Euler’s number as the base of a power, `e^x`, is fine)',
  },
  { source: 'y = e^(-0.5)', warning: null },
  {
    source: 'F_w = 70 kg * g',
    warning: '`g` here is the gram (a unit of mass); the standard acceleration of gravity is `g_n`',
  },
  { source: 't_1 = 2 h + 30 min', warning: null },
];
