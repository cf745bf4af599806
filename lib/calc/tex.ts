// TeX for a statement, as a checker reads it on paper: the formula with quantity symbols in the
// ISO 80000-2 style (italic single letters, upright descriptive subscripts, Greek names as Greek
// letters), and the same formula with every input value substituted.
import { format, type MathNode } from 'mathjs';
import { CONSTANTS } from './constants';
import { unitOfPlaceholder } from './unit-literals';

const GREEK = new Set([
  'alpha',
  'beta',
  'gamma',
  'delta',
  'epsilon',
  'varepsilon',
  'zeta',
  'eta',
  'theta',
  'vartheta',
  'iota',
  'kappa',
  'lambda',
  'mu',
  'nu',
  'xi',
  'pi',
  'rho',
  'sigma',
  'tau',
  'upsilon',
  'phi',
  'varphi',
  'chi',
  'psi',
  'omega',
  'Gamma',
  'Delta',
  'Theta',
  'Lambda',
  'Xi',
  'Pi',
  'Sigma',
  'Upsilon',
  'Phi',
  'Psi',
  'Omega',
]);
const GREEK_SUFFIX =
  /(alpha|beta|gamma|delta|epsilon|zeta|eta|theta|kappa|lambda|mu|nu|xi|rho|sigma|tau|phi|chi|psi|omega|Gamma|Delta|Theta|Lambda|Sigma|Phi|Psi|Omega)$/;

const CONSTANT_TEX = new Map(CONSTANTS.map((c) => [c.name, c.tex]));

/** A Greek letter written as itself in a name (`γ`, `Δp`, `θ_1`) and its TeX control word. */
const GREEK_CHAR_TEX: ReadonlyMap<string, string> = new Map([
  ...'alpha beta gamma delta epsilon zeta eta theta iota kappa lambda mu nu xi omicron pi rho varsigma sigma tau upsilon phi chi psi omega'
    .split(' ')
    .map((n, i) => [String.fromCharCode(0x03b1 + i), n === 'omicron' ? 'o' : `\\${n}`] as [string, string]),
  ...'Alpha Beta Gamma Delta Epsilon Zeta Eta Theta Iota Kappa Lambda Mu Nu Xi Omicron Pi Rho - Sigma Tau Upsilon Phi Chi Psi Omega'
    .split(' ')
    .map((n, i) => [String.fromCharCode(0x0391 + i), n] as [string, string])
    .filter(([, n]) => n !== '-')
    // Capitals that look like Latin letters are written as those letters (TeX has no \Alpha).
    .map(
      ([c, n]) =>
        [
          c,
          GREEK.has(n)
            ? `\\${n}`
            : ((
                {
                  Alpha: 'A',
                  Beta: 'B',
                  Epsilon: 'E',
                  Zeta: 'Z',
                  Eta: 'H',
                  Iota: 'I',
                  Kappa: 'K',
                  Mu: 'M',
                  Nu: 'N',
                  Omicron: 'O',
                  Rho: 'P',
                  Tau: 'T',
                  Chi: 'X',
                } as Record<string, string>
              )[n] ?? n),
        ] as [string, string],
    ),
  ['\u03d1', '\\vartheta'],
  ['\u03d5', '\\phi'],
  ['\u03f5', '\\epsilon'],
]);
const HAS_GREEK_CHAR = /[\u0370-\u03ff]/;

/** A name part holding Greek letters as characters: each letter as its control word (`Δp` → {\Delta p}). */
function greekCharsTex(part: string): string {
  const pieces: string[] = [];
  let latin = '';
  const flush = () => {
    if (latin) pieces.push(latin.length === 1 ? latin : `\\mathit{${latin}}`);
    latin = '';
  };
  for (const ch of part) {
    const tex = GREEK_CHAR_TEX.get(ch);
    if (tex === undefined) latin += ch;
    else {
      flush();
      pieces.push(tex);
    }
  }
  flush();
  return pieces.length > 1 ? `{${pieces.join(' ')}}` : pieces.join('');
}

function baseTex(base: string): string {
  if (HAS_GREEK_CHAR.test(base)) return greekCharsTex(base);
  if (GREEK.has(base)) return `\\${base}`;
  if (base.length === 1) return base;
  const m = GREEK_SUFFIX.exec(base);
  if (m && m.index > 0) {
    const head = base.slice(0, m.index);
    return `${head.length === 1 ? head : `\\mathit{${head}}`}\\${m[1]}`;
  }
  return `\\mathit{${base}}`;
}

/** A sheet name as a quantity symbol: T_max → T_{\mathrm{max}}, Brho_min → B\rho_{\mathrm{min}}, m_p → m_{\mathrm{p}}. */
export function nameTex(name: string): string {
  const constant = CONSTANT_TEX.get(name);
  if (constant) return constant;
  const [base, ...subs] = name.split('_');
  if (!base) return `\\mathit{${name.replace(/_/g, '\\_')}}`;
  if (subs.length === 0 || subs.every((s) => s === '')) return baseTex(base);
  const sub = subs
    .filter((s) => s !== '')
    .map((s) => (GREEK.has(s) ? `\\${s}` : HAS_GREEK_CHAR.test(s) ? greekCharsTex(s) : `\\mathrm{${s}}`))
    .join(',');
  return `${baseTex(base)}_{${sub}}`;
}

export interface TexContext {
  /** Is this symbol a sheet name or built-in constant (rather than a unit or function)? */
  isValueName: (name: string) => boolean;
  /** TeX of a name's value, for substitution; undefined when it has none. */
  valueTex?: (name: string) => string | undefined;
  /** TeX of a unit expression such as "m/s^2". */
  unitTex: (unit: string) => string;
}

