// The stamped copy of a superseded or withdrawn revision, as an incremental update (ISO 32000-1
// §7.5.6): the issued file stays a byte-identical prefix, so its signature still verifies; the
// update appends the stamp (new content streams drawn over every page), a second signature field
// and a new cross-reference section with /Prev, and is signed by the document-control key (CAdES
// detached, as the original) over the whole file. pdf-lib is used only to build the new and changed
// objects; they are written here, after the original bytes, never by pdf-lib's whole-file writer.
import { createHash } from 'node:crypto';
import { pdflibAddPlaceholder } from '@signpdf/placeholder-pdf-lib';
import signpdfModule from '@signpdf/signpdf';
import { SUBFILTER_ETSI_CADES_DETACHED } from '@signpdf/utils';
import {
  beginMarkedContent,
  degrees,
  endMarkedContent,
  PDFArray,
  PDFDict,
  PDFDocument,
  PDFName,
  PDFNumber,
  type PDFObject,
  type PDFPage,
  PDFRef,
  PDFString,
  rgb,
  StandardFonts,
} from 'pdf-lib';
import { CadesSigner } from './cades';
import { signingIdentity } from './identity';

const signpdf = (signpdfModule as unknown as { default?: typeof signpdfModule }).default ?? signpdfModule;

/** Where render.tsx draws the fields a stamp overlays (kept in step with its constants). */
const STAMP_LAYOUT = {
  marginX: 15 * (72 / 25.4),
  titleBlockBottom: 16,
  titleBlockRows: [25, 28, 22],
  titleBlockBorder: 1.25,
  /** The named destination render.tsx puts on this revision's status in the revision history. */
  revisionStatusDestination: 'revision-history-this-status',
};

function bytesOf(obj: PDFObject): Buffer {
  const b = new Uint8Array(obj.sizeInBytes());
  obj.copyBytesInto(b, 0);
  return Buffer.from(b);
}

const ascii = (s: string) => s.replace(/[\u2010-\u2015]/g, '-').replace(/[^\x20-\x7e]/g, '?');

/** The page and point (PDF user space) of a named destination, from the catalog's /Names /Dests tree. */
function namedDestination(doc: PDFDocument, name: string): { page: PDFPage; x: number; y: number } | null {
  const names = doc.catalog.lookupMaybe(PDFName.of('Names'), PDFDict);
  const dests = names?.lookupMaybe(PDFName.of('Dests'), PDFDict);
  if (!dests) return null;
  const visit = (node: PDFDict, depth: number): PDFArray | null => {
    if (depth > 8) return null;
    const pairs = node.lookupMaybe(PDFName.of('Names'), PDFArray);
    if (pairs) {
      for (let i = 0; i + 1 < pairs.size(); i += 2) {
        const key = pairs.lookup(i);
        if (key instanceof PDFString && key.decodeText() === name) {
          const value = pairs.lookup(i + 1);
          if (value instanceof PDFArray) return value;
          if (value instanceof PDFDict) return value.lookupMaybe(PDFName.of('D'), PDFArray) ?? null;
        }
      }
    }
    const kids = node.lookupMaybe(PDFName.of('Kids'), PDFArray);
    for (let i = 0; kids && i < kids.size(); i++) {
      const found = visit(kids.lookup(i, PDFDict), depth + 1);
      if (found) return found;
    }
    return null;
  };
  const dest = visit(dests, 0);
  if (!dest) return null;
  const pageRef = dest.get(0);
  const page = doc.getPages().find((p) => pageRef instanceof PDFRef && p.ref === pageRef);
  const x = dest.lookup(2);
  const y = dest.lookup(3);
  if (!page || !(x instanceof PDFNumber) || !(y instanceof PDFNumber)) return null;
  return { page, x: x.asNumber(), y: y.asNumber() };
}

function revisionStatusPlace(doc: PDFDocument): { page: PDFPage; x: number; y: number } | null {
  const name = STAMP_LAYOUT.revisionStatusDestination;
  const parts = [`${name}-table`, `${name}-row`, `${name}-cell`, name].map((n) => namedDestination(doc, n));
  if (parts.some((p) => !p)) return null;
  const [table, , , text] = parts as Array<{ page: PDFPage; x: number; y: number }>;
  const height = table.page.getHeight();
  const x = parts.reduce((sum, p) => sum + p!.x, 0);
  const top = parts.reduce((sum, p) => sum + (height - p!.y), 0);
  // A table split across pages would put its parts on different pages: no overlay then.
  if (parts.some((p) => p!.page !== text.page)) return null;
  return { page: text.page, x, y: height - top };
}

