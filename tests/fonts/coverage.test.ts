// The shipped faces must draw every character a calculation note uses, in the app and in the PDF.
import { statSync } from 'node:fs';
import path from 'node:path';
import * as fontkit from 'fontkit';
import { expect, it } from 'vitest';

const files = [
  'source-sans-3/SourceSans3-Regular.ttf',
  'source-sans-3/SourceSans3-Italic.ttf',
  'source-sans-3/SourceSans3-SemiBold.ttf',
  'source-sans-3/SourceSans3-Bold.ttf',
  'noto-sans-mono/NotoSansMono-Regular.ttf',
  'noto-sans-mono/NotoSansMono-Bold.ttf',
];

// Greek for quantities, relations and arrows for criteria, signs, superscripts for units (m⁻¹, s²),
// micro, the reduced Planck constant as ħ.
const REQUIRED = 'αβγδεθλμνπρστφχψωΓΔΘΛΠΣΦΨΩ≤≥≠≈→←−±×·÷√∞′″°⁰¹²³⁴⁵⁶⁷⁸⁹⁻⁺µħ';

it.each(files)('%s covers Greek, ≤ → − ± and superscripts', (file) => {
  const font = fontkit.openSync(path.join(process.cwd(), 'fonts', file)) as fontkit.Font;
  const missing = [...REQUIRED].filter((ch) => !font.hasGlyphForCodePoint(ch.codePointAt(0)!));
  expect(missing).toEqual([]);
});

// The browser gets the same faces as WOFF2 (app/fonts.ts), compressed from these TTF files with
// wawoff2 (fonts/README.md): the same glyphs, the same advances, about a quarter of the bytes.
it.each(files)('%s has a WOFF2 twin drawing the same glyphs at a fraction of the size', (file) => {
  const ttfPath = path.join(process.cwd(), 'fonts', file);
  const woff2Path = ttfPath.replace(/\.ttf$/, '.woff2');
  const ttf = fontkit.openSync(ttfPath) as fontkit.Font;
  const woff2 = fontkit.openSync(woff2Path) as fontkit.Font;
  expect(woff2.type).toBe('WOFF2');
  expect(woff2.postscriptName).toBe(ttf.postscriptName);
  expect(woff2.numGlyphs).toBe(ttf.numGlyphs);
  for (const ch of `${REQUIRED}AZaz09`) {
    const a = ttf.glyphForCodePoint(ch.codePointAt(0)!);
    const b = woff2.glyphForCodePoint(ch.codePointAt(0)!);
    expect([b.id, b.advanceWidth, b.path.commands.length], ch).toEqual([a.id, a.advanceWidth, a.path.commands.length]);
  }
  expect(statSync(woff2Path).size).toBeLessThan(statSync(ttfPath).size * 0.4);
});
