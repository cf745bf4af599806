// CMS signatures for PDF (PAdES baseline B-B, ETSI EN 319 142-1, SubFilter ETSI.CAdES.detached):
// a detached SignedData (RFC 5652) over the PDF's byte ranges, whose signed attributes are the
// content type, the message digest and the ESS signing-certificate-v2 (RFC 5035) that binds the
// signer's certificate; no signing-time attribute (PAdES puts the time in the signature dictionary's
// /M entry). Built with node-forge's ASN.1 and signed with Node's crypto. Also the verification of
// such a signature, used by the verification page: the container is located and its size and
// element count checked here without parsing it; the parse itself runs in a worker thread
// (signature-parser.ts) with a time and memory limit.
import { createHash, createPublicKey, createSign, createVerify } from 'node:crypto';
import forge from 'node-forge';
import { config } from '../config';
import { Signer } from '@signpdf/utils';

const { asn1, pki } = forge;
const C = asn1.Class.UNIVERSAL;
const T = asn1.Type;

const OID = {
  data: '1.2.840.113549.1.7.1',
  signedData: '1.2.840.113549.1.7.2',
  contentType: '1.2.840.113549.1.9.3',
  messageDigest: '1.2.840.113549.1.9.4',
  signingCertificateV2: '1.2.840.113549.1.9.16.2.47',
  sha256: '2.16.840.1.101.3.4.2.1',
  rsaEncryption: '1.2.840.113549.1.1.1',
  sha256WithRSA: '1.2.840.113549.1.1.11',
};

const oid = (o: string) => asn1.create(C, T.OID, false, asn1.oidToDer(o).getBytes());
const seq = (items: forge.asn1.Asn1[]) => asn1.create(C, T.SEQUENCE, true, items);
const set = (items: forge.asn1.Asn1[]) => asn1.create(C, T.SET, true, items);
const octets = (bytes: Buffer) => asn1.create(C, T.OCTETSTRING, false, bytes.toString('binary'));
const int = (n: number) => asn1.create(C, T.INTEGER, false, asn1.integerToDer(n).getBytes());
const der = (node: forge.asn1.Asn1) => Buffer.from(asn1.toDer(node).getBytes(), 'binary');
const algorithm = (o: string) => seq([oid(o), asn1.create(C, T.NULL, false, '')]);

/** DER orders the members of a SET OF by their encodings (X.690 §11.6). */
function derSetOf(items: forge.asn1.Asn1[]): forge.asn1.Asn1 {
  const sorted = items.map((i) => ({ i, d: der(i) })).sort((a, b) => Buffer.compare(a.d, b.d));
  return set(sorted.map((x) => x.i));
}

function serialInteger(hex: string): forge.asn1.Asn1 {
  let bytes = forge.util.hexToBytes(hex.length % 2 ? `0${hex}` : hex);
  if (bytes.charCodeAt(0) & 0x80) bytes = `\x00${bytes}`;
  return asn1.create(C, T.INTEGER, false, bytes);
}

export interface SigningIdentity {
  /** PEM of the private key (PKCS#8 or PKCS#1, RSA). */
  keyPem: string;
  /** PEM of the signer's certificate, then its chain (issuer first). */
  certificatePems: string[];
}

/** Signs a PDF's byte ranges as @signpdf asks of a signer: returns the DER of the CMS ContentInfo. */
export class CadesSigner extends Signer {
  constructor(private readonly identity: SigningIdentity) {
    super();
  }

  async sign(pdfBuffer: Buffer): Promise<Buffer> {
    const certs = this.identity.certificatePems.map((p) => pki.certificateFromPem(p));
    const signer = certs[0];
    const signerDer = der(pki.certificateToAsn1(signer));
    const attributes = [
      seq([oid(OID.contentType), set([oid(OID.data)])]),
      seq([oid(OID.messageDigest), set([octets(createHash('sha256').update(pdfBuffer).digest())])]),
      // SigningCertificateV2 ::= SEQUENCE { certs SEQUENCE OF ESSCertIDv2 }; ESSCertIDv2 with the
      // default hash algorithm (SHA-256) left out, as DER requires.
      seq([
        oid(OID.signingCertificateV2),
        set([seq([seq([seq([octets(createHash('sha256').update(signerDer).digest())])])])]),
      ]),
    ];
    const signedAttrs = derSetOf(attributes);
    const signature = createSign('sha256').update(der(signedAttrs)).sign(this.identity.keyPem);
    // In the SignerInfo the same attributes are tagged [0] IMPLICIT.
    const taggedAttrs = asn1.create(asn1.Class.CONTEXT_SPECIFIC, 0, true, signedAttrs.value as forge.asn1.Asn1[]);
    const signerInfo = seq([
      int(1),
      seq([pki.distinguishedNameToAsn1(signer.issuer), serialInteger(signer.serialNumber)]),
      algorithm(OID.sha256),
      taggedAttrs,
      algorithm(OID.sha256WithRSA),
      octets(signature),
    ]);
    const signedData = seq([
      int(1),
      set([algorithm(OID.sha256)]),
      seq([oid(OID.data)]),
      asn1.create(
        asn1.Class.CONTEXT_SPECIFIC,
        0,
        true,
        certs.map((c) => pki.certificateToAsn1(c)),
      ),
      set([signerInfo]),
    ]);
    return der(seq([oid(OID.signedData), asn1.create(asn1.Class.CONTEXT_SPECIFIC, 0, true, [signedData])]));
  }
}