export interface StampText {
  /** 'SUPERSEDED' or 'WITHDRAWN'. */
  status: 'superseded' | 'withdrawn';
  /** One line: what replaced it or why it was withdrawn, and when. */
  headline: string;
  note: string;
  signingTime: Date;
}

/** Draws the stamp on every page of the loaded document (pdf-lib adds new content streams). */
async function drawStamp(doc: PDFDocument, stamp: StampText) {
  const bold = await doc.embedFont(StandardFonts.HelveticaBold);
  const regular = await doc.embedFont(StandardFonts.Helvetica);
  const red = rgb(0.66, 0.05, 0.05);
  const white = rgb(1, 1, 1);
  const word = stamp.status.toUpperCase();
  const L = STAMP_LAYOUT;
  // The issued PDF is tagged (lib/issue/pdf/structure.tsx): everything the stamp draws is marked as
  // an artifact, outside the structure tree the issued signature covers (the status it states is the
  // verification page's answer and the title block's overlay).
  for (const page of doc.getPages()) {
    const { width, height } = page.getSize();
    page.pushOperators(beginMarkedContent('Artifact'));
    // A band in the left margin, reading upwards: clear of the running head (top 40 pt) and the
    // content (which starts at the margin).
    const band = ascii(`${stamp.headline}. ${stamp.note}`);
    const bandSize = Math.min(9, (height - 150) / Math.max(1, bold.widthOfTextAtSize(band, 1)));
    page.drawRectangle({
      x: 9,
      y: 110,
      width: 20,
      height: height - 160,
      borderColor: red,
      borderWidth: 1.5,
      color: white,
      opacity: 0.95,
    });
    page.drawText(band, { x: 23, y: 116, size: bandSize, font: bold, color: red, rotate: degrees(90) });
    // The watermark across the page, translucent so the content stays legible.
    page.drawText(word, {
      x: width / 2 - 170,
      y: height / 2 - 90,
      size: 64,
      font: bold,
      color: red,
      opacity: 0.16,
      rotate: degrees(35),
    });
    // The title block's "Document status" field (top row, last 15 %), value area below its label.
    const inner = width - 2 * L.marginX - 2 * L.titleBlockBorder;
    const rowTop =
      L.titleBlockBottom + L.titleBlockBorder + L.titleBlockRows[2] + L.titleBlockRows[1] + L.titleBlockRows[0];
    const fieldX = L.marginX + L.titleBlockBorder + inner * 0.85 + 1;
    page.drawRectangle({
      x: fieldX,
      y: rowTop - L.titleBlockRows[0] + 1.2,
      width: inner * 0.15 - 1.5,
      height: L.titleBlockRows[0] - 9.5,
      color: white,
      borderColor: red,
      borderWidth: 1,
    });
    page.drawText(word, {
      x: fieldX + 2.5,
      y: rowTop - 19.5,
      size: Math.min(9, (inner * 0.15 - 7) / bold.widthOfTextAtSize(word, 1)),
      font: bold,
      color: red,
    });
    // Under the title block: what the stamp is.
    page.drawText(ascii(`Stamped copy, not for use: ${stamp.headline}`).slice(0, 150), {
      x: L.marginX,
      y: 5,
      size: 6.5,
      font: regular,
      color: red,
    });
    page.pushOperators(endMarkedContent());
  }
  // The revision history's status for this revision ("current" in the original). react-pdf writes
  // each destination as its box's offset from its parent's box (x, and page height − y), so the
  // table's, the row's, the cell's and the text's offsets add up to the text's place on the page.
  const at = revisionStatusPlace(doc);
  if (at) {
    const columnWidth = (at.page.getWidth() - 2 * L.marginX) * 0.14 - 8;
    at.page.pushOperators(beginMarkedContent('Artifact'));
    at.page.drawRectangle({
      x: at.x - 1.5,
      y: at.y - 11.5,
      width: columnWidth,
      height: 12.5,
      color: white,
      borderColor: red,
      borderWidth: 0.8,
    });
    at.page.drawText(word.toLowerCase(), { x: at.x, y: at.y - 8.5, size: 8.5, font: bold, color: red });
    at.page.pushOperators(endMarkedContent());
  }
}

