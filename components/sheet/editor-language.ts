// Highlighting for the calculation language in the cell editor: a CodeMirror stream tokenizer and the
// colours it is drawn in. Pure (no React, no DOM), so it runs in tests and in the browser alike.
//
// It follows the engine's reading of a line (sheet-engine.ts, unit-literals.ts): `#` starts a comment
// outside a string; a unit expression written right after a number (`9.81 m/s^2`, no spaces inside)
// or after `to`/`in` (`to T * m`, spaces allowed) is a unit; other names are quantities, library
// functions or built-in constants. The engine decides what is a unit with mathjs; the editor does not
// ship mathjs, so UNIT_TABLE below repeats mathjs's unit names and their prefixes (plus the engine's
// own units), and tests/calc/editor-language.test.ts checks it against the engine's answer.
import { StreamLanguage, StringStream, type StreamParser } from '@codemirror/language';
import { tags, type Tag } from '@lezer/highlight';
import { tokens } from '@/tailwind.config';
import { CONSTANTS } from '@/lib/calc/constants';
import { LIBRARY } from '@/lib/calc/functions';
import { readUnitExpression } from '@/lib/calc/unit-literals';
import { NAME_CHAR, NAME_START } from '@/lib/calc/name-syntax';

const PREFIXES = {
  none: [''],
  short: [
    '',
    'da',
    'h',
    'k',
    'M',
    'G',
    'T',
    'P',
    'E',
    'Z',
    'Y',
    'R',
    'Q',
    'd',
    'c',
    'm',
    'u',
    'n',
    'p',
    'f',
    'a',
    'z',
    'y',
    'r',
    'q',
  ],
  long: [
    '',
    'deca',
    'hecto',
    'kilo',
    'mega',
    'giga',
    'tera',
    'peta',
    'exa',
    'zetta',
    'yotta',
    'ronna',
    'quetta',
    'deci',
    'centi',
    'milli',
    'micro',
    'nano',
    'pico',
    'femto',
    'atto',
    'zepto',
    'yocto',
    'ronto',
    'quecto',
  ],
  btu: ['', 'MM'],
  binaryShort: ['', 'k', 'M', 'G', 'T', 'P', 'E', 'Z', 'Y', 'Ki', 'Mi', 'Gi', 'Ti', 'Pi', 'Ei', 'Zi', 'Yi'],
  binaryLong: [
    '',
    'kilo',
    'mega',
    'giga',
    'tera',
    'peta',
    'exa',
    'zetta',
    'yotta',
    'kibi',
    'mebi',
    'gibi',
    'tebi',
    'pebi',
    'exi',
    'zebi',
    'yobi',
  ],
} as const;

type PrefixSet = keyof typeof PREFIXES | 'shortLong';

