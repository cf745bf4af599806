// Verification, for anyone: whether an uploaded file is an authentic issued revision (by its
// SHA-256 in the register, its embedded signature and the signing certificate; a stamped copy by
// the issued file it begins with), or which revision a typed verification code names, and where
// that revision stands (current, superseded, withdrawn).
import { createHash } from 'node:crypto';
import type { Kysely } from 'kysely';
import { z } from 'zod';
import type { Database } from '@/db/schema';
import { AppError } from '@/lib/errors/app-error';
import { earlierRevisionLengths, sha256Hex } from './stamp';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { getSignatureParser } from './signature-parser';
import { normaliseVerificationCode } from './codes';
import { signingIdentity } from './identity';

export const verifyCodeSchema = z.object({ code: z.string().min(1).max(40) });

/** Largest file the verification page reads. */
export const MAX_VERIFY_BYTES = 30 * 1024 * 1024;

export interface VerificationAnswer {
  authentic: boolean;
  /** One sentence for the page. */
  summary: string;
  revision: null | {
    sheet: string;
    title: string;
    revision: string;
    status: 'current' | 'superseded' | 'withdrawn';
    issuedAt: string;
    versionNumber: number;
    versionSha256: string;
    pdfSha256: string;
    supersededBy: string | null;
    withdrawnReason: string | null;
    legalOwner: string;
  };
  /** What was checked, for the reader. */
  checks: {
    hashInRegister: boolean;
    signatureValid: boolean | null;
    signedByOrganisation: boolean | null;
    stampedCopy: boolean;
  };
  sha256: string | null;
}

async function describeRevision(
  db: Kysely<Database>,
  where: { pdfSha256?: string; stampedSha256?: string; code?: string },
) {
  let q = db
    .selectFrom('revisions as r')
    .innerJoin('sheets as s', 's.id', 'r.sheet_id')
    .innerJoin('projects as p', 'p.id', 'r.project_id')
    .leftJoin('revisions as n', 'n.id', 'r.superseded_by')
    .select([
      'r.code',
      'r.status',
      'r.issued_at',
      'r.version_number',
      'r.version_sha256',
      'r.pdf_sha256',
      'r.withdrawn_reason',
      'n.code as superseded_by',
      's.number',
      's.title',
      'p.code as project_code',
      'p.legal_owner',
    ]);
  if (where.pdfSha256) q = q.where('r.pdf_sha256', '=', where.pdfSha256);
  else if (where.stampedSha256) q = q.where('r.stamped_sha256', '=', where.stampedSha256);
  else q = q.where('r.verification_code', '=', where.code!);
  const r = await q.executeTakeFirst();
  return r
    ? {
        sheet: formatSheetNumber(r.project_code, r.number),
        title: r.title,
        revision: r.code,
        status: r.status,
        issuedAt: new Date(r.issued_at).toISOString(),
        versionNumber: r.version_number,
        versionSha256: r.version_sha256,
        pdfSha256: r.pdf_sha256,
        supersededBy: r.superseded_by,
        withdrawnReason: r.withdrawn_reason,
        legalOwner: r.legal_owner,
      }
    : null;
}

function statusSentence(r: NonNullable<VerificationAnswer['revision']>): string {
  if (r.status === 'current') return `It is the current revision.`;
  if (r.status === 'superseded') return `It is superseded by revision ${r.supersededBy}: do not use it.`;
  return `It is withdrawn (${r.withdrawnReason}): do not use it.`;
}

/**
 * Whether an uploaded file is an authentic issued revision, which one, and where it stands. A file
 * whose signature container is beyond the budget (cades.ts SIGNATURE_BUDGET) or too costly to parse
 * is refused (413) with a message saying so: no issued revision carries one.
 */
