// The editor's highlighting of the calculation language: what each piece of a line is drawn as,
// that its reading of units agrees with the engine's (unit-literals.ts with mathjs's units), and that
// every colour is readable on white.
import { describe, expect, it } from 'vitest';
import { tokens } from '../../tailwind.config';
import { createEngineMath } from '../../lib/calc/math-instance';
import { extractUnitLiterals } from '../../lib/calc/unit-literals';
import {
  isUnitName,
  TOKEN_STYLES,
  tokenizeCalc,
  UNIT_TABLE,
  type CalcTokenKind,
} from '../../components/sheet/editor-language';

// WCAG 2.2 glossary: relative luminance and contrast ratio (as in tests/ui/contrast.test.ts).
function luminance(hex: string): number {
  const [r, g, b] = [1, 3, 5]
    .map((i) => parseInt(hex.slice(i, i + 2), 16) / 255)
    .map((c) => (c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4));
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}
function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (hi + 0.05) / (lo + 0.05);
}

function kinds(line: string): Array<[string, CalcTokenKind]> {
  return tokenizeCalc(line)[0].map((t) => [t.text, t.kind]);
}

describe('tokens', () => {
  it('reads Greek letters as names (lib/calc/name-syntax.ts), ħ as a constant, and `1 T m` as a unit', () => {
    expect(kinds('Δp = 3 γ * θ_1 + β2 * ħ')).toEqual([
      ['Δp', 'name'],
      ['=', 'operator'],
      ['3', 'number'],
      ['γ', 'name'],
      ['*', 'operator'],
      ['θ_1', 'name'],
      ['+', 'operator'],
      ['β2', 'name'],
      ['*', 'operator'],
      ['ħ', 'constant'],
    ]);
    // Unit names joined by a space after a number multiply (unit-literals.ts): the trade's T m.
    expect(kinds('B_rho = 1 T m')).toEqual([
      ['B_rho', 'name'],
      ['=', 'operator'],
      ['1', 'number'],
      ['T m', 'unit'],
    ]);
  });

  it('reads a definition with a unit after the number and a comment', () => {
    expect(kinds('T_kin = 250 MeV   # kinetic energy')).toEqual([
      ['T_kin', 'name'],
      ['=', 'operator'],
      ['250', 'number'],
      ['MeV', 'unit'],
      ['# kinetic energy', 'comment'],
    ]);
  });

  it('reads numbers with exponents and compound units without spaces', () => {
    expect(kinds('g_1 = 9.81e-3 km/s^2')).toEqual([
      ['g_1', 'name'],
      ['=', 'operator'],
      ['9.81e-3', 'number'],
      ['km/s^2', 'unit'],
    ]);
    expect(kinds('x = .5E+10')).toEqual([
      ['x', 'name'],
      ['=', 'operator'],
      ['.5E+10', 'number'],
    ]);
  });

  it('takes a spaced unit expression after `to` and `in`, and only unit names there', () => {
    expect(kinds('Brho = magneticRigidity(p_1, q_e) to T * m')).toEqual([
      ['Brho', 'name'],
      ['=', 'operator'],
      ['magneticRigidity', 'libraryFunction'],
      ['(', 'bracket'],
      ['p_1', 'name'],
      [',', 'punctuation'],
      ['q_e', 'constant'],
      [')', 'bracket'],
      ['to', 'keyword'],
      ['T * m', 'unit'],
    ]);
    expect(kinds('L_1 in km')).toEqual([
      ['L_1', 'name'],
      ['in', 'keyword'],
      ['km', 'unit'],
    ]);
    expect(kinds('y to x_1')).toEqual([
      ['y', 'name'],
      ['to', 'keyword'],
      ['x_1', 'name'],
    ]);
  });

  it('reads a bare unit name as a name, since a sheet may define it (`m` is a mass after `m = 5 kg`)', () => {
    expect(kinds('E_0 = m * c^2')).toEqual([
      ['E_0', 'name'],
      ['=', 'operator'],
      ['m', 'name'],
      ['*', 'operator'],
      ['c', 'constant'],
      ['^', 'operator'],
      ['2', 'number'],
    ]);
  });

  it('does not take a name after a number for a unit when it is not one, nor across a space inside', () => {
    expect(kinds('z = 2 x_1')).toEqual([
      ['z', 'name'],
      ['=', 'operator'],
      ['2', 'number'],
      ['x_1', 'name'],
    ]);
    expect(kinds('z = 2 m / s')).toEqual([
      ['z', 'name'],
      ['=', 'operator'],
      ['2', 'number'],
      ['m', 'unit'],
      ['/', 'operator'],
      ['s', 'name'],
    ]);
  });

  it('marks comparison operators of criteria, library functions, other functions and constants apart', () => {
    expect(kinds('beta_1 <= 0.7')).toEqual([
      ['beta_1', 'name'],
      ['<=', 'comparison'],
      ['0.7', 'number'],
    ]);
    expect(kinds('a != b')[1]).toEqual(['!=', 'comparison']);
    expect(kinds('a == b')[1]).toEqual(['==', 'comparison']);
    expect(kinds('a > 2 T*m')).toEqual([
      ['a', 'name'],
      ['>', 'comparison'],
      ['2', 'number'],
      ['T*m', 'unit'],
    ]);
    expect(kinds('r = sqrt(lorentzFactor(0.5)) * pi')).toEqual([
      ['r', 'name'],
      ['=', 'operator'],
      ['sqrt', 'function'],
      ['(', 'bracket'],
      ['lorentzFactor', 'libraryFunction'],
      ['(', 'bracket'],
      ['0.5', 'number'],
      [')', 'bracket'],
      [')', 'bracket'],
      ['*', 'operator'],
      ['pi', 'constant'],
    ]);
  });

  it('keeps a # inside a string and reads the string whole', () => {
    expect(kinds('s = "a # b \\" c" # note')).toEqual([
      ['s', 'name'],
      ['=', 'operator'],
      ['"a # b \\" c"', 'string'],
      ['# note', 'comment'],
    ]);
  });

  it('covers every character of a line that is not a space, one line at a time', () => {
    const source = 'T_kin = 250 MeV\np_1 = momentumFromKinetic(T_kin, m_p)\n\nBrho < 2.5 T*m';
    const lines = tokenizeCalc(source);
    expect(lines).toHaveLength(4);
    source
      .split('\n')
      .forEach((line, i) => expect(lines[i].map((t) => t.text).join('')).toBe(line.replace(/\s+/g, '')));
  });
});

