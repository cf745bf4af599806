// What a sheet may call its own quantities. Names of units are allowed (t, T, B, L, V, m, s, g,
// h …): a unit written after a number or after `to` stays a unit (see unit-literals.ts). The names
// of built-in constants, values and functions are refused.
import type { EngineMath } from './math-instance';

const NAME = /^[A-Za-z][A-Za-z0-9_]*$/;

export function checkDefinitionName(name: string, em: EngineMath): string | null {
  if (!NAME.test(name)) return `\`${name}\`: names start with a letter and hold letters, digits and underscores`;
  if (name.length > 64) return `\`${name}\`: names are at most 64 characters long`;
  if (name in Object.prototype) return `\`${name}\` is a reserved word; choose another name`;
  if (em.constants.has(name)) return `\`${name}\` is a built-in constant and cannot be redefined`;
  if (em.isMathConstant(name)) return `\`${name}\` is a built-in value and cannot be redefined`;
  if (em.isFunctionName(name)) return `\`${name}\` is a built-in function and cannot be redefined`;
  return null;
}
