// Uncertainties are written with two significant digits, trailing zeros kept (JCGM 100:2008, 7.2.6).
import { expect, it } from 'vitest';
import { formatSignificantText } from '../../lib/calc/format';
import { combinedText, standardUncertaintyText } from '../../lib/calc/uncertainty-text';
import type { UncertaintyResult } from '../../lib/calc/types';

it('keeps the significant zeros of an uncertainty', () => {
  expect(formatSignificantText(7e-22, 2)).toBe('7.0 × 10⁻²²');
  expect(formatSignificantText(0.0043, 2)).toBe('0.0043');
  expect(formatSignificantText(0.4, 2)).toBe('0.40');
  expect(formatSignificantText(120, 2)).toBe('120');
  expect(formatSignificantText(0.000_099_96, 2)).toBe('1.0 × 10⁻⁴');
  expect(formatSignificantText(1_234_567, 2)).toBe('1.2 × 10⁶');
  expect(formatSignificantText(-0.25, 2)).toBe('−0.25');
});

it('writes the combined and expanded uncertainty with their unit', () => {
  const u: UncertaintyResult = {
    kind: 'propagated',
    u: 3.5e-22,
    U: 7e-22,
    k: 2,
    unit: 'kg m / s',
    text: '',
    tex: '',
    budget: [],
    nonLinear: false,
    monteCarlo: null,
    warning: null,
  };
  expect(combinedText(u)).toBe(
    'combined standard uncertainty u_c = 3.5 × 10⁻²² kg·m/s; expanded uncertainty U = 7.0 × 10⁻²² kg·m/s (k = 2)',
  );
  expect(standardUncertaintyText({ ...u, kind: 'input', u: 0.4, unit: 'MeV' })).toBe(
    'standard uncertainty u = 0.40 MeV',
  );
});