/** Appends the objects that differ from the original as an incremental update; returns the whole file. */
function appendUpdate(original: Buffer, doc: PDFDocument, before: Map<string, Buffer>): Buffer {
  const tail = original.subarray(Math.max(0, original.length - 1024)).toString('latin1');
  const m = /startxref\s+(\d+)\s+%%EOF\s*$/.exec(tail);
  if (!m) throw new Error('The issued PDF has no final startxref; it cannot be updated incrementally.');
  const prev = Number(m[1]);
  const parts: Buffer[] = [original, Buffer.from('\n', 'latin1')];
  let offset = original.length + 1;
  const entries: Array<{ num: number; gen: number; offset: number }> = [];
  const objects = doc.context.enumerateIndirectObjects().sort((a, b) => a[0].objectNumber - b[0].objectNumber);
  for (const [ref, obj] of objects) {
    const body = bytesOf(obj);
    const old = before.get(ref.tag);
    if (old && old.equals(body)) continue;
    const head = Buffer.from(`${ref.objectNumber} ${ref.generationNumber} obj\n`, 'latin1');
    const chunk = Buffer.concat([head, body, Buffer.from('\nendobj\n', 'latin1')]);
    entries.push({ num: ref.objectNumber, gen: ref.generationNumber, offset });
    parts.push(chunk);
    offset += chunk.length;
  }
  const xrefAt = offset;
  let xref = 'xref\n';
  for (let i = 0; i < entries.length;) {
    let j = i;
    while (j + 1 < entries.length && entries[j + 1].num === entries[j].num + 1) j++;
    xref += `${entries[i].num} ${j - i + 1}\n`;
    for (let k = i; k <= j; k++)
      xref += `${String(entries[k].offset).padStart(10, '0')} ${String(entries[k].gen).padStart(5, '0')} n\r\n`;
    i = j + 1;
  }
  const t = doc.context.trailerInfo;
  const trailer = doc.context.obj({
    Size: doc.context.largestObjectNumber + 1,
    Root: t.Root,
    ...(t.Info ? { Info: t.Info } : {}),
    ...(t.ID ? { ID: t.ID } : {}),
    Prev: prev,
  });
  parts.push(
    Buffer.from(`${xref}trailer\n`, 'latin1'),
    bytesOf(trailer),
    Buffer.from(`\nstartxref\n${xrefAt}\n%%EOF\n`, 'latin1'),
  );
  return Buffer.concat(parts);
}

/**
 * The stamped copy: the original bytes, then an update that draws the stamp and carries the
 * document-control signature over the whole file.
 */
export async function stampIssuedPdf(original: Uint8Array, stamp: StampText): Promise<Buffer> {
  const originalBytes = Buffer.from(original);
  const doc = await PDFDocument.load(originalBytes, { updateMetadata: false });
  const before = new Map<string, Buffer>();
  for (const [ref, obj] of doc.context.enumerateIndirectObjects()) before.set(ref.tag, bytesOf(obj));
  await drawStamp(doc, stamp);
  pdflibAddPlaceholder({
    pdfDoc: doc,
    reason: `Stamped ${stamp.status}: ${ascii(stamp.headline)}`,
    contactInfo: 'Document control',
    name: 'Document control',
    location: 'Worldsheet register',
    signingTime: stamp.signingTime,
    subFilter: SUBFILTER_ETSI_CADES_DETACHED,
    signatureLength: 16_384,
  });
  // The placeholder names its field Signature1, as the original's: the stamp's field gets its own name.
  const fields = doc.catalog.lookup(PDFName.of('AcroForm'), PDFDict).lookup(PDFName.of('Fields'), PDFArray);
  fields.lookup(fields.size() - 1, PDFDict).set(PDFName.of('T'), PDFString.of(`Stamp ${stamp.status}`));
  await doc.flush();
  const withPlaceholder = appendUpdate(originalBytes, doc, before);
  const signed = await signpdf.sign(withPlaceholder, new CadesSigner(signingIdentity()));
  if (!signed.subarray(0, originalBytes.length).equals(originalBytes))
    throw new Error('The stamped copy does not keep the issued file as its prefix.');
  return signed;
}

/**
 * The earlier revisions of a file, as the byte lengths where an update ends (after %%EOF and its
 * end-of-line), last first, at most `limit`; the whole file is not among them.
 */
export function earlierRevisionLengths(bytes: Buffer, limit = 8): number[] {
  const out: number[] = [];
  let at = bytes.lastIndexOf('%%EOF', bytes.length - 6, 'latin1');
  while (at > 0 && out.length < limit) {
    let end = at + 5;
    if (bytes[end] === 0x0d) end++;
    if (bytes[end] === 0x0a) end++;
    if (end < bytes.length) {
      out.push(end);
      if (end !== at + 5) out.push(at + 5);
    }
    at = bytes.lastIndexOf('%%EOF', at - 1, 'latin1');
  }
  return out;
}

export const sha256Hex = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');
