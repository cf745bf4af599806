// How numbers are written: significant figures with their trailing zeros (SI Brochure 9th ed.,
// §5.4.4, ISO 80000-1 on writing numbers; the significant-figure convention is common practice).
import { describe, expect, it } from 'vitest';
import { formatNumberTex, formatNumberText } from '../../lib/calc/format';
import { tickText } from '../../lib/plots/plot-figure';
import { createSheetEngine } from '../../lib/calc/sheet-engine';

const THIN = '\u202f';

describe('significant figures keep their trailing zeros', () => {
  it('writes 1.9675 at six figures as 1.967 50 and 144.11 as 144.110 (common practice)', () => {
    expect(formatNumberText(1.9675, 6)).toBe(`1.967${THIN}50`);
    expect(formatNumberText(144.11, 6)).toBe('144.110');
    expect(formatNumberTex(1.9675, 6)).toBe('1.967\\,50');
    expect(formatNumberText(-0.5, 3)).toBe('\u22120.500');
    // Scientific form keeps them in the mantissa: 2.50 × 10⁻⁵ at three figures.
    expect(formatNumberText(2.5e-5, 3)).toBe('2.50 × 10⁻⁵');
    expect(formatNumberTex(2.5e-5, 3)).toBe('2.50 \\times 10^{-5}');
  });

  it('writes a value that rounds to a whole number with its zeros, and an exact whole number without a fraction', () => {
    // 2.9999999 is not 3: the zeros say it was rounded at six figures.
    expect(formatNumberText(2.9999999, 6)).toBe(`3.000${THIN}00`);
    expect(formatNumberText(3, 6)).toBe('3');
    expect(formatNumberText(250, 6)).toBe('250');
    // A whole number in a display unit that is not exact in binary: 250 MeV back from joules.
    expect(formatNumberText(250.00000000000003, 6)).toBe('250');
    expect(formatNumberText(0, 6)).toBe('0');
  });

  it('keeps the zeros of a large whole number written as a power of ten unless that power is the number itself', () => {
    // IERS Conventions (2010) table 1.1: GM of the Earth 3.986 004 418 × 10¹⁴ m³/s², a whole number;
    // at six figures it is 3.986 00 × 10¹⁴ (common practice: "3.986 × 10¹⁴" would say the rest are zeros).
    expect(formatNumberText(3.986004418e14, 6)).toBe(`3.986${THIN}00 × 10¹⁴`);
    expect(formatNumberText(2000001, 6)).toBe(`2.000${THIN}00 × 10⁶`);
    expect(formatNumberText(3.5e15, 6)).toBe('3.5 × 10¹⁵');
  });

  it('drops them on axis ticks, where the figures of the data do not apply', () => {
    expect(tickText(0.5)).toBe('0.5');
    expect(tickText(1250)).toBe('1250');
  });

  it('shows results of a sheet with them, as the app, the study tables and the PDF read them', () => {
    const engine = createSheetEngine();
    const r = engine.evaluate([{ id: 'a', kind: 'calc', source: 'E_k = 144.11 MeV\nx_r = 1.9675 m\nb_r = 0.5' }], {
      significantFigures: 6,
    });
    const texts = r.cells[0].statements.map((s) => s.value!.text);
    expect(texts).toEqual(['144.110 MeV', `1.967${THIN}50 m`, `0.500${THIN}000`]);
    // The machine value stays at full precision.
    expect(r.cells[0].statements[1].value!.number).toBe(1.9675);
  });
});

describe('prefixes chosen for a result are the ones the trade writes', () => {
  const engine = createSheetEngine();
  const shown = (source: string) =>
    engine.evaluate([{ id: 'a', kind: 'calc', source }], { significantFigures: 6 }).cells[0].statements[0].value!.text;

  it('gives a length in metres with a power of ten beyond a kilometre, never Tm, Qm or qm (common practice)', () => {
    expect(shown('L_1 = 1e120 m')).toBe(`1.000${THIN}00 × 10¹²⁰ m`);
    expect(shown('L_2 = 1e-40 m')).toBe(`1.000${THIN}00 × 10⁻⁴⁰ m`);
    expect(shown('L_3 = 3e12 m')).toBe('3 × 10¹² m');
    // Within the prefixes the trade uses, the prefix stays: 2.5 km, 0.8 fm.
    expect(shown('L_4 = 2500 m')).toBe(`2.500${THIN}00 km`);
    expect(shown('L_5 = 0.8e-15 m')).toBe(`0.800${THIN}000 fm`);
  });

  it('gives a duration in seconds, never ks or Es (common practice: hours, days, years are asked for with `to`)', () => {
    expect(shown('t_1 = 43082 s')).toBe(`43${THIN}082 s`);
    expect(shown('t_2 = 1e20 s')).toBe(`1.000${THIN}00 × 10²⁰ s`);
    expect(shown('t_3 = 2.5e-9 s')).toBe(`2.500${THIN}00 ns`);
  });

  it('gives a large mass in kilograms with a power of ten, never Qg (common practice)', () => {
    expect(shown('M_1 = 5.972e24 kg')).toBe(`5.972${THIN}00 × 10²⁴ kg`);
  });

  it('keeps a prefix the author wrote', () => {
    expect(shown('L_6 = 3e9 km')).toBe('3 × 10⁹ km');
  });
});