describe('agreement with the engine', () => {
  const em = createEngineMath([]);

  it('knows exactly the units the engine knows, for every unit with every prefix', () => {
    const prefixes = [
      '',
      'da',
      'h',
      'k',
      'M',
      'G',
      'T',
      'P',
      'E',
      'm',
      'u',
      'n',
      'p',
      'f',
      'a',
      'kilo',
      'mega',
      'milli',
      'micro',
      'Ki',
      'Mi',
      'MM',
      'q',
      'x',
    ];
    const bases = Object.values(UNIT_TABLE).flat();
    let checked = 0;
    for (const base of bases) {
      for (const prefix of prefixes) {
        expect.soft(isUnitName(prefix + base), prefix + base).toBe(em.isUnitName(prefix + base));
        checked++;
      }
    }
    for (const name of [
      'T_kin',
      'x',
      'beta',
      'gamma',
      'Brho',
      'p_1',
      'c',
      'mu',
      'foo',
      'MeVs',
      'ly',
      'pc',
      'kpc',
      'Da',
      'kDa',
      'au',
      'kau',
    ]) {
      expect(isUnitName(name), name).toBe(em.isUnitName(name));
    }
    expect(checked).toBeGreaterThan(5000);
  });

  it('finds the same unit literals as the engine', () => {
    const lines = [
      'T_kin = 250 MeV',
      'g_1 = 9.81 m/s^2',
      'Brho = magneticRigidity(p_1, q_e) to T * m',
      'L = 3 km in m',
      'a = 2 m / s',
      'b = 2.5 T*m + 3 x',
      'c1 = 1e3 kg*m/s^(2)',
      'd = "5 m" to m',
      'e1 = 5 in',
    ];
    for (const line of lines) {
      const engine = extractUnitLiterals(line, em.isUnitName).literals.map((l) => l.unit);
      const editor = tokenizeCalc(line)[0]
        .filter((t) => t.kind === 'unit')
        .map((t) => t.text.replace(/\s+/g, ''));
      expect([...new Set(editor)], line).toEqual(engine);
    }
  });
});

describe('colours', () => {
  it('draws every kind of token in a Worldsheet colour at least 4.5:1 on white and on paper (WCAG 2.2, 1.4.3)', () => {
    const palette = new Set<string>(Object.values(tokens));
    for (const [kind, style] of Object.entries(TOKEN_STYLES)) {
      expect(palette.has(style.color), kind).toBe(true);
      expect(contrast(style.color, '#ffffff'), kind).toBeGreaterThanOrEqual(4.5);
      expect(contrast(style.color, tokens.paper), kind).toBeGreaterThanOrEqual(4.5);
    }
  });

  it('tells library functions, constants, units, names and comparisons apart', () => {
    const look = (k: CalcTokenKind) => JSON.stringify(TOKEN_STYLES[k]);
    const distinct: CalcTokenKind[] = [
      'unit',
      'name',
      'libraryFunction',
      'constant',
      'comparison',
      'comment',
      'string',
      'operator',
    ];
    expect(new Set(distinct.map(look)).size).toBe(distinct.length);
  });
});
