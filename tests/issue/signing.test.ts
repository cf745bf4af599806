// The organisation's embedded PDF signature: PAdES baseline (ETSI EN 319 142-1, SubFilter
// ETSI.CAdES.detached) made by our CMS signer through @signpdf, checked by poppler's pdfsig (an
// independent implementation) and by our own verifier, and refused by both once a byte changes.
// pdfsig exits 0 even on a digest mismatch, so its text is read (poppler's documented output).
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import forge from 'node-forge';
import { PDFDocument } from 'pdf-lib';
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import {
  checkDerBudget,
  CONTAINER_TOO_COMPLEX,
  CONTAINER_TOO_LARGE,
  SIGNATURE_BUDGET,
  verifyPdfSignature,
} from '../../lib/issue/cades';
import { signingIdentity } from '../../lib/issue/identity';
import { signPdf } from '../../lib/issue/sign-pdf';
import { derSequenceOfNulls, pdfWithSignatureContents } from '../support/hostile-pdf';

const folder = mkdtempSync(path.join(tmpdir(), 'ws-sign-'));
let signed: Buffer;

function pdfsig(bytes: Buffer): string {
  const file = path.join(folder, `f${Math.random().toString(36).slice(2)}.pdf`);
  writeFileSync(file, bytes);
  return execFileSync('pdfsig', [file], { encoding: 'utf8' });
}

beforeAll(async () => {
  process.env.WORLDSHEET_KEY_FOLDER = path.join(folder, 'keys');
  const doc = await PDFDocument.create();
  doc.addPage().drawText('TPT2-CALC-0001 revision A', { x: 50, y: 700 });
  signed = await signPdf(await doc.save(), {
    reason: 'Issued',
    location: 'Tarnmoor',
    contactInfo: 'document.control@kestrelwick.example',
    name: 'Kestrelwick Beam Systems Ltd',
    signingTime: new Date('2026-12-02T10:00:00Z'),
  });
});

describe('the embedded signature', () => {
  it('is reported valid by pdfsig, covering the total document, as ETSI.CAdES.detached with SHA-256', () => {
    const out = pdfsig(signed);
    expect(out).toContain('Signature Type: ETSI.CAdES.detached');
    expect(out).toContain('Signing Hash Algorithm: SHA-256');
    expect(out).toContain('Total document signed');
    expect(out).toContain('Signature Validation: Signature is Valid.');
    expect(out).toContain('Signer Certificate Common Name: Kestrelwick Beam Systems Ltd document control (test)');
  });

  it('is verified by our own verifier with the organisation\u2019s certificate', () => {
    const check = verifyPdfSignature(signed);
    expect(check).toMatchObject({
      valid: true,
      coversWholeFile: true,
      subFilter: 'ETSI.CAdES.detached',
      signerOrganisation: 'Kestrelwick Beam Systems Ltd',
      problem: null,
    });
    expect(check.certificateSha256).toBe(signingIdentity().certificateSha256);
  });

  it('carries the signing-certificate-v2 attribute and no signing-time attribute (PAdES B-B)', () => {
    const der = readContents(signed);
    // OID 1.2.840.113549.1.9.16.2.47 (id-aa-signingCertificateV2, RFC 5035) and 1.2.840.113549.1.9.5 (signingTime).
    expect(der.includes(Buffer.from('060b2a864886f70d010910022f', 'hex'))).toBe(true);
    expect(der.includes(Buffer.from('06092a864886f70d010905', 'hex'))).toBe(false);
  });

  it('is refused by both once one byte of the signed ranges changes', () => {
    const tampered = Buffer.from(signed);
    const at = signed.indexOf('TPT2') > 0 ? signed.indexOf('/Type /Page') : 400;
    tampered[at + 1] ^= 0x01;
    expect(pdfsig(tampered)).not.toContain('Signature is Valid.');
    expect(verifyPdfSignature(tampered)).toMatchObject({
      valid: false,
      problem: 'The file was changed after it was signed: its digest no longer matches the signature.',
    });
  });

  it('says when there is no signature at all, or bytes were appended after it', async () => {
    const plain = Buffer.from(await (await PDFDocument.create()).save());
    expect(verifyPdfSignature(plain)).toMatchObject({
      valid: false,
      problem: 'The file carries no digital signature.',
    });
    const appended = Buffer.concat([signed, Buffer.from('\n% appended\n')]);
    expect(verifyPdfSignature(appended)).toMatchObject({ valid: true, coversWholeFile: false });
    expect(pdfsig(appended)).not.toContain('Total document signed');
  });

  it('makes the local test identity once and reuses it', () => {
    expect(readFileSync(path.join(folder, 'keys', 'README.txt'), 'utf8')).toMatch(/TEST certificate authority/);
    expect(signingIdentity().source).toMatch(/local test certificate authority/);
  });
});