type AnyNode = MathNode & {
  type: string;
  name?: string;
  op?: string;
  fn?: unknown;
  args?: MathNode[];
  object?: MathNode;
  value?: MathNode;
  implicit?: boolean;
};

/**
 * A symbol's TeX as mathjs's own SymbolNode writes it: a leading space unless it starts with a
 * control word, so that an operator written before it stays one (`3\cdot x`, not `3\cdotx`).
 */
function spaced(tex: string): string {
  return tex.startsWith('\\') ? tex : ` ${tex}`;
}

function makeHandler(ctx: TexContext, substitute: boolean) {
  return (node: AnyNode, options: object): string | undefined => {
    const unit = node.type === 'SymbolNode' && node.name ? unitOfPlaceholder(node.name) : null;
    if (unit !== null) return spaced(ctx.unitTex(unit));
    if (node.type === 'SymbolNode' && node.name && ctx.isValueName(node.name)) {
      if (substitute && ctx.valueTex) {
        const v = ctx.valueTex(node.name);
        if (v !== undefined) return spaced(v);
      }
      return spaced(nameTex(node.name));
    }
    // A number in powers of ten as the result beside it writes it (ISO 80000-1): 3 × 10¹², not
    // mathjs's 3·10⁺¹², whose dot reads as a product of two numbers.
    const constant = node.type === 'ConstantNode' ? (node as unknown as { value: unknown }).value : null;
    if (typeof constant === 'number') {
      // Plain digits from 10⁻⁴ to below 10⁶ (150000, 0.000125), powers of ten outside.
      const text = format(constant, { lowerExp: -4, upperExp: 6 });
      const at = text.indexOf('e');
      return at > 0 ? `${text.slice(0, at)}\\times 10^{${text.slice(at + 1).replace('+', '')}}` : text;
    }
    // Euler's number upright, as ISO 80000-2 writes mathematical constants, so that it cannot be
    // read as the elementary charge `q_e`, typeset as the italic quantity symbol e.
    if (node.type === 'SymbolNode' && (node.name === 'e' || node.name === 'E')) return '\\mathrm{e}';
    if (node.type === 'AssignmentNode' && node.object && (node.object as AnyNode).type === 'SymbolNode') {
      return `${nameTex((node.object as AnyNode).name!)} = ${node.value!.toTex(options).trimStart()}`;
    }
    if (node.type === 'FunctionNode' && (node.fn as AnyNode | undefined)?.type === 'SymbolNode' && node.args) {
      const fnName = (node.fn as AnyNode).name;
      // An input with its standard uncertainty: `250 MeV ± 0.5 MeV`.
      if (fnName === 'uncertain' && node.args.length === 2) {
        return `${node.args[0].toTex(options).trimStart()} \\pm ${node.args[1].toTex(options).trimStart()}`;
      }
      // The number a quantity is in a unit, as ISO 80000-1 writes it, {Q} = Q/[Q]: `p / (MeV/c)`
      // (mathjs writes number(p, "MeV/c") as a product of p and a string).
      if (fnName === 'number' && node.args.length === 2) {
        const unitArg = (node.args[1] as AnyNode & { value?: unknown }).value;
        const unitTex =
          typeof unitArg === 'string' ? safeUnitTex(ctx, unitArg) : node.args[1].toTex(options).trimStart();
        return `\\frac{${node.args[0].toTex(options).trimStart()}}{${unitTex}}`;
      }
      // mathjs writes `\hypot`, which is no TeX command.
      if (fnName === 'hypot') {
        return `\\mathrm{hypot}\\left(${node.args.map((a) => a.toTex(options).trimStart()).join(',')}\\right)`;
      }
      // A cited result: its source and its name there.
      const strings = node.args.map((a) => (a as AnyNode & { value?: unknown }).value);
      if (fnName === 'fromRevision' && strings.length === 3 && strings.every((v) => typeof v === 'string')) {
        const [sheet, revision, name] = strings as string[];
        const plain = (t: string) => t.replace(/[^A-Za-z0-9 .,:-]/g, '');
        return `\\text{${plain(sheet)} rev. ${plain(revision)}: }${/^[A-Za-z][A-Za-z0-9_]*$/.test(name) ? nameTex(name) : `\\text{${plain(name)}}`}`;
      }
    }
    // A unit conversion does not change the quantity; its result shows the unit.
    if (node.type === 'OperatorNode' && (node.op === 'to' || node.op === 'in') && node.args) {
      return node.args[0].toTex(options);
    }
    return undefined;
  };
}

/** A unit string's TeX, or the string as text where it is no unit (the call fails at evaluation). */
function safeUnitTex(ctx: TexContext, unit: string): string {
  try {
    return ctx.unitTex(unit);
  } catch {
    return `\\text{${unit.replace(/[^A-Za-z0-9 ./^*-]/g, '')}}`;
  }
}

export function formulaTex(node: MathNode, ctx: TexContext): string {
  return node.toTex({ handler: makeHandler(ctx, false), parenthesis: 'keep', implicit: 'hide' } as never).trimStart();
}

export function substitutedTex(node: MathNode, ctx: TexContext): string {
  return node.toTex({ handler: makeHandler(ctx, true), parenthesis: 'keep', implicit: 'hide' } as never).trimStart();
}

/** Wraps a value's TeX in parentheses where substituting it bare could be misread. */
export function substitutionTex(valueTex: string): string {
  return /[\s\\]|^-/.test(valueTex) ? `\\left(${valueTex}\\right)` : valueTex;
}
