// "Sheet n of m" in the title block, drawn without a second pagination.
//
// react-pdf can print the page count only through a render prop, and any render prop makes its
// pagination run twice over the whole document (once to count the pages, once for real): about
// 30 % of rendering a 200-cell sheet. Here the title block's sheet field is a Canvas that writes
// "Sheet n of " on each page as it is drawn (n is the page pdfkit is drawing) and then draws one form
// XObject (ISO 32000-1 §8.10) holding the count. The form is written when pdfkit ends the document,
// once every page is drawn and the count is known, and before the fonts are embedded, so the
// count's glyphs are in the subset and in its ToUnicode map (the text reads "Sheet 3 of 62").
// If a page was drawn without its number, or pdfkit's document is not the one this module patches,
// the rendering fails rather than print a wrong count.
import path from 'node:path';
import { Canvas } from '@react-pdf/renderer';
import PDFDocument from 'pdfkit';
import type { ReactElement } from 'react';
import { drawDirect } from './structure';

const FACE = path.join('fonts', 'source-sans-3', 'SourceSans3-Bold.ttf');

// The slice of pdfkit used here (its EmbeddedFont, refs, pages).
interface PdfRef {
  end(data?: string): void;
}
interface PdfFont {
  id: string;
  font: { ascent: number; unitsPerEm: number };
  encode(text: string): [string[], Array<{ xAdvance: number; advanceWidth: number }>];
  ref(): PdfRef;
}
interface Doc {
  _font: PdfFont;
  _root: { data: { Pages: { data: { Count: number } } } };
  page: { fonts: Record<string, PdfRef>; xobjects: Record<string, PdfRef> };
  font(src: string, size?: number): Doc;
  ref(data: Record<string, unknown>): PdfRef;
  save(): Doc;
  restore(): Doc;
  fillColor(color: string): Doc;
  addContent(data: string): Doc;
  end(): void;
}

interface Pending {
  form: PdfRef;
  font: PdfFont;
  size: number;
  drawn: number;
}

const pending = new WeakMap<Doc, Pending>();
const FORM = 'Wsheets';

function num(n: number): string {
  const r = Math.round(n * 1000) / 1000;
  return r === 0 ? '0' : String(r);
}

/** The TJ operand drawing `text` in `font` with its kerning, and its width in points at `size`. */
function glyphRun(font: PdfFont, text: string, size: number): { tj: string; width: number } {
  const [encoded, positions] = font.encode(text);
  const parts: string[] = [];
  let advance = 0;
  encoded.forEach((hex, i) => {
    parts.push(`<${hex}>`);
    const adjust = positions[i].advanceWidth - positions[i].xAdvance;
    if (Math.abs(adjust) > 1e-9) parts.push(num(adjust));
    advance += positions[i].xAdvance;
  });
  return { tj: `[${parts.join(' ')}] TJ`, width: (advance * size) / 1000 };
}

let installed = false;

/** Teaches pdfkit's end to write the count into each document's form first. Idempotent. */
function install(): void {
  if (installed) return;
  installed = true;
  const proto = (PDFDocument as unknown as { prototype: Doc }).prototype;
  const end = proto.end;
  proto.end = function (this: Doc) {
    const p = pending.get(this);
    if (p) {
      const count = this._root.data.Pages.data.Count;
      if (p.drawn !== count)
        throw new Error(`PDF drawing: ${p.drawn} of ${count} pages were given their sheet number.`);
      p.form.end(`BT /${p.font.id} ${num(p.size)} Tf 0 0 Td ${glyphRun(p.font, String(count), p.size).tj} ET`);
      pending.delete(this);
    }
    return end.call(this);
  };
}

function drawSheetNumber(doc: Doc, size: number, ink: string): void {
  let p = pending.get(doc);
  if (!p) {
    // The face react-pdf registered from the same file: pdfkit finds it by its PostScript name and
    // keeps one embedded subset.
    const font = doc.font(path.join(/* turbopackIgnore: true */ process.cwd(), FACE))._font;
    const form = doc.ref({
      Type: 'XObject',
      Subtype: 'Form',
      BBox: [0, -size, size * 8, size * 1.5],
      Resources: { Font: { [font.id]: font.ref() } },
    });
    p = { form, font, size, drawn: 0 };
    pending.set(doc, p);
  }
  p.drawn += 1;
  const { font } = p;
  const sheet = doc._root.data.Pages.data.Count;
  const baseline = (font.font.ascent / font.font.unitsPerEm) * size;
  const label = glyphRun(font, `Sheet ${sheet} of `, size);
  doc.page.fonts[font.id] = font.ref();
  doc.page.xobjects[FORM] = p.form;
  doc.save();
  doc.fillColor(ink);
  // y runs down here: each text matrix and the form's placement flip it back.
  doc.addContent(`BT 1 0 0 -1 0 ${num(baseline)} Tm /${font.id} ${num(size)} Tf ${label.tj} ET`);
  doc.addContent(`q 1 0 0 -1 ${num(label.width)} ${num(baseline)} cm /${FORM} Do Q`);
  doc.restore();
}

/** "Sheet n of m" in the bold text face at `size` points, as one line the width of its box. */
export function SheetNumber({ size, ink }: { size: number; ink: string }): ReactElement {
  install();
  return (
    <Canvas
      style={{ width: '100%', height: size * 1.26 }}
      paint={(painter) => {
        drawDirect(painter, (doc) => drawSheetNumber(doc as Doc, size, ink));
        return null;
      }}
    />
  );
}
