// Any input either evaluates or yields a per-cell error; the engine itself never throws.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import { seedFastCheck } from './fast-check-seed';

seedFastCheck('tests/calc/engine-fuzz.test.ts', 20260316);

const engine = createSheetEngine();

const token = fc.oneof(
  fc.constantFrom(
    'x_1',
    'y_1',
    'm',
    's',
    'T',
    'c',
    'm_p',
    'q_e',
    'pi',
    'e',
    'MeV',
    'T*m',
    'm/s',
    'kg',
    'to',
    'in',
    '#',
    '"',
    "'",
  ),
  fc.constantFrom('lorentzFactor(', 'speedFromKinetic(', 'addVelocities(', 'sqrt(', 'f(', 'sin('),
  fc.constantFrom(
    '=',
    '+',
    '-',
    '*',
    '/',
    '^',
    '(',
    ')',
    ',',
    '<',
    '<=',
    '==',
    '?',
    ':',
    '[',
    ']',
    '{',
    '}',
    '.',
    ';',
    ' ',
    '\n',
  ),
  fc.double({ noNaN: false }).map(String),
  fc.integer({ min: -5, max: 5 }).map(String),
);

const sourceOfTokens = fc.array(token, { maxLength: 40 }).map((ts) => ts.join(' '));

describe('engine robustness (fast-check)', () => {
  it('answers every token soup with results or per-cell errors', () => {
    fc.assert(
      fc.property(fc.array(sourceOfTokens, { minLength: 1, maxLength: 5 }), (sources) => {
        const r = engine.evaluate(
          sources.map((source, i) => ({ id: `c${i}`, kind: 'calc' as const, source })),
          { significantFigures: 6 },
        );
        expect(r.cells).toHaveLength(sources.length);
        for (const cell of r.cells) {
          expect(cell.ok === (cell.error === null)).toBe(true);
          for (const st of cell.statements) expect(typeof st.tex).toBe('string');
        }
      }),
      { numRuns: 400 },
    );
  });

  it('answers arbitrary text the same way', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 200, unit: 'binary' }), (source) => {
        const r = engine.evaluate([{ id: 'c1', kind: 'calc', source }], { significantFigures: 6 });
        expect(r.cells[0].ok === (r.cells[0].error === null)).toBe(true);
      }),
      { numRuns: 400 },
    );
  });
});
