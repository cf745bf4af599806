// What a sheet may call its own quantities. Names of units are allowed (t, T, B, L, V, m, s, g,
// h …): a unit written after a number or after `to` stays a unit (see unit-literals.ts). Greek
// letters are letters (`γ`, `β`, `Δp`, `θ_1`; typeset as \gamma, \beta, \Delta p, \theta_1).
//
// The names of built-in functions (mathjs's `gamma`, the library's `lorentzFactor` …) may be
// defined too: a sheet's own definition takes precedence over the built-in function of that name
// everywhere in the sheet (sheet-engine.ts reads every use of the name as the sheet's, so a call
// `gamma(5)` after `gamma = 1.25` is an error saying so, never a silent call of the built-in).
// Refused: the built-in constants and values (c, m_p, pi, e …), the names of statement forms
// (uncertain, sweep, plot …) and the functions sheets may not reach (REFUSED_NAMES).
import { REFUSED_NAMES, type EngineMath } from './math-instance';
import { NAME } from './name-syntax';

/** Names the engine reads as statement forms or markers of their own: never a sheet's quantity. */
const STATEMENT_NAMES: ReadonlySet<string> = new Set([
  'uncertain',
  'correlation',
  'sweep',
  'plot',
  'spacetime',
  'fromRevision',
]);

/** Names that read as a mathematical constant although mathjs does not know them. */
const LOOKALIKES: ReadonlyMap<string, string> = new Map([['π', 'pi']]);

export function checkDefinitionName(name: string, em: EngineMath): string | null {
  if (!NAME.test(name))
    return `\`${name}\`: names start with a letter (Latin or Greek) and hold letters, digits and underscores`;
  if (name.length > 64) return `\`${name}\`: names are at most 64 characters long`;
  if (name in Object.prototype) return `\`${name}\` is a reserved word; choose another name`;
  if (REFUSED_NAMES.has(name)) return `\`${name}\` is a reserved word; choose another name`;
  if (em.constants.has(name)) return `\`${name}\` is a built-in constant and cannot be redefined`;
  if (em.isMathConstant(name)) return `\`${name}\` is a built-in value and cannot be redefined`;
  const lookalike = LOOKALIKES.get(name);
  if (lookalike)
    return `\`${name}\` reads as the number ${lookalike} and cannot be redefined; write \`${lookalike}\` for the number, or choose another name`;
  if (STATEMENT_NAMES.has(name)) return `\`${name}\` is a statement form of its own and cannot be redefined`;
  return null;
}
