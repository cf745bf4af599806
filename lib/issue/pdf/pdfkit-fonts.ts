// react-pdf sets the face of every run of text it draws with pdfkit's `font(fontkitFont, size)`.
// Given a font object rather than a name, pdfkit 0.20 has nothing to look it up by: each call opens
// a new embedded font (a subset, a glyph looked up) and then finds the one already embedded under
// the same PostScript name by comparing the two fonts' name tables serialised as JSON, thousands of
// times per document (about 5 % of drawing a 200-cell sheet). This remembers, per document, which
// embedded font a font object resolved to, and does on a repeat call exactly what pdfkit's own
// lookup ends in: the same font, size and state, and the same font id count taken, so the file's
// bytes do not change.
import PDFDocument from 'pdfkit';

// The slice of pdfkit's document (its FontsMixin) this module uses.
interface FontDoc {
  font(src: unknown, family?: unknown, size?: unknown): FontDoc;
  fontSize(size: number): FontDoc;
  _font: { name?: string };
  _fontFamilies: Record<string, unknown>;
  _fontCount: number;
  _fontSource: unknown;
  _fontFamily: unknown;
}

const resolved = new WeakMap<FontDoc, WeakMap<object, FontDoc['_font']>>();
let installed = false;

/** Makes pdfkit's font(fontObject) reuse the font it resolved to before in the same document. Idempotent. */
export function installFontReuse(): void {
  if (installed) return;
  installed = true;
  const proto = (PDFDocument as unknown as { prototype: FontDoc }).prototype;
  const font = proto.font;
  proto.font = function (this: FontDoc, src: unknown, family?: unknown, size?: unknown) {
    // Only a font object with no family name (a name is pdfkit's own cache key).
    if (!src || typeof src !== 'object' || (family != null && typeof family !== 'number'))
      return font.call(this, src, family, size);
    let byObject = resolved.get(this);
    if (!byObject) {
      byObject = new WeakMap();
      resolved.set(this, byObject);
    }
    const known = byObject.get(src);
    // pdfkit's lookup ends in the font its name maps to; reused only while that is still so.
    if (!known || !known.name || this._fontFamilies[known.name] !== known) {
      font.call(this, src, family, size);
      const now = this._font;
      if (now.name && this._fontFamilies[now.name] === now) byObject.set(src, now);
      return this;
    }
    if (typeof family === 'number') {
      size = family;
      family = null;
    }
    this._fontSource = src;
    this._fontFamily = family;
    if (size != null) this.fontSize(size as number);
    // pdfkit takes an id (F1, F2 …) for the font it opens before finding it embedded.
    this._fontCount += 1;
    this._font = known;
    return this;
  };
}
