// Shaping a run of text (fontkit's `font.layout`: the font's cmap, then its OpenType substitutions
// and positioning) is the largest single cost of react-pdf's text layout, and an issued sheet
// shapes the same strings again and again: the labels, headings and table heads of every page, and
// every statement's source and result a revision shares with the one before it. Shaping is a pure
// function of the font and its arguments, so each face's layout is kept per process, keyed by
// them, and every call gets its own copy of the positions (pdfkit scales a run's positions in
// place when it encodes text itself) and of the glyph list; the glyph objects were shared already
// (fontkit keeps one per glyph id).
import { Font } from '@react-pdf/renderer';

interface Position {
  xAdvance: number;
  yAdvance: number;
  xOffset: number;
  yOffset: number;
}
interface GlyphRun {
  glyphs: unknown[];
  positions: Position[];
}
type Layout = (
  string: unknown,
  features?: unknown,
  script?: unknown,
  language?: unknown,
  direction?: unknown,
) => GlyphRun;

// Entries kept per face before the oldest half is dropped; a 200-cell sheet shapes a few thousand
// distinct runs per face.
const LIMIT = 20_000;

function copy(run: GlyphRun): GlyphRun {
  const out = Object.assign(Object.create(Object.getPrototypeOf(run) as object) as GlyphRun, run);
  out.glyphs = run.glyphs.slice();
  out.positions = run.positions.map((p) =>
    Object.assign(Object.create(Object.getPrototypeOf(p) as object) as Position, p),
  );
  return out;
}

const wrapped = new WeakSet<object>();

function keepLayouts(font: { layout: Layout }): void {
  if (wrapped.has(font)) return;
  wrapped.add(font);
  const layout = font.layout;
  const kept = new Map<string, GlyphRun>();
  font.layout = function (this: unknown, string, features, script, language, direction) {
    // Only strings and plain feature lists make a key; anything else is shaped as it comes.
    if (typeof string !== 'string' || (features != null && !Array.isArray(features) && typeof features !== 'string'))
      return layout.call(this, string, features, script, language, direction);
    const key = JSON.stringify([string, features ?? null, script ?? null, language ?? null, direction ?? null]);
    let run = kept.get(key);
    if (!run) {
      run = layout.call(this, string, features, script, language, direction);
      if (kept.size >= LIMIT) {
        let drop = LIMIT / 2;
        for (const k of kept.keys()) {
          if (drop-- <= 0) break;
          kept.delete(k);
        }
      }
      kept.set(key, run);
    }
    return copy(run);
  };
}

/** Loads the faces of `families` (once per process) and keeps each one's shaped runs. */
export async function keepTextLayouts(families: string[]): Promise<void> {
  const registered = Font.getRegisteredFonts() as unknown as Record<
    string,
    { sources: Array<{ load(): Promise<void>; data: unknown }> }
  >;
  for (const family of families) {
    for (const source of registered[family]?.sources ?? []) {
      await source.load();
      const data = source.data as { layout?: Layout } | null;
      if (data && typeof data.layout === 'function') keepLayouts(data as { layout: Layout });
    }
  }
}
