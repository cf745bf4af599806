// Embeds the organisation's signature in a PDF: a signature field and placeholder added with
// pdf-lib (@signpdf/placeholder-pdf-lib), then @signpdf computes the byte ranges and asks the CAdES
// signer for the CMS. The signing time is the signature dictionary's /M entry (PAdES B-B).
import { pdflibAddPlaceholder } from '@signpdf/placeholder-pdf-lib';
import signpdfModule from '@signpdf/signpdf';
import { SUBFILTER_ETSI_CADES_DETACHED } from '@signpdf/utils';
import { ParseSpeeds, PDFDocument } from 'pdf-lib';
import { CadesSigner } from './cades';
import { signingIdentity } from './identity';

const signpdf = (signpdfModule as unknown as { default?: typeof signpdfModule }).default ?? signpdfModule;

export async function signPdf(
  pdf: Uint8Array,
  details: { reason: string; location: string; contactInfo: string; name: string; signingTime: Date },
): Promise<Buffer> {
  // pdf-lib yields to the event loop (a setTimeout) every 100 objects parsed and every 50 written
  // by default; an issued PDF has thousands of objects (glyph forms, the structure tree), so that
  // was most of the signing time (a 200-cell sheet: about 230 ms of 290). Parsed and written in one
  // go, the bytes are the same.
  const doc = await PDFDocument.load(pdf, { updateMetadata: false, parseSpeed: ParseSpeeds.Fastest });
  pdflibAddPlaceholder({
    pdfDoc: doc,
    reason: details.reason,
    contactInfo: details.contactInfo,
    name: details.name,
    location: details.location,
    signingTime: details.signingTime,
    subFilter: SUBFILTER_ETSI_CADES_DETACHED,
    signatureLength: 16_384,
  });
  const withPlaceholder = Buffer.from(await doc.save({ useObjectStreams: false, objectsPerTick: Infinity }));
  return signpdf.sign(withPlaceholder, new CadesSigner(signingIdentity()));
}
