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

  it('drops them on axis ticks, where the figures of the data do not apply', () => {
    expect(tickText(0.5)).toBe('0.5');
    expect(tickText(1250)).toBe('1250');
  });

  it('shows results of a sheet with them, as the app, the study tables and the PDF read them', () => {
    const engine = createSheetEngine();
    const r = engine.evaluate([{ id: 'a', kind: 'calc', source: 'E_k = 144.11 MeV\nx_r = 1.9675 m\nb_r = 0.5' }], { significantFigures: 6 });
    const texts = r.cells[0].statements.map((s) => s.value!.text);
    expect(texts).toEqual(['144.110 MeV', `1.967${THIN}50 m`, `0.500${THIN}000`]);
    // The machine value stays at full precision.
    expect(r.cells[0].statements[1].value!.number).toBe(1.9675);
  });
});
