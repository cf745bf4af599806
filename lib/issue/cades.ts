// CMS signatures for PDF (PAdES baseline B-B, ETSI EN 319 142-1, SubFilter ETSI.CAdES.detached):
// a detached SignedData (RFC 5652) over the PDF's byte ranges, whose signed attributes are the
// content type, the message digest and the ESS signing-certificate-v2 (RFC 5035) that binds the
// signer's certificate; no signing-time attribute (PAdES puts the time in the signature dictionary's
// /M entry). Built with node-forge's ASN.1 and signed with Node's crypto. Also the verification of
// such a signature, used by the verification page.
import { createHash, createPublicKey, createSign, createVerify } from 'node:crypto';
import forge from 'node-forge';
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
      seq([oid(OID.signingCertificateV2), set([seq([seq([seq([octets(createHash('sha256').update(signerDer).digest())])])])])]),
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
      asn1.create(asn1.Class.CONTEXT_SPECIFIC, 0, true, certs.map((c) => pki.certificateToAsn1(c))),
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
}

const SIGNATURE_BYTE_RANGE = /\/ByteRange\s*\[\s*(\d+)\s+(\d+)\s+(\d+)\s+(\d+)\s*\]/g;

/**
 * Checks the last embedded signature of a PDF: its byte ranges, the message digest in its signed
 * attributes against the bytes, and the RSA signature over the attributes with the embedded
 * certificate. Trust in that certificate is decided by the caller (it compares certificateSha256).
 */
export function verifyPdfSignature(pdf: Buffer): PdfSignatureCheck {
  const none = (problem: string): PdfSignatureCheck => ({ valid: false, coversWholeFile: false, subFilter: null, signerName: null, signerOrganisation: null, certificateSha256: null, problem });
  const text = pdf.toString('latin1');
  const ranges = [...text.matchAll(SIGNATURE_BYTE_RANGE)];
  if (ranges.length === 0) return none('The file carries no digital signature.');
  const m = ranges[ranges.length - 1];
  const [a, b, c, d] = m.slice(1, 5).map(Number);
  if (a !== 0 || b <= 0 || c <= b || c + d > pdf.length) return none('The signature\u2019s byte ranges do not fit the file.');
  const coversWholeFile = c + d === pdf.length;
  const hex = text.slice(b, c).replace(/^</, '').replace(/>$/, '');
  const subFilter = /\/SubFilter\s*\/([A-Za-z0-9.]+)/.exec(text.slice(Math.max(0, m.index - 2000), m.index + 200))?.[1] ?? null;
  try {
    // The /Contents string is padded with zeros after the DER; read only what the DER says.
    const cms = asn1.fromDer(forge.util.hexToBytes(hex.length % 2 ? `${hex}0` : hex), { strict: false, parseAllBytes: false } as never);
    const signedData = (cms.value as forge.asn1.Asn1[])[1].value as forge.asn1.Asn1[];
    const sd = (signedData[0].value as forge.asn1.Asn1[]);
    const certsNode = sd.find((n) => n.tagClass === asn1.Class.CONTEXT_SPECIFIC && n.type === 0);
    const signerInfos = sd[sd.length - 1].value as forge.asn1.Asn1[];
    const si = signerInfos[0].value as forge.asn1.Asn1[];
    const attrsNode = si.find((n) => n.tagClass === asn1.Class.CONTEXT_SPECIFIC && n.type === 0)!;
    const signatureValue = Buffer.from(si[si.length - 1].value as string, 'binary');
    const certs = ((certsNode?.value as forge.asn1.Asn1[]) ?? []).map((n) => pki.certificateFromAsn1(n));
    if (certs.length === 0) return { ...none('The signature carries no certificate.'), subFilter, coversWholeFile };
    // The signer is the certificate whose serial number the SignerInfo names.
    const sid = si[1].value as forge.asn1.Asn1[];
    const serial = forge.util.bytesToHex(sid[1].value as string).replace(/^00/, '');
    const signer = certs.find((x) => x.serialNumber.replace(/^00/, '') === serial) ?? certs[0];
    const signerDer = der(pki.certificateToAsn1(signer));
    const info = {
      subFilter,
      coversWholeFile,
      signerName: (signer.subject.getField('CN')?.value as string | undefined) ?? null,
      signerOrganisation: (signer.subject.getField('O')?.value as string | undefined) ?? null,
      certificateSha256: createHash('sha256').update(signerDer).digest('hex'),
    };
    const attrs = attrsNode.value as forge.asn1.Asn1[];
    const digestAttr = attrs.find((x) => asn1.derToOid((x.value as forge.asn1.Asn1[])[0].value as string) === OID.messageDigest);
    if (!digestAttr) return { ...info, valid: false, problem: 'The signature has no message digest.' };
    const recorded = Buffer.from(((digestAttr.value as forge.asn1.Asn1[])[1].value as forge.asn1.Asn1[])[0].value as string, 'binary');
    const actual = createHash('sha256').update(pdf.subarray(a, a + b)).update(pdf.subarray(c, c + d)).digest();
    if (!recorded.equals(actual)) return { ...info, valid: false, problem: 'The file was changed after it was signed: its digest no longer matches the signature.' };
    const asSet = der(set(attrs));
    const publicKey = createPublicKey(pki.publicKeyToPem(signer.publicKey));
    const ok = createVerify('sha256').update(asSet).verify(publicKey, signatureValue);
    return { ...info, valid: ok, problem: ok ? null : 'The signature value does not verify with the certificate it carries.' };
  } catch (error) {
    if (process.env.WORLDSHEET_DEBUG_SIGNATURES) console.error(error);
    return { ...none('The signature cannot be read.'), coversWholeFile };
  }
}
