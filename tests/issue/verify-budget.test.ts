// Verification is open to anyone, so what it costs the server is bounded: a signature container
// beyond the size or element budget is refused unread (413 with a plain message), the container
// of any other file is parsed in a worker thread (never on the server's main thread, which keeps
// answering /api/health and everyone else), and each client address has a verification rate
// limit kept in PostgreSQL (one upsert, so concurrent requests and several app instances count
// against the same window).
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import forge from 'node-forge';
import { PDFDocument } from 'pdf-lib';
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { AppError, errorResponse } from '../../lib/errors/app-error';
import { verifyPdfFile } from '../../lib/issue/verification';
import { getSignatureParser } from '../../lib/issue/signature-parser';
import { signPdf } from '../../lib/issue/sign-pdf';
import { countVerification } from '../../lib/issue/verify-rate-limit';
import { testDb } from '../support/database';
import { derSequenceOfNulls, pdfWithSignatureContents } from '../support/hostile-pdf';
import { refusal } from '../support/refusal';

process.env.WORLDSHEET_KEY_FOLDER ??= path.join(mkdtempSync(path.join(tmpdir(), 'ws-verify-')), 'keys');

let signed: Buffer;
beforeAll(async () => {
  const doc = await PDFDocument.create();
  doc.addPage().drawText('TPT2-CALC-0009 revision A (never issued)', { x: 50, y: 700 });
  signed = await signPdf(await doc.save(), {
    reason: 'Issued',
    location: 'Tarnmoor',
    contactInfo: 'document.control@kestrelwick.example',
    name: 'Kestrelwick Beam Systems Ltd',
    signingTime: new Date('2026-12-02T10:00:00Z'),
  });
});

afterEach(() => vi.restoreAllMocks());

describe('verifying a PDF', () => {
  it('refuses a PDF whose signature holds one DER sequence of 4.5 million elements (413, not read)', async () => {
    const fromDer = vi.spyOn(forge.asn1, 'fromDer');
    const parsedBefore = getSignatureParser().parsed;
    const error = await refusal(verifyPdfFile(testDb(), pdfWithSignatureContents(derSequenceOfNulls(4_500_000))));
    expect(error.status).toBe(413);
    expect(error.message).toMatch(
      /^Not an authentic issued revision: signature container too large \(more than 64 KiB/,
    );
    expect(fromDer).not.toHaveBeenCalled();
    expect(getSignatureParser().parsed).toBe(parsedBefore);
  });

  it('refuses a container of too many small elements within the size cap (413, not read)', async () => {
    const error = await refusal(verifyPdfFile(testDb(), pdfWithSignatureContents(derSequenceOfNulls(20_000))));
    expect(error.status).toBe(413);
    expect(error.message).toMatch(/^Not an authentic issued revision: signature container too complex/);
  });

  it('parses a genuine signature in the worker thread, not on the main thread', async () => {
    // Structural: the main thread's asn1.fromDer is never called, and the worker counts the parse.
    const fromDer = vi.spyOn(forge.asn1, 'fromDer');
    const parsedBefore = getSignatureParser().parsed;
    const answer = await verifyPdfFile(testDb(), signed);
    expect(answer.checks).toMatchObject({ signatureValid: true, signedByOrganisation: true, hashInRegister: false });
    expect(answer.summary).toMatch(/It carries our signature but is not a file we issued as it is\.$/);
    expect(fromDer).not.toHaveBeenCalled();
    expect(getSignatureParser().parsed).toBe(parsedBefore + 1);
  });
});

describe('the verification rate limit per address', () => {
  const limit = { requests: 3, windowSeconds: 60 };

  it('answers 429 with Retry-After once an address has used up its window; other addresses go on', async () => {
    for (let i = 0; i < 3; i++) await countVerification(testDb(), '192.0.2.7', limit);
    const error = await refusal(countVerification(testDb(), '192.0.2.7', limit));
    expect(error).toBeInstanceOf(AppError);
    expect(error.status).toBe(429);
    expect(error.message).toMatch(
      /^Too many verifications from your address: at most 3 per 60 s\. Try again in \d+ s\.$/,
    );
    expect(error.retryAfterSeconds).toBeGreaterThanOrEqual(1);
    expect(error.retryAfterSeconds).toBeLessThanOrEqual(60);
    const response = errorResponse(error);
    expect(response.status).toBe(429);
    expect(Number(response.headers.get('retry-after'))).toBe(error.retryAfterSeconds);
    await countVerification(testDb(), '198.51.100.20', limit);
  });

  it('counts concurrent requests atomically: of 12 at once, exactly 3 pass', async () => {
    const outcomes = await Promise.allSettled(
      Array.from({ length: 12 }, () => countVerification(testDb(), '203.0.113.9', limit)),
    );
    expect(outcomes.filter((o) => o.status === 'fulfilled')).toHaveLength(3);
    expect(outcomes.filter((o) => o.status === 'rejected' && (o.reason as AppError).status === 429)).toHaveLength(9);
  });

  it('starts a new window once the old one has ended', async () => {
    for (let i = 0; i < 3; i++) await countVerification(testDb(), '192.0.2.8', limit);
    await testDb()
      .updateTable('verify_rate_limits')
      .set({ window_started_at: new Date(Date.now() - 61_000) })
      .where('address', '=', '192.0.2.8')
      .execute();
    await countVerification(testDb(), '192.0.2.8', limit);
    const row = await testDb()
      .selectFrom('verify_rate_limits')
      .select('requests')
      .where('address', '=', '192.0.2.8')
      .executeTakeFirstOrThrow();
    expect(row.requests).toBe(1);
  });
});
