// The shipped faces must draw every character a calculation note uses, in the app and in the PDF.
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