describe('the signature container budget (checked before anything parses it)', () => {
  afterEach(() => vi.restoreAllMocks());

  it('holds the product\u2019s own signature with room to spare', () => {
    const budget = checkDerBudget(readContents(signed));
    expect(budget).toMatchObject({ ok: true });
    // A SignerInfo and a chain of two certificates: about 2.5 KiB and 150 elements.
    if (budget.ok) {
      expect(budget.bytes).toBeLessThan(SIGNATURE_BUDGET.maxDerBytes / 8);
      expect(budget.elements).toBeLessThan(SIGNATURE_BUDGET.maxElements / 8);
    }
  });

  it('refuses one DER sequence of 4.5 million elements as too large, without calling asn1.fromDer', () => {
    const fromDer = vi.spyOn(forge.asn1, 'fromDer');
    const hostile = pdfWithSignatureContents(derSequenceOfNulls(4_500_000));
    expect(hostile.length).toBeGreaterThan(18_000_000);
    expect(verifyPdfSignature(hostile)).toMatchObject({
      valid: false,
      refused: 'too-large',
      problem: CONTAINER_TOO_LARGE,
      subFilter: 'ETSI.CAdES.detached',
    });
    expect(CONTAINER_TOO_LARGE).toMatch(/^Not an authentic issued revision: signature container too large/);
    expect(fromDer).not.toHaveBeenCalled();
  });

  it('refuses a container within the size cap but of too many elements as too complex, without calling asn1.fromDer', () => {
    const der = derSequenceOfNulls(20_000);
    expect(der.length).toBeLessThan(SIGNATURE_BUDGET.maxDerBytes);
    expect(checkDerBudget(der)).toEqual({ ok: false, refused: 'too-complex' });
    const fromDer = vi.spyOn(forge.asn1, 'fromDer');
    expect(verifyPdfSignature(pdfWithSignatureContents(der))).toMatchObject({
      valid: false,
      refused: 'too-complex',
      problem: CONTAINER_TOO_COMPLEX,
    });
    expect(CONTAINER_TOO_COMPLEX).toMatch(/^Not an authentic issued revision: signature container too complex/);
    expect(fromDer).not.toHaveBeenCalled();
  });

  it('refuses deep nesting and lengths that overrun their parent as it walks', () => {
    // 70 nested SEQUENCEs, each holding the next: deeper than the budget's 64.
    let nested = Buffer.from([0x05, 0x00]);
    for (let i = 0; i < 70; i++)
      nested = Buffer.concat([
        Buffer.from([0x30, ...(nested.length < 128 ? [nested.length] : [0x81, nested.length])]),
        nested,
      ]);
    expect(checkDerBudget(nested)).toEqual({ ok: false, refused: 'too-complex' });
    expect(checkDerBudget(Buffer.from([0x30, 0x04, 0x04, 0x05, 0x00, 0x00]))).toEqual({
      ok: false,
      refused: 'malformed',
    });
    expect(checkDerBudget(Buffer.from([0x30, 0x80, 0x05, 0x00, 0x00, 0x00]))).toEqual({
      ok: false,
      refused: 'malformed',
    });
    expect(checkDerBudget(Buffer.from([0x30, 0x02, 0x05, 0x00]))).toEqual({ ok: true, bytes: 4, elements: 2 });
  });

  it('reads a genuine container placed in the same wrapper (the wrapper is a fair test)', () => {
    const wrapped = pdfWithSignatureContents(readContents(signed));
    // Its digest cannot match (other bytes are signed), but the container is read and parsed.
    expect(verifyPdfSignature(wrapped)).toMatchObject({
      valid: false,
      refused: null,
      problem: 'The file was changed after it was signed: its digest no longer matches the signature.',
      signerOrganisation: 'Kestrelwick Beam Systems Ltd',
    });
  });
});

function readContents(pdf: Buffer): Buffer {
  const text = pdf.toString('latin1');
  const m = /\/Contents\s*<([0-9A-Fa-f]+)>/.exec(text)!;
  return Buffer.from(m[1], 'hex');
}
