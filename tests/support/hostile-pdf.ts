// PDFs whose signature field holds a container of our choosing, for the verification budget tests:
// a well-formed PDF (catalog, page, signature field and dictionary, cross-reference table) whose
// /ByteRange covers the file but the /Contents string, as a signed PDF's does.

/** DER of one SEQUENCE of `count` NULL elements (05 00): 2 bytes each, the shape of the reported attack. */
export function derSequenceOfNulls(count: number): Buffer {
  const content = Buffer.alloc(2 * count);
  for (let i = 0; i < content.length; i += 2) content[i] = 0x05;
  const n = content.length;
  const length =
    n < 0x80
      ? Buffer.from([n])
      : (() => {
          const bytes: number[] = [];
          for (let v = n; v > 0; v = Math.floor(v / 256)) bytes.unshift(v % 256);
          return Buffer.from([0x80 | bytes.length, ...bytes]);
        })();
  return Buffer.concat([Buffer.from([0x30]), length, content]);
}

/** A PDF whose (only) signature's /Contents is `der` as hex, with byte ranges that fit the file. */
export function pdfWithSignatureContents(der: Buffer): Buffer {
  const objects = [
    '<< /Type /Catalog /Pages 2 0 R /AcroForm << /Fields [4 0 R] /SigFlags 3 >> >>',
    '<< /Type /Pages /Kids [3 0 R] /Count 1 >>',
    '<< /Type /Page /Parent 2 0 R /MediaBox [0 0 595 842] /Annots [4 0 R] >>',
    '<< /Type /Annot /Subtype /Widget /FT /Sig /Rect [0 0 0 0] /T (Signature1) /F 4 /P 3 0 R /V 5 0 R >>',
  ];
  let text = '%PDF-1.7\n%\u00e2\u00e3\u00cf\u00d3\n';
  const offsets: number[] = [];
  for (const [i, o] of objects.entries()) {
    offsets.push(text.length);
    text += `${i + 1} 0 obj\n${o}\nendobj\n`;
  }
  offsets.push(text.length);
  // Fixed-width numbers, so the ranges can be written once the positions are known.
  const width = 10;
  const placeholder = `/ByteRange [0 ${'0'.repeat(width)} ${'0'.repeat(width)} ${'0'.repeat(width)}]`;
  text += `5 0 obj\n<< /Type /Sig /Filter /Adobe.PPKLite /SubFilter /ETSI.CAdES.detached ${placeholder} /Contents `;
  const contentsStart = text.length;
  const contentsEnd = contentsStart + 2 + 2 * der.length;
  let tail = ` /M (D:20261202100000Z) >>\nendobj\n`;
  const xrefAt = contentsEnd + tail.length;
  tail += `xref\n0 6\n0000000000 65535 f \n${offsets.map((o) => `${String(o).padStart(10, '0')} 00000 n \n`).join('')}`;
  tail += `trailer\n<< /Size 6 /Root 1 0 R >>\nstartxref\n${xrefAt}\n%%EOF\n`;
  const total = contentsEnd + tail.length;
  const pad = (n: number) => String(n).padStart(width, '0');
  text = text.replace(
    placeholder,
    `/ByteRange [0 ${pad(contentsStart)} ${pad(contentsEnd)} ${pad(total - contentsEnd)}]`,
  );
  return Buffer.concat([
    Buffer.from(text, 'latin1'),
    Buffer.from('<'),
    Buffer.from(der.toString('hex'), 'latin1'),
    Buffer.from('>'),
    Buffer.from(tail, 'latin1'),
  ]);
}