/** The engine's units (mathjs 15 and lib/calc/math-instance.ts NEW_UNITS), by the prefixes each takes. */
export const UNIT_TABLE: Readonly<Record<PrefixSet, readonly string[]>> = {
  short: [
    'm',
    'L',
    'l',
    'g',
    'ton',
    't',
    's',
    'Hz',
    'rad',
    'deg',
    'grad',
    'A',
    'K',
    'degC',
    'degF',
    'degR',
    'mol',
    'cd',
    'N',
    'dyn',
    'J',
    'Wh',
    'eV',
    'W',
    'VAR',
    'VA',
    'Pa',
    'C',
    'Ah',
    'F',
    'V',
    'H',
    'S',
    'Wb',
    'T',
    'lt',
    'tons',
    'Da',
    'dalton',
    'pc',
    'parsec',
    'm2',
    'm3',
  ],
  long: [
    'meter',
    'litre',
    'gram',
    'tonne',
    'second',
    'sec',
    'hertz',
    'radian',
    'degree',
    'gradian',
    'ampere',
    'kelvin',
    'celsius',
    'fahrenheit',
    'rankine',
    'mole',
    'candela',
    'newton',
    'dyne',
    'kip',
    'joule',
    'electronvolt',
    'watt',
    'coulomb',
    'farad',
    'volt',
    'henry',
    'siemens',
    'weber',
    'tesla',
    'meters',
    'litres',
    'liter',
    'liters',
    'grams',
    'tonnes',
    'kips',
    'seconds',
    'secs',
    'radians',
    'degrees',
    'gradians',
    'watts',
    'joules',
    'amperes',
    'amps',
    'amp',
    'coulombs',
    'volts',
    'farads',
    'webers',
    'teslas',
    'electronvolts',
    'moles',
  ],
  shortLong: ['erg', 'bar', 'ohm', 'ohms'],
  none: [
    'inch',
    'foot',
    'yard',
    'mile',
    'link',
    'rod',
    'chain',
    'angstrom',
    'in',
    'ft',
    'yd',
    'mi',
    'li',
    'rd',
    'ch',
    'mil',
    'sqin',
    'sqft',
    'sqyd',
    'sqmi',
    'sqrd',
    'sqch',
    'sqmil',
    'acre',
    'hectare',
    'cuin',
    'cuft',
    'cuyd',
    'teaspoon',
    'tablespoon',
    'drop',
    'gtt',
    'minim',
    'fluiddram',
    'fluidounce',
    'gill',
    'cc',
    'cup',
    'pint',
    'quart',
    'gallon',
    'beerbarrel',
    'oilbarrel',
    'hogshead',
    'grain',
    'dram',
    'ounce',
    'poundmass',
    'hundredweight',
    'stick',
    'stone',
    'gr',
    'dr',
    'oz',
    'lbm',
    'cwt',
    'min',
    'h',
    'minute',
    'hour',
    'day',
    'week',
    'month',
    'year',
    'decade',
    'century',
    'millennium',
    'cycle',
    'arcsec',
    'arcmin',
    'lbf',
    'poundforce',
    'kilogramforce',
    'hp',
    'psi',
    'atm',
    'torr',
    'mmHg',
    'mmH2O',
    'cmH2O',
    'inches',
    'feet',
    'yards',
    'miles',
    'links',
    'rods',
    'chains',
    'angstroms',
    'teaspoons',
    'tablespoons',
    'minims',
    'fldr',
    'fluiddrams',
    'floz',
    'fluidounces',
    'gi',
    'gills',
    'cp',
    'cups',
    'pt',
    'pints',
    'qt',
    'quarts',
    'gal',
    'gallons',
    'bbl',
    'beerbarrels',
    'obl',
    'oilbarrels',
    'hogsheads',
    'gtts',
    'grains',
    'drams',
    'ounces',
    'poundmasses',
    'hundredweights',
    'sticks',
    'lb',
    'lbs',
    'kgf',
    'acres',
    'hectares',
    'sqfeet',
    'sqyard',
    'sqmile',
    'sqmiles',
    'mmhg',
    'mmh2o',
    'cmh2o',
    'minutes',
    'mins',
    'hours',
    'hr',
    'hrs',
    'days',
    'weeks',
    'months',
    'years',
    'decades',
    'centuries',
    'millennia',
    'cycles',
    'arcsecond',
    'arcseconds',
    'arcminute',
    'arcminutes',
    'au',
    'astronomicalunit',
    'ly',
    'lightyear',
    'u',
    'yr',
    'a',
    'ppm',
    'ppb',
  ],
  btu: ['BTU', 'BTUs'],
  binaryShort: ['b', 'B'],
  binaryLong: ['bits', 'bytes', 'bit', 'byte'],
};

function prefixesOf(set: PrefixSet): readonly string[] {
  return set === 'shortLong' ? [...PREFIXES.short, ...PREFIXES.long.slice(1)] : PREFIXES[set];
}

const unitNames = new Set<string>();
for (const [set, names] of Object.entries(UNIT_TABLE) as Array<[PrefixSet, readonly string[]]>) {
  for (const name of names) for (const prefix of prefixesOf(set)) unitNames.add(prefix + name);
}

/** True when `name` is a unit the engine knows, with or without a prefix (m, mm, MeV, T, t, h …). */
export function isUnitName(name: string): boolean {
  return !name.includes('_') && unitNames.has(name);
}