export interface PdfSignatureCheck {
  /** The signature verifies over its byte ranges with the certificate it carries. */
  valid: boolean;
  /** The byte ranges cover the whole file but the signature value itself. */
  coversWholeFile: boolean;
  subFilter: string | null;
  signerName: string | null;
  signerOrganisation: string | null;
  /** SHA-256 of the signer's certificate (to compare with the organisation's). */
  certificateSha256: string | null;
  /** Why it is not valid, for the verification page. */
  problem: string | null;
  /**
   * Set when the signature container was not parsed at all because it is beyond the budget below
   * (too many bytes or ASN.1 elements) or its parse exceeded the worker's time or memory: such a file
   * is not an issued revision, and the caller refuses it (413) rather than answering about it.
   */
  refused: 'too-large' | 'too-complex' | null;
}

/**
 * The budget of a signature container (the CMS SignedData in /Contents). The product's own is about
 * 2.5 KiB of DER with some 150 ASN.1 elements (a SignerInfo and a chain of two certificates), in a
 * 16 KiB placeholder; a PAdES signature with a chain of five certificates and a timestamp token stays
 * under 20 KiB and 1,500 elements. Anything beyond these caps is refused before it is parsed.
 */
export const SIGNATURE_BUDGET = {
  /** DER bytes of the container (the /Contents hex string may be at most twice this, plus padding slack). */
  maxDerBytes: 64 * 1024,
  /** TLV headers (elements) in the container, counted without building objects. */
  maxElements: 4096,
  /** Nesting depth of constructed elements. */
  maxDepth: 64,
} as const;

const SIGNATURE_BYTE_RANGE = /\/ByteRange\s*\[\s*(\d+)\s+(\d+)\s+(\d+)\s+(\d+)\s*\]/g;

export const CONTAINER_TOO_LARGE = `Not an authentic issued revision: signature container too large (more than ${SIGNATURE_BUDGET.maxDerBytes / 1024} KiB; an issued revision's signature is a few KiB), so it was not read.`;
export const CONTAINER_TOO_COMPLEX = `Not an authentic issued revision: signature container too complex (more than ${SIGNATURE_BUDGET.maxElements.toLocaleString('en')} ASN.1 elements, nested deeper than ${SIGNATURE_BUDGET.maxDepth}, or beyond the time and memory allowed to read it), so it was not read.`;

export type DerBudgetAnswer =
  { ok: true; bytes: number; elements: number } | { ok: false; refused: 'too-large' | 'too-complex' | 'malformed' };

/**
 * Walks the DER of one element and everything inside it, counting TLV headers without building any
 * object, and refuses as soon as the budget is passed: the cost is bounded by the budget, not by what
 * the file claims. Bytes after the element (the placeholder's zero padding) are not read.
 */
