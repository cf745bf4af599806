// The faces of the issued PDF: the repository's own Source Sans 3 (text) and Noto Sans Mono
// (calculation source, numbers, hashes), embedded as subsets. react-pdf's built-in Helvetica is
// never used: it lacks Greek, ≤, →, − and the superscript digits of units.
import path from 'node:path';
import { Font } from '@react-pdf/renderer';

export const TEXT_FONT = 'Source Sans 3';
export const MONO_FONT = 'Noto Sans Mono';

let registered = false;

/** Registers the faces once per process (react-pdf keeps them in a module-level store). */
export function registerPdfFonts(): void {
  if (registered) return;
  const dir = path.join(process.cwd(), 'fonts');
  Font.register({
    family: TEXT_FONT,
    fonts: [
      { src: path.join(dir, 'source-sans-3/SourceSans3-Regular.ttf'), fontWeight: 400, fontStyle: 'normal' },
      { src: path.join(dir, 'source-sans-3/SourceSans3-Italic.ttf'), fontWeight: 400, fontStyle: 'italic' },
      { src: path.join(dir, 'source-sans-3/SourceSans3-SemiBold.ttf'), fontWeight: 600, fontStyle: 'normal' },
      { src: path.join(dir, 'source-sans-3/SourceSans3-Bold.ttf'), fontWeight: 700, fontStyle: 'normal' },
    ],
  });
  Font.register({
    family: MONO_FONT,
    fonts: [
      { src: path.join(dir, 'noto-sans-mono/NotoSansMono-Regular.ttf'), fontWeight: 400, fontStyle: 'normal' },
      { src: path.join(dir, 'noto-sans-mono/NotoSansMono-Bold.ttf'), fontWeight: 700, fontStyle: 'normal' },
    ],
  });
  // No hyphenation anywhere: an identifier, a unit or a hash broken with an inserted "-" would read
  // as something else, and a copied or searched string would no longer match. Lines break at spaces.
  Font.registerHyphenationCallback((word) => [word]);
  registered = true;
}
