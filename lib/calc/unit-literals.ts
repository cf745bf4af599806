// Units written after a number, and after `to`/`in`, are always units, even where the sheet has a
// quantity of the same name: after `m = 5 kg`, `2 m` is still two metres and `x to m` still
// converts to metres, while a bare `m` is the quantity. The rule, as the sheet author reads it:
//
//   a number followed by a unit expression written without spaces (`9.81 m/s^2`, `2.5 T*m`)
//   is that quantity; what follows `to` or `in` is units; any other name is a quantity if the
//   sheet defines it, and otherwise a unit.
//
// Before mathjs parses a line, each such unit expression is replaced by a placeholder symbol that
// names it unambiguously; the engine binds the placeholder to the unit and typesets it as the unit.

//
// Two refinements for the trade's units (lib/calc/README.md, "Units and the display setting"):
// - `c` after an electronvolt unit and a solidus is part of the unit: `1.2 GeV/c` (a momentum),
//   `938.272 MeV/c^2` (a mass), `p to MeV/c`; anywhere else `c` is the speed-of-light constant;
// - `u` (unified atomic mass unit) and `a` (Julian year) are common quantity names, so they are
//   never read as units after a number: `2 u` is two u where the sheet does not define `u`, and
//   twice the sheet's `u` where it does (after `to` they are units).

import { NAME_CHAR, NAME_START } from './name-syntax';

export const UNIT_PLACEHOLDER_PREFIX = '__u_';

/** Units that are units after a number only when the sheet does not define the name. */
const BARE_NAME_UNITS: ReadonlySet<string> = new Set(['u', 'a']);

/** An electronvolt unit (eV, keV, MeV, GeV, TeV …) that `/c` and `/c^2` may follow. */
const EV_UNIT = /^(?:[yzafpnumkMGTPEZY]|da|h)?eV$/;

export interface UnitLiteral {
  placeholder: string;
  unit: string;
  /**
   * Unit names joined to the unit after a number by a space (`1 T m` is the unit T·m): the engine
   * refuses the statement as ambiguous where the sheet also defines one of these names.
   */
  spacedNames?: string[];
  /** The unit as written (`T m`), for messages. */
  written?: string;
}

