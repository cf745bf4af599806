// Every escape from a sheet that was tried. mathjs's security documentation names the functions
// to disable (import, createUnit, reviver, evaluate, parse, simplify, derivative, resolve); the rest
// were found by trying. Each attempt must end as an error of its own cell and change nothing.
import { describe, expect, it } from 'vitest';
import { createSheetEngine } from '../../lib/calc/sheet-engine';

const engine = createSheetEngine();
const one = (source: string) =>
  engine.evaluate([{ id: 'c1', kind: 'calc', source }], { significantFigures: 6 }).cells[0];

const ATTEMPTS: Array<[string, RegExp]> = [
  ['import({x: 1})', /import is not available|Undefined function import/],
  ['createUnit("furlong", "201.168 m")', /createUnit is not available/],
  ['evaluate("1 + 1")', /evaluate is not available/],
  ['parse("1 + 1")', /parse is not available/],
  ['compile("1 + 1")', /compile is not available/],
  ['parser()', /parser is not available/],
  ['simplify("x + x")', /simplify is not available/],
  ['derivative("x^2", "x")', /derivative is not available/],
  ['resolve(1)', /resolve is not available/],
  ['config({number: "BigNumber"})', /config is not available/],
  ['help(sin)', /help is not available/],
  ['chain(1)', /chain is not available|Undefined function chain/],
  ['typed("f", {})', /typed is not available/],
  ['g_1 = typed', /typed is not available/],
  ['expression.node', /expression is not available|only one plain statement/],
  ['reviver("a", 1)', /reviver is not available/],
  ['print("$a", {a: 1})', /print is not available/],
  ['f(x) = x\nf.constructor', /No access to property "constructor"|only one plain statement|is not an input table/],
  ['sin.constructor("return process")()', /No access|a value is expected|only one plain statement|not expected here/],
  [
    'x_1 = "abc"\ny_1 = x_1.constructor',
    /No access to property "constructor"|only one plain statement|is not an input table/,
  ],
  ['o_1 = {a: 1}\np_1 = o_1.__proto__', /No access|only one plain statement|is not an input table/],
  ['o_2 = {}\no_2.__proto__.polluted = 1', /only plain names can be defined/],
  ['[1, 2].map.constructor', /No access|only one plain statement|Unexpected|read from an input table by its name/],
  ['cos.apply(1, [0])', /No access|only one plain statement|Unexpected/],
  ['"a".toString()', /only one plain statement|No access|Unexpected|read from an input table by its name/],
  ['toString = 1', /reserved word/],
  ['hasOwnProperty(x) = 1', /reserved word/],
  ['__proto__ = 1', /names start with a letter/],
  ['constructor = 1', /reserved word/],
];

describe('sandbox escapes', () => {
  it.each(ATTEMPTS)('%s is refused as a cell error', (source, message) => {
    const cell = one(source);
    expect(cell.ok).toBe(false);
    expect(cell.error).toMatch(message);
  });

  it('leaves the host untouched', () => {
    for (const [source] of ATTEMPTS) one(source);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect(typeof engine.em.parse('0.1').compile().evaluate()).toBe('number'); // still plain numbers: config was not reached
    expect(typeof (globalThis as Record<string, unknown>).process).toBe('object');
  });

  it('keeps the units intact after a sheet tried to redefine one', () => {
    one('createUnit("m", "2 ft", {override: true})');
    expect((engine.em.parse('1 m').compile().evaluate() as { toNumber(u: string): number }).toNumber('ft')).toBeCloseTo(
      3.28084,
      5,
    );
  });
});

describe('size limits', () => {
  it('refuses a matrix beyond the element limit before allocating it', () => {
    expect(one('zeros(2000, 2000)').error).toMatch(/zeros: more than 1,000,000 elements is beyond the sheet limit/);
    expect(one('range(0, 1e9)').error).toMatch(/range: more than 1,000,000 elements/);
    expect(one('ones([5000, 5000])').error).toMatch(/ones: more than 1,000,000 elements/);
    expect(one('zeros(100, 100)').ok).toBe(true);
  });
  it('refuses an over-long cell and an over-long line with a message', () => {
    expect(one(`x = ${'1 + '.repeat(6000)}1`).error).toMatch(/longer than 20000 characters/);
    expect(one(`x = ${'1 + '.repeat(600)}1`).error).toMatch(/a line holds at most 2000 characters/);
  });
  it('ends runaway recursion with an error instead of a crash', () => {
    const cell = engine.evaluate(
      [
        { id: 'c1', kind: 'calc', source: 'f(x) = f(x + 1)' },
        { id: 'c2', kind: 'calc', source: 'y = f(1)' },
      ],
      { significantFigures: 6 },
    ).cells[1];
    expect(cell.ok).toBe(false);
    expect(cell.error).toMatch(/call stack|recursion/i);
  });
});