export function checkDerBudget(
  bytes: Uint8Array,
  budget: { maxDerBytes: number; maxElements: number; maxDepth: number } = SIGNATURE_BUDGET,
): DerBudgetAnswer {
  let pos = 0;
  let elements = 0;
  // End offsets of the constructed elements we are inside.
  const ends: number[] = [];
  let outerEnd = -1;
  do {
    const limit = ends.length ? ends[ends.length - 1] : bytes.length;
    if (pos + 2 > limit) return { ok: false, refused: 'malformed' };
    const tag = bytes[pos++];
    if ((tag & 0x1f) === 0x1f) {
      // High tag number form: base-128 digits, the last without bit 8; a certificate never needs more than 4.
      let digits = 0;
      while (pos < limit && bytes[pos] & 0x80) {
        pos++;
        if (++digits > 4) return { ok: false, refused: 'malformed' };
      }
      pos++;
    }
    if (pos >= limit) return { ok: false, refused: 'malformed' };
    let length = bytes[pos++];
    if (length & 0x80) {
      const n = length & 0x7f;
      // Indefinite length (n = 0) is BER, not DER; more than 3 length bytes is beyond any budget.
      if (n === 0) return { ok: false, refused: 'malformed' };
      if (n > 3) return { ok: false, refused: 'too-large' };
      if (pos + n > limit) return { ok: false, refused: 'malformed' };
      length = 0;
      for (let i = 0; i < n; i++) length = length * 256 + bytes[pos++];
    }
    const end = pos + length;
    if (outerEnd < 0) {
      if (end > budget.maxDerBytes) return { ok: false, refused: 'too-large' };
      outerEnd = end;
    }
    if (end > limit) return { ok: false, refused: 'malformed' };
    if (++elements > budget.maxElements) return { ok: false, refused: 'too-complex' };
    if (tag & 0x20) {
      if (ends.length >= budget.maxDepth) return { ok: false, refused: 'too-complex' };
      ends.push(end);
    } else {
      pos = end;
    }
    while (ends.length && pos === ends[ends.length - 1]) ends.pop();
  } while (ends.length > 0);
  return { ok: true, bytes: outerEnd, elements };
}

/** Where a PDF's last signature is, read from the file's text without parsing the container. */
export type LocatedSignature =
  | {
      ok: true;
      ranges: [number, number, number, number];
      coversWholeFile: boolean;
      subFilter: string | null;
      der: Buffer;
    }
  | { ok: false; check: PdfSignatureCheck };

const noSignature = (problem: string, extra: Partial<PdfSignatureCheck> = {}): PdfSignatureCheck => ({
  valid: false,
  coversWholeFile: false,
  subFilter: null,
  signerName: null,
  signerOrganisation: null,
  certificateSha256: null,
  problem,
  refused: null,
  ...extra,
});

/**
 * Finds the last embedded signature of a PDF: its byte ranges and its /Contents, decoded only when
 * the hex string is within the budget, and walked (checkDerBudget) before anything parses it.
 */
export function locateSignature(pdf: Buffer): LocatedSignature {
  const text = pdf.toString('latin1');
  const ranges = [...text.matchAll(SIGNATURE_BYTE_RANGE)];
  if (ranges.length === 0) return { ok: false, check: noSignature('The file carries no digital signature.') };
  const m = ranges[ranges.length - 1];
  const [a, b, c, d] = m.slice(1, 5).map(Number);
  if (a !== 0 || b <= 0 || c <= b || c + d > pdf.length)
    return { ok: false, check: noSignature('The signature\u2019s byte ranges do not fit the file.') };
  const coversWholeFile = c + d === pdf.length;
  const subFilter =
    /\/SubFilter\s*\/([A-Za-z0-9.]+)/.exec(text.slice(Math.max(0, m.index - 2000), m.index + 200))?.[1] ?? null;
  // The /Contents string between the ranges: <hex>, padded with zeros after the DER. A placeholder
  // may be larger than the DER it holds, but not more than twice the DER budget (four times in hex
  // digits) plus the brackets: anything longer is refused before a byte of it is decoded.
  if (c - b > 4 * SIGNATURE_BUDGET.maxDerBytes + 2)
    return { ok: false, check: noSignature(CONTAINER_TOO_LARGE, { coversWholeFile, subFilter, refused: 'too-large' }) };
  const hex = text.slice(b, c).replace(/^</, '').replace(/>$/, '');
  if (!/^[0-9A-Fa-f]*$/.test(hex))
    return { ok: false, check: noSignature('The signature cannot be read.', { coversWholeFile, subFilter }) };
  const der = Buffer.from(hex.length % 2 ? `${hex}0` : hex, 'hex');
  const budget = checkDerBudget(der);
  if (!budget.ok) {
    if (budget.refused === 'malformed')
      return { ok: false, check: noSignature('The signature cannot be read.', { coversWholeFile, subFilter }) };
    return {
      ok: false,
      check: noSignature(budget.refused === 'too-large' ? CONTAINER_TOO_LARGE : CONTAINER_TOO_COMPLEX, {
        coversWholeFile,
        subFilter,
        refused: budget.refused,
      }),
    };
  }
  return { ok: true, ranges: [a, b, c, d], coversWholeFile, subFilter, der: der.subarray(0, budget.bytes) };
}