const LIBRARY_FUNCTION_NAMES: ReadonlySet<string> = new Set(LIBRARY.map((f) => f.name));
/** The product's constants and mathjs's named values that a sheet cannot redefine. */
const CONSTANT_NAMES: ReadonlySet<string> = new Set([
  ...CONSTANTS.map((k) => k.name),
  'pi',
  'PI',
  'e',
  'E',
  'i',
  'Infinity',
  'NaN',
  'true',
  'false',
  'null',
  'phi',
  'tau',
]);
/** Words that are operators in mathjs (`to` and `in` convert units). */
const KEYWORDS: ReadonlySet<string> = new Set(['to', 'in', 'and', 'or', 'not', 'xor', 'mod']);

// Names hold Latin and Greek letters (`γ`, `Δp`, `θ_1`; lib/calc/name-syntax.ts), and `ħ` is a constant.
const IDENT = new RegExp(`[${NAME_START}ħ_][${NAME_CHAR}]*`, 'y');
const IDENT_START = new RegExp(`[${NAME_START}ħ_]`);
const IDENT_CHAR = new RegExp(`[${NAME_CHAR}.]`);
const NUMBER = /(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?/;
const COMPARISON = /^(?:<=|>=|==|!=|<|>|≤|≥|≠)/;
const OPERATOR = /^(?:\+\/-|±|\.\*|\.\/|\.\^|[-+*/^%!=:'?|&~])/;

/** The end of a unit expression starting at `start` (the rule of unit-literals.ts), or `start`. */
function unitExpressionEnd(
  line: string,
  start: number,
  spaced: boolean,
  isUnit: (name: string) => boolean = isUnitName,
): number {
  // The engine's own reader: the same units, `MeV/c` and `MeV/c^2`, and `u`/`a` not after a number.
  return readUnitExpression(line, start, isUnit, spaced);
}

/** The kinds of token the tokenizer gives; each has a highlighting tag and a style. */
export type CalcTokenKind =
  | 'number'
  | 'unit'
  | 'name'
  | 'libraryFunction'
  | 'function'
  | 'constant'
  | 'keyword'
  | 'operator'
  | 'comparison'
  | 'bracket'
  | 'punctuation'
  | 'string'
  | 'comment';

export interface CalcTokenizerState {
  /** Where a unit expression announced by the previous number or `to`/`in` starts and ends. */
  unitFrom: number;
  unitTo: number;
}

export interface CalcLanguageOptions {
  /** Decides what is a unit; defaults to isUnitName. */
  isUnit?: (name: string) => boolean;
}

/** The tokenizer, as a CodeMirror StreamParser. Token names are CalcTokenKind values. */
function calcStreamParser(options: CalcLanguageOptions = {}): StreamParser<CalcTokenizerState> {
  const isUnit = options.isUnit ?? isUnitName;
  return {
    name: 'worldsheet-calc',
    startState: () => ({ unitFrom: -1, unitTo: -1 }),
    copyState: (s) => ({ ...s }),
    token(stream: StringStream, state: CalcTokenizerState): CalcTokenKind | null {
      if (stream.sol()) state.unitFrom = state.unitTo = -1;
      if (stream.eatSpace()) return null;
      const line = stream.string;
      const at = stream.pos;
      if (at === state.unitFrom) {
        stream.pos = state.unitTo;
        state.unitFrom = state.unitTo = -1;
        return 'unit';
      }
      const ch = line[at];
      if (ch === '#') {
        stream.skipToEnd();
        return 'comment';
      }
      if (ch === '"' || ch === "'") {
        stream.next();
        for (let c = stream.next(); c !== undefined; c = stream.next()) {
          if (c === '\\') stream.next();
          else if (c === ch) break;
        }
        return 'string';
      }
      const prev = at > 0 ? line[at - 1] : '';
      if (/[0-9.]/.test(ch) && !IDENT_CHAR.test(prev)) {
        const m = stream.match(NUMBER) as RegExpMatchArray | null;
        if (m && m.index === 0) {
          let j = stream.pos;
          while (line[j] === ' ' || line[j] === '\t') j++;
          const end = unitExpressionEnd(line, j, false, isUnit);
          if (end > j) {
            state.unitFrom = j;
            state.unitTo = end;
          }
          return 'number';
        }
      }
      if (IDENT_START.test(ch)) {
        IDENT.lastIndex = at;
        const word = IDENT.exec(line)![0];
        stream.pos = at + word.length;
        if (KEYWORDS.has(word)) {
          if ((word === 'to' || word === 'in') && /\s/.test(line[stream.pos] ?? '')) {
            let j = stream.pos;
            while (line[j] === ' ' || line[j] === '\t') j++;
            const end = unitExpressionEnd(line, j, true, isUnit);
            if (end > j) {
              state.unitFrom = j;
              state.unitTo = end;
            }
          }
          return 'keyword';
        }
        if (LIBRARY_FUNCTION_NAMES.has(word)) return 'libraryFunction';
        if (CONSTANT_NAMES.has(word)) return 'constant';
        if (/^\s*\(/.test(line.slice(stream.pos))) return 'function';
        return 'name';
      }
      const cmp = stream.match(COMPARISON);
      if (cmp) return 'comparison';
      if (stream.match(OPERATOR)) return 'operator';
      if (/[()[\]{}]/.test(ch)) {
        stream.next();
        return 'bracket';
      }
      stream.next();
      return 'punctuation';
    },
    tokenTable: TOKEN_TAGS,
    languageData: { commentTokens: { line: '#' } },
  };
}

/** The highlighting tag of each token kind. */
export const TOKEN_TAGS: Record<CalcTokenKind, Tag> = {
  number: tags.number,
  unit: tags.unit,
  name: tags.variableName,
  libraryFunction: tags.standard(tags.function(tags.variableName)),
  function: tags.function(tags.variableName),
  constant: tags.constant(tags.standard(tags.variableName)),
  keyword: tags.operatorKeyword,
  operator: tags.arithmeticOperator,
  comparison: tags.compareOperator,
  bracket: tags.bracket,
  punctuation: tags.punctuation,
  string: tags.string,
  comment: tags.lineComment,
};

export interface TokenStyle {
  color: string;
  fontWeight?: string;
  fontStyle?: string;
  textDecoration?: string;
}

/**
 * How each kind is drawn, in Worldsheet's tokens (all at least 4.5:1 on white; the test recomputes
 * the ratios). Signal colours (pass, fail, caution) stay reserved for results, so kinds that share a
 * colour differ by weight or style: units teal, library functions teal and bold, constants dark teal
 * and italic, comparisons ink and bold, operators, strings and comments muted (comments italic).
 */
export const TOKEN_STYLES: Record<CalcTokenKind, TokenStyle> = {
  number: { color: tokens.ink },
  unit: { color: tokens.accent },
  name: { color: tokens.ink },
  libraryFunction: { color: tokens.accent, fontWeight: '700' },
  function: { color: tokens['accent-hover'] },
  constant: { color: tokens['accent-hover'], fontStyle: 'italic', fontWeight: '600' },
  keyword: { color: tokens.accent, fontWeight: '600' },
  operator: { color: tokens['ink-muted'] },
  comparison: { color: tokens.ink, fontWeight: '700' },
  bracket: { color: tokens['ink-muted'] },
  punctuation: { color: tokens['ink-muted'] },
  string: { color: tokens['ink-muted'], textDecoration: 'underline dotted' },
  comment: { color: tokens['ink-muted'], fontStyle: 'italic' },
};

/** The calculation language for CodeMirror. */
export function calcLanguage(options: CalcLanguageOptions = {}): StreamLanguage<CalcTokenizerState> {
  return StreamLanguage.define(calcStreamParser(options));
}

export interface CalcToken {
  kind: CalcTokenKind;
  text: string;
  from: number;
  to: number;
}

/** Tokenizes a source the way the editor does (used by tests and anywhere a plain rendering helps). */
export function tokenizeCalc(source: string, options: CalcLanguageOptions = {}): CalcToken[][] {
  const parser = calcStreamParser(options);
  const state = parser.startState!(2);
  return source.split('\n').map((line) => {
    const out: CalcToken[] = [];
    const stream = new StringStream(line, 2, 2);
    while (!stream.eol()) {
      const from = stream.pos;
      const kind = parser.token(stream, state) as CalcTokenKind | null;
      if (stream.pos === from) stream.next();
      if (kind) out.push({ kind, text: line.slice(from, stream.pos), from, to: stream.pos });
      stream.start = stream.pos;
    }
    return out;
  });
}
