// WCAG 2.2 success criterion 1.4.3 (contrast, minimum): 4.5:1 for text, 3:1 for large text and
// (1.4.11) for user-interface components. Relative luminance and contrast ratio as defined in the
// WCAG 2.2 glossary ("relative luminance", "contrast ratio").
import { describe, expect, it } from 'vitest';
import { tokens } from '../../tailwind.config';

function luminance(hex: string): number {
  const [r, g, b] = [1, 3, 5]
    .map((i) => parseInt(hex.slice(i, i + 2), 16) / 255)
    .map((c) => (c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4));
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

export function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (hi + 0.05) / (lo + 0.05);
}

describe('the formula', () => {
  it('gives 21:1 for black on white and 1:1 for a colour on itself (WCAG 2.2 definition)', () => {
    expect(contrast('#000000', '#ffffff')).toBeCloseTo(21, 10);
    expect(contrast('#0b5a61', '#0b5a61')).toBe(1);
  });
  it('gives 4.48:1 for #777777 on white, just short of AA (WebAIM contrast checker example, from memory)', () => {
    expect(contrast('#777777', '#ffffff')).toBeCloseTo(4.48, 2);
  });
});

const TEXT_PAIRS: Array<[keyof typeof tokens, keyof typeof tokens]> = [
  ['ink', 'paper'],
  ['ink', 'surface'],
  ['ink-muted', 'paper'],
  ['ink-muted', 'surface'],
  ['accent', 'paper'],
  ['accent', 'surface'],
  ['surface', 'accent'],
  ['surface', 'accent-hover'],
  ['accent-hover', 'accent-soft'],
  ['pass', 'pass-soft'],
  ['fail', 'fail-soft'],
  ['caution', 'caution-soft'],
  ['ink', 'caution-soft'],
];

const COMPONENT_PAIRS: Array<[keyof typeof tokens, keyof typeof tokens]> = [
  ['rule-strong', 'surface'],
  ['rule-strong', 'paper'],
  ['focus', 'surface'],
  ['focus', 'paper'],
  ['caution-rule', 'surface'],
];

describe('Worldsheet colour tokens', () => {
  it.each(TEXT_PAIRS)('%s on %s reaches 4.5:1', (fg, bg) => {
    expect(contrast(tokens[fg], tokens[bg])).toBeGreaterThanOrEqual(4.5);
  });
  it.each(COMPONENT_PAIRS)('%s against %s reaches 3:1 for borders and focus rings', (fg, bg) => {
    expect(contrast(tokens[fg], tokens[bg])).toBeGreaterThanOrEqual(3);
  });
});