/** SHA-256 of the bytes a signature's ranges cover. */
export function signedRangesDigest(pdf: Buffer, [a, b, c, d]: [number, number, number, number]): Buffer {
  return createHash('sha256')
    .update(pdf.subarray(a, a + b))
    .update(pdf.subarray(c, c + d))
    .digest();
}

/** What parsing the container found: all of a PdfSignatureCheck but what locateSignature reads. */
export type SignedDataCheck = Omit<PdfSignatureCheck, 'coversWholeFile' | 'subFilter' | 'refused'>;

/**
 * Parses a CMS SignedData already within the budget (checkDerBudget) and checks it against the
 * digest of the signed byte ranges: the message digest in its signed attributes, and the RSA
 * signature over the attributes with the embedded certificate. The server runs this in a worker
 * thread (signature-parser.ts), never on its main thread.
 */
export function verifySignedData(derBytes: Uint8Array, digest: Uint8Array): SignedDataCheck {
  const none = (problem: string): SignedDataCheck => ({
    valid: false,
    signerName: null,
    signerOrganisation: null,
    certificateSha256: null,
    problem,
  });
  try {
    const cms = asn1.fromDer(forge.util.createBuffer(Buffer.from(derBytes).toString('binary')), {
      strict: false,
      parseAllBytes: false,
    } as never);
    const signedData = (cms.value as forge.asn1.Asn1[])[1].value as forge.asn1.Asn1[];
    const sd = signedData[0].value as forge.asn1.Asn1[];
    const certsNode = sd.find((n) => n.tagClass === asn1.Class.CONTEXT_SPECIFIC && n.type === 0);
    const signerInfos = sd[sd.length - 1].value as forge.asn1.Asn1[];
    const si = signerInfos[0].value as forge.asn1.Asn1[];
    const attrsNode = si.find((n) => n.tagClass === asn1.Class.CONTEXT_SPECIFIC && n.type === 0)!;
    const signatureValue = Buffer.from(si[si.length - 1].value as string, 'binary');
    const certs = ((certsNode?.value as forge.asn1.Asn1[]) ?? []).map((n) => pki.certificateFromAsn1(n));
    if (certs.length === 0) return none('The signature carries no certificate.');
    // The signer is the certificate whose serial number the SignerInfo names.
    const sid = si[1].value as forge.asn1.Asn1[];
    const serial = forge.util.bytesToHex(sid[1].value as string).replace(/^00/, '');
    const signer = certs.find((x) => x.serialNumber.replace(/^00/, '') === serial) ?? certs[0];
    const signerDer = der(pki.certificateToAsn1(signer));
    const info = {
      signerName: (signer.subject.getField('CN')?.value as string | undefined) ?? null,
      signerOrganisation: (signer.subject.getField('O')?.value as string | undefined) ?? null,
      certificateSha256: createHash('sha256').update(signerDer).digest('hex'),
    };
    const attrs = attrsNode.value as forge.asn1.Asn1[];
    const digestAttr = attrs.find(
      (x) => asn1.derToOid((x.value as forge.asn1.Asn1[])[0].value as string) === OID.messageDigest,
    );
    if (!digestAttr) return { ...info, valid: false, problem: 'The signature has no message digest.' };
    const recorded = Buffer.from(
      ((digestAttr.value as forge.asn1.Asn1[])[1].value as forge.asn1.Asn1[])[0].value as string,
      'binary',
    );
    if (!recorded.equals(Buffer.from(digest)))
      return {
        ...info,
        valid: false,
        problem: 'The file was changed after it was signed: its digest no longer matches the signature.',
      };
    const asSet = der(set(attrs));
    const publicKey = createPublicKey(pki.publicKeyToPem(signer.publicKey));
    const ok = createVerify('sha256').update(asSet).verify(publicKey, signatureValue);
    return {
      ...info,
      valid: ok,
      problem: ok ? null : 'The signature value does not verify with the certificate it carries.',
    };
  } catch (error) {
    if (config().WORLDSHEET_DEBUG_SIGNATURES) console.error(error);
    return none('The signature cannot be read.');
  }
}

/**
 * Checks the last embedded signature of a PDF in this thread: its byte ranges, the container's
 * budget, then the SignedData (verifySignedData). Trust in the certificate is decided by the caller
 * (it compares certificateSha256). The server uses verifyPdfSignatureOffThread instead.
 */
export function verifyPdfSignature(pdf: Buffer): PdfSignatureCheck {
  const located = locateSignature(pdf);
  if (!located.ok) return located.check;
  const checked = verifySignedData(located.der, signedRangesDigest(pdf, located.ranges));
  return { ...checked, coversWholeFile: located.coversWholeFile, subFilter: located.subFilter, refused: null };
}