export async function verifyPdfFile(db: Kysely<Database>, bytes: Uint8Array): Promise<VerificationAnswer> {
  const empty = { hashInRegister: false, signatureValid: null, signedByOrganisation: null, stampedCopy: false };
  if (bytes.length === 0)
    return { authentic: false, summary: 'The file is empty.', revision: null, checks: empty, sha256: null };
  const buffer = Buffer.from(bytes);
  const sha256 = createHash('sha256').update(buffer).digest('hex');
  if (!buffer.subarray(0, 1024).toString('latin1').includes('%PDF-')) {
    return {
      authentic: false,
      summary: 'This file is not a PDF, so it is not a revision issued by Worldsheet.',
      revision: null,
      checks: empty,
      sha256,
    };
  }
  // Parsed in a worker thread, after the container's size and element count are checked here.
  const signature = await getSignatureParser().verifyPdf(buffer);
  if (signature.refused) throw new AppError('too_large', signature.problem!);
  const signedByOrganisation = signature.certificateSha256
    ? signature.certificateSha256 === signingIdentity().certificateSha256
    : null;
  const checks = {
    hashInRegister: false,
    signatureValid: signature.certificateSha256 ? signature.valid && signature.coversWholeFile : false,
    signedByOrganisation,
    stampedCopy: false,
  };
  const revision = await describeRevision(db, { pdfSha256: sha256 });
  if (revision) {
    checks.hashInRegister = true;
    const authentic = checks.signatureValid === true && signedByOrganisation === true;
    return {
      authentic,
      summary: authentic
        ? `Authentic: this is ${revision.sheet} revision ${revision.revision}, issued ${revision.issuedAt.slice(0, 10)}. ${statusSentence(revision)}`
        : `The file is in the register as ${revision.sheet} revision ${revision.revision}, but its embedded signature does not verify (${signature.problem ?? 'not signed by the organisation'}).`,
      revision,
      checks,
      sha256,
    };
  }
  // A stamped copy: the issued file, byte for byte, then an update signed by document control.
  for (const length of earlierRevisionLengths(buffer)) {
    const prefix = buffer.subarray(0, length);
    const issued = await describeRevision(db, { pdfSha256: sha256Hex(prefix) });
    if (!issued) continue;
    const inner = await getSignatureParser().verifyPdf(prefix);
    const originalValid =
      inner.valid && inner.coversWholeFile && inner.certificateSha256 === signingIdentity().certificateSha256;
    const stampValid = checks.signatureValid === true && signedByOrganisation === true;
    const copyChecks = { ...checks, hashInRegister: true, stampedCopy: true };
    if (originalValid && stampValid) {
      // What the stamp says (its signature's /Reason, covered by that signature); the revision may have moved on since.
      const stampedAs =
        /\/Reason\s*\(Stamped (superseded|withdrawn)/.exec(buffer.subarray(length).toString('latin1'))?.[1] ??
        issued.status;
      return {
        authentic: true,
        summary: `Authentic stamped copy: this is ${issued.sheet} revision ${issued.revision} (issued ${issued.issuedAt.slice(0, 10)}), stamped "${stampedAs}" and signed by document control; the issued file inside it is byte for byte the one in the register. ${statusSentence(issued)}`,
        revision: issued,
        checks: copyChecks,
        sha256,
      };
    }
    return {
      authentic: false,
      summary: `The file begins with ${issued.sheet} revision ${issued.revision} as issued, but what was added after it is not a stamp signed by document control (${stampValid ? 'the issued signature does not verify' : (signature.problem ?? 'its last signature is not the organisation\u2019s')}).`,
      revision: issued,
      checks: { ...copyChecks, stampedCopy: false },
      sha256,
    };
  }
  const stamped = await describeRevision(db, { stampedSha256: sha256 });
  if (stamped) {
    return {
      authentic: false,
      summary: `This is a copy of ${stamped.sheet} revision ${stamped.revision} stamped "${stamped.status}" by Worldsheet; it is not the issued original. ${statusSentence(stamped)}`,
      revision: stamped,
      checks: { ...checks, stampedCopy: true },
      sha256,
    };
  }
  const why =
    checks.signatureValid && signedByOrganisation
      ? 'It carries our signature but is not a file we issued as it is.'
      : signature.problem
        ? `Its signature: ${signature.problem}`
        : 'Its signature is not the organisation\u2019s.';
  return {
    authentic: false,
    summary: `Not an issued revision: no revision in the register has this file's SHA-256. ${why}`,
    revision: null,
    checks,
    sha256,
  };
}

export async function verifyCode(db: Kysely<Database>, input: string): Promise<VerificationAnswer> {
  const code = normaliseVerificationCode(input);
  const none = { hashInRegister: false, signatureValid: null, signedByOrganisation: null, stampedCopy: false };
  if (!code)
    return {
      authentic: false,
      summary:
        'A verification code has 12 letters and digits in three groups of four joined by hyphens, as printed in the title block of the PDF.',
      revision: null,
      checks: none,
      sha256: null,
    };
  const revision = await describeRevision(db, { code });
  if (!revision)
    return {
      authentic: false,
      summary: `No issued revision has the verification code ${code}.`,
      revision: null,
      checks: none,
      sha256: null,
    };
  return {
    authentic: true,
    summary: `${code} is ${revision.sheet} revision ${revision.revision}, issued ${revision.issuedAt.slice(0, 10)}. ${statusSentence(revision)} Compare the PDF's SHA-256 with ${revision.pdfSha256}, or upload the file to check it.`,
    revision,
    checks: { ...none, hashInRegister: true },
    sha256: null,
  };
}
