// The alternate calculation compared with the sheet (lib/checks/alternate-comparison.ts): the
// relative difference |a − s| / |s| on SI values, the tolerance as the checker writes it, units that
// differ, zero, plain numbers and quantities, lists.
import { describe, expect, it } from 'vitest';
import { compareAlternate, compareValues, formatRelative, parseTolerance } from '../../lib/checks/alternate-comparison';
import type { DisplayValue, SheetResult, StatementResult } from '../../lib/calc/types';

const q = (number: number, unit: string | null, text = `${number}${unit ? ` ${unit}` : ''}`): DisplayValue => ({
  kind: unit ? 'quantity' : 'number',
  text,
  tex: '',
  number,
  unit,
  raw: null,
});

function results(defs: Array<[string, DisplayValue | null, string?]>): SheetResult {
  const statements: StatementResult[] = defs.map(([name, value, error], i) => ({
    line: i + 1,
    source: `${name} = …`,
    kind: 'definition',
    name,
    tex: '',
    substitutedTex: null,
    value,
    criterion: null,
    error: error ?? null,
  }));
  return {
    ok: true,
    engineVersion: 'test',
    constantsEdition: 'test',
    evaluatedCells: 1,
    cells: [
      { id: 'c1', index: 0, kind: 'calc', ok: true, error: null, statements, defines: defs.map((d) => d[0]), uses: [] },
    ],
  };
}

describe('parseTolerance', () => {
  it('reads a relative number, a percentage and parts per million', () => {
    expect(parseTolerance('1e-6')).toEqual({ ok: true, value: 1e-6 });
    // 0.1 % = 0.001 (definition of per cent, arithmetic).
    expect(parseTolerance('0.1 %')).toEqual({ ok: true, value: 0.001 });
    expect(parseTolerance('0.1%')).toEqual({ ok: true, value: 0.001 });
    // 5 ppm = 5 × 10⁻⁶ (definition of parts per million, common practice).
    expect(parseTolerance('5 ppm')).toEqual({ ok: true, value: 5e-6 });
    expect(parseTolerance('1 × 10^-6')).toEqual({ ok: true, value: 1e-6 });
    expect(parseTolerance('1 × 10\u22126')).toEqual({ ok: true, value: 1e-6 });
  });
  it('refuses what is not a positive relative tolerance up to 10 %', () => {
    for (const bad of ['', 'abc', '-1e-6', '0', '0 %', '1e-6 m', '20 %', '0.5'])
      expect(parseTolerance(bad).ok, bad).toBe(false);
    // 10 % is the largest accepted (the module's limit; a looser comparison checks little, common practice).
    expect(parseTolerance('10 %')).toEqual({ ok: true, value: 0.1 });
  });
  it('writes tolerances and differences as a checker reads them', () => {
    expect(formatRelative(1e-6)).toBe('1 × 10⁻⁶');
    expect(formatRelative(0.001)).toBe('0.1 %');
    expect(formatRelative(0.0625)).toBe('6.25 %');
    expect(formatRelative(0)).toBe('0');
  });
});

