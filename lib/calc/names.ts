// What a sheet may call its own quantities. A name that is also a unit would change what a
// quantity means (after `m = 5 kg`, does `2 m` mean two metres?), so such names are refused with
// a suggestion, as are the names of built-in constants and functions.
import type { EngineMath } from './math-instance';

const NAME = /^[A-Za-z][A-Za-z0-9_]*$/;

export function checkDefinitionName(name: string, em: EngineMath): string | null {
  if (!NAME.test(name)) return `\`${name}\`: names start with a letter and hold letters, digits and underscores`;
  if (name.length > 64) return `\`${name}\`: names are at most 64 characters long`;
  if (name in Object.prototype) return `\`${name}\` is a reserved word; choose another name`;
  if (em.constants.has(name)) return `\`${name}\` is a built-in constant and cannot be redefined`;
  if (em.isUnitName(name)) {
    return `\`${name}\` is a unit, so it cannot name a quantity (it would change what "2 ${name}" means); choose another name, such as ${name}_1 or ${name}_kin`;
  }
  if (em.isMathConstant(name)) return `\`${name}\` is a built-in value and cannot be redefined`;
  if (em.isFunctionName(name)) return `\`${name}\` is a built-in function and cannot be redefined`;
  return null;
}