const IDENT = /[A-Za-z_][A-Za-z0-9_]*/y;
// A sheet name may hold Greek letters (name-syntax.ts): a word is skipped whole, and a number right
// after a letter of a name (`γ1`) is part of the name. Unit names are Latin only (IDENT above).
const WORD = new RegExp(`[${NAME_START}ħ_][${NAME_CHAR}]*`, 'y');
const WORD_START = new RegExp(`[${NAME_START}ħ_]`);
const WORD_CHAR = new RegExp(`[${NAME_CHAR}.]`);
const POWER = /\^\s*(?:-?\d+(?:\.\d+)?|\(\s*-?\d+(?:\.\d+)?\s*\))/y;
const NUMBER = /(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?/y;

const placeholders = new Map<string, string>();
function placeholderFor(unit: string): string {
  let known = placeholders.get(unit);
  if (known === undefined) {
    known = `${UNIT_PLACEHOLDER_PREFIX}${Buffer.from(unit, 'utf8').toString('hex')}`;
    if (placeholders.size < 10_000) placeholders.set(unit, known);
  }
  return known;
}

export function unitOfPlaceholder(name: string): string | null {
  if (!name.startsWith(UNIT_PLACEHOLDER_PREFIX)) return null;
  return Buffer.from(name.slice(UNIT_PLACEHOLDER_PREFIX.length), 'hex').toString('utf8');
}

/**
 * Reads a unit expression at `start`: unit names joined by * or / and raised by ^n. Within a `to`
 * target, spaces around * and / are allowed. Returns the end index, or `start` when no unit is there.
 */
export function readUnitExpression(
  line: string,
  start: number,
  isUnit: (name: string) => boolean,
  spaced: boolean,
  spacedNames?: string[],
): number {
  let i = start;
  let end = start;
  let expectUnit = true;
  let previous = '';
  let divided = false;
  // After a number, `u` and `a` are the sheet's quantities where it defines them (see above).
  const unit = (name: string) => (spaced || !BARE_NAME_UNITS.has(name)) && isUnit(name);
  for (;;) {
    if (expectUnit) {
      IDENT.lastIndex = i;
      const m = IDENT.exec(line);
      if (!m || !(unit(m[0]) || (m[0] === 'c' && divided && EV_UNIT.test(previous) && isUnit(previous)))) return end;
      previous = m[0];
      i += m[0].length;
      end = i;
      expectUnit = false;
      POWER.lastIndex = i;
      const p = POWER.exec(line);
      if (p) {
        i += p[0].length;
        end = i;
      }
      continue;
    }
    let j = i;
    if (spaced) while (line[j] === ' ' || line[j] === '\t') j++;
    const op = line[j];
    if (op !== '*' && op !== '/') {
      // After a number, unit names separated by a space multiply (`1 T m` is T·m, as the trade
      // writes it); not `to`/`in` (conversions) nor a name called as a function.
      if (spaced || (op !== ' ' && op !== '\t')) return end;
      while (line[j] === ' ' || line[j] === '\t') j++;
      IDENT.lastIndex = j;
      const m = IDENT.exec(line);
      if (!m || m[0] === 'to' || m[0] === 'in' || !unit(m[0]) || /^\s*\(/.test(line.slice(j + m[0].length))) return end;
      spacedNames?.push(m[0]);
      i = j;
      expectUnit = true;
      continue;
    }
    j++;
    if (spaced) while (line[j] === ' ' || line[j] === '\t') j++;
    IDENT.lastIndex = j;
    const m = IDENT.exec(line);
    const perC = m?.[0] === 'c' && op === '/' && EV_UNIT.test(previous) && isUnit(previous);
    if (!m || !(unit(m[0]) || perC)) return end;
    divided = op === '/';
    i = j;
    expectUnit = true;
  }
}

/** ASCII fast paths of the character classes above (other characters are asked of the regular expressions). */
function isWordStart(ch: string): boolean {
  const c = ch.charCodeAt(0);
  if (c < 128) return (c >= 65 && c <= 90) || (c >= 97 && c <= 122) || c === 95;
  return WORD_START.test(ch);
}
function isWordChar(ch: string): boolean {
  const c = ch.charCodeAt(0);
  if (c < 128) return (c >= 65 && c <= 90) || (c >= 97 && c <= 122) || (c >= 48 && c <= 57) || c === 95 || c === 46;
  return WORD_CHAR.test(ch);
}

/** The unit expression written from `from` to `to` as one placeholder, recorded once per statement. */
function takeUnit(line: string, from: number, to: number, literals: UnitLiteral[], spacedNames: string[]): string {
  const written = line.slice(from, to);
  const unit = written
    .replace(/\s*([*/^])\s*/g, '$1')
    .replace(/\(\s+/g, '(')
    .replace(/\s+\)/g, ')')
    .replace(/\s+/g, '*');
  const placeholder = placeholderFor(unit);
  const known = literals.find((l) => l.placeholder === placeholder);
  if (!known) literals.push({ placeholder, unit, ...(spacedNames.length ? { spacedNames, written } : {}) });
  else if (spacedNames.length)
    Object.assign(known, { spacedNames: [...new Set([...(known.spacedNames ?? []), ...spacedNames])], written });
  return placeholder;
}

/** Replaces unit literals of one statement (comment already removed) by placeholders. */
export function extractUnitLiterals(
  line: string,
  isUnit: (name: string) => boolean,
): { text: string; literals: UnitLiteral[] } {
  const literals: UnitLiteral[] = [];
  let out = '';
  // Characters from `copied` to `i` are copied as they are when the next placeholder is written.
  let copied = 0;
  let i = 0;
  let quote: string | null = null;
  while (i < line.length) {
    const ch = line[i];
    if (quote) {
      if (ch === '\\' && i + 1 < line.length) i++;
      else if (ch === quote) quote = null;
      i++;
      continue;
    }
    if (ch === '"' || ch === "'") {
      quote = ch;
      i++;
      continue;
    }
    if (isWordStart(ch)) {
      WORD.lastIndex = i;
      const word = WORD.exec(line)![0];
      i += word.length;
      if ((word === 'to' || word === 'in') && /\s/.test(line[i] ?? '')) {
        let j = i;
        while (line[j] === ' ' || line[j] === '\t') j++;
        const end = readUnitExpression(line, j, isUnit, true);
        if (end > j) {
          out += line.slice(copied, j) + takeUnit(line, j, end, literals, []);
          i = copied = end;
        }
      }
      continue;
    }
    const c = ch.charCodeAt(0);
    if (((c >= 48 && c <= 57) || c === 46) && !(i > 0 && isWordChar(line[i - 1]))) {
      NUMBER.lastIndex = i;
      const m = NUMBER.exec(line);
      if (m) {
        i += m[0].length;
        let j = i;
        while (line[j] === ' ' || line[j] === '\t') j++;
        const spacedNames: string[] = [];
        const end = readUnitExpression(line, j, isUnit, false, spacedNames);
        if (end > j) {
          out += line.slice(copied, j) + takeUnit(line, j, end, literals, spacedNames);
          i = copied = end;
        }
        continue;
      }
    }
    i++;
  }
  return { text: copied === 0 ? line : out + line.slice(copied), literals };
}