describe('compareValues', () => {
  it('computes |a − s| / |s| at full precision and compares it with the tolerance', () => {
    // |1.621 43 − 1.621 42| / 1.621 42 = 6.167 4 × 10⁻⁶ (arithmetic).
    const r = compareValues(q(1.62142, 'T'), q(1.62143, 'T'), 1e-5);
    expect(r.relativeDifference).toBeCloseTo(0.00001 / 1.62142, 15);
    expect(r).toMatchObject({ status: 'within', words: 'within the tolerance of 1 × 10⁻⁵' });
    expect(compareValues(q(1.62142, 'T'), q(1.62143, 'T'), 1e-6)).toMatchObject({
      status: 'outside',
      words: 'outside the tolerance of 1 × 10⁻⁶',
    });
    // Equal at the tolerance counts as within (≤, common practice).
    expect(compareValues(q(100, 'm'), q(100.1, 'm'), 0.001).status).toBe('within');
  });
  it('compares in SI: 1 km against 1000 m, 938.272 MeV/c² against the same in kg', () => {
    expect(compareValues(q(1000, 'm'), q(1, 'km'), 1e-12)).toMatchObject({
      relativeDifference: 0,
      status: 'within',
      alternateInSheetUnit: '1000 m',
    });
    // m_p = 938.272 089 43 MeV/c² = 1.672 621 925 95 × 10⁻²⁷ kg (CODATA 2022); difference below 1 × 10⁻⁹.
    const r = compareValues(q(938.27208943, 'MeV / c^2'), q(1.67262192595e-27, 'kg'), 1e-9);
    expect(r.status).toBe('within');
    expect(r.relativeDifference!).toBeLessThan(1e-9);
  });
  it('says the units differ when the dimensions do, plain against a dimensioned quantity too', () => {
    expect(compareValues(q(1, 'm'), q(1, 's'), 1e-6)).toMatchObject({
      relativeDifference: null,
      status: 'units_differ',
      words: 'cannot be compared: units differ (m and s)',
    });
    expect(compareValues(q(1, null), q(1, 'm'), 1e-6)).toMatchObject({
      status: 'units_differ',
      words: 'cannot be compared: units differ (a plain number and m)',
    });
  });
  it('compares a plain number with a dimensionless quantity (1 ppm = 10⁻⁶, common practice)', () => {
    expect(compareValues(q(1e-6, null), q(1, 'ppm'), 1e-9)).toMatchObject({ status: 'within', relativeDifference: 0 });
  });
  it('handles a sheet value of zero in words', () => {
    expect(compareValues(q(0, 'm'), q(0, 'mm'), 1e-6)).toMatchObject({ relativeDifference: 0, status: 'within' });
    expect(compareValues(q(0, 'm'), q(1, 'mm'), 1e-6)).toMatchObject({
      relativeDifference: null,
      status: 'outside',
      words: expect.stringContaining('the sheet value is 0'),
    });
  });
  it('computes the difference with no verdict until a tolerance is stated', () => {
    expect(compareValues(q(2, null), q(2.2, null), null)).toMatchObject({
      status: 'no_tolerance',
      words: 'no tolerance stated yet',
    });
    expect(compareValues(q(2, null), q(2.2, null), null).relativeDifference).toBeCloseTo(0.1, 14);
  });
  it('does not compare lists, booleans or non-finite values', () => {
    const list: DisplayValue = { kind: 'matrix', text: '[1, 2]', tex: '', number: null, unit: null, raw: null };
    expect(compareValues(list, list, 1e-6)).toMatchObject({
      status: 'not_compared',
      words: 'not compared: lists are not compared (sheet)',
    });
    const yes: DisplayValue = { kind: 'boolean', text: 'true', tex: '', number: null, unit: null, raw: true };
    expect(compareValues(q(1, null), yes, 1e-6).status).toBe('not_compared');
  });
});

describe('compareAlternate', () => {
  it('lists every name both define, in the sheet order, and counts those not within', () => {
    const sheet = results([
      ['p', q(729.134, 'MeV / c')],
      ['B', q(1.62142, 'T')],
      ['L', q(12.5, 'm')],
      ['bad', null, 'an error'],
    ]);
    const alt = results([
      ['B', q(1.62143, 'T')],
      ['p', q(729.134, 'MeV / c')],
      ['x', q(1, null)],
      ['bad', q(1, null)],
    ]);
    const c = compareAlternate(sheet, alt, 1e-6, '1e-6');
    expect(c.rows.map((r) => [r.name, r.status])).toEqual([
      ['p', 'within'],
      ['B', 'outside'],
      ['bad', 'not_compared'],
    ]);
    expect(c.notWithin).toBe(2);
    expect(c.rows[2].words).toBe("not compared: the sheet's statement has an error");
    expect(compareAlternate(sheet, null, 1e-6).rows).toEqual([]);
  });
});
