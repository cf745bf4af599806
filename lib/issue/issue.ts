// Issuing: document control turns an approved version into the next revision of its sheet. The
// request checks the approval and the controller's password (the "issued" signature, 21 CFR Part 11
// §11.200) and queues a job; the job renders the PDF, signs it with the organisation's certificate,
// stores it in object storage and then, in one transaction, records the revision, supersedes the
// previous one, records the signature and queues the e-mails. Each step is resumable: the PDF of
// a job is stored under the job's own key, so a job run again after a crash reuses it, and the
// final transaction happens once (all or nothing).
import { createHash } from 'node:crypto';
import { sql, type Kysely, type Transaction } from 'kysely';
import { z } from 'zod';
import { INT4_MAX } from '@/lib/http/params';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { reauthenticateToSign, WRONG_PASSWORD_MESSAGE } from '@/lib/auth/reauthenticate';
import { recordAudit } from '@/lib/audit/record';
import { CONSTANTS } from '@/lib/calc/constants';
import { VERIFICATION_LABELS } from '@/lib/checks/workflow';
import { compareAlternate } from '@/lib/checks/alternate-comparison';
import { checkDesignInputs, FINDING_LABELS } from '@/lib/checks/submission-findings';
import type { StoredAcknowledgement } from '@/lib/checks/workflow';
import type { SheetResult } from '@/lib/calc/types';
import { AppError } from '@/lib/errors/app-error';
import { earlierRevisionLengths, sha256Hex, stampIssuedPdf } from './stamp';
import { appUrl } from '@/lib/http/app-url';
import { jobSender, kyselyJobDb } from '@/lib/jobs/queue';
import { enqueueMail } from '@/lib/mail/outbox';
import { CAUTIONS, SAFETY_RELATED_CAUTION } from '@/lib/safety/cautions';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { supersededInputs } from '@/lib/sheets/impact';
import { getVersion } from '@/lib/sheets/sheets';
import type { ObjectStore } from '@/lib/storage/object-store';
import { getSignatureParser } from './signature-parser';
import { newVerificationCode, normaliseVerificationCode, revisionCode } from './codes';
import { signingIdentity } from './identity';
import type { RevisionPdfData } from './pdf-data';
import { renderRevisionPdf } from './pdf/render';
import { signPdf } from './sign-pdf';

export const ISSUE_QUEUE = 'issue';

export const issueRequestSchema = z.object({
  versionNumber: z.number().int().positive().max(INT4_MAX),
  password: z.string().min(1, 'enter your password to sign').max(200),
});
export const withdrawSchema = z.object({
  reason: z.string().trim().min(1, 'say why the revision is withdrawn').max(5000),
});
export const registerQuerySchema = z.object({
  status: z.enum(['current', 'superseded', 'withdrawn', 'all']).default('all'),
  q: z.string().max(200).optional(),
  format: z.enum(['json', 'csv']).default('json'),
});
export const downloadQuerySchema = z.object({ original: z.enum(['0', '1']).default('0') });
export const verifyCodeSchema = z.object({ code: z.string().min(1).max(40) });

/** Largest file the verification page reads. */
export const MAX_VERIFY_BYTES = 30 * 1024 * 1024;

const utc = (d: Date) => `${d.toISOString().slice(0, 19).replace('T', ' ')} UTC`;

// ── Request ──────────────────────────────────────────────────────────────────────────────────

export async function requestIssue(
  db: Kysely<Database>,
  actor: Actor,
  sheet: { id: string; project_id: string },
  input: z.infer<typeof issueRequestSchema>,
) {
  const approved = await db
    .selectFrom('checks')
    .select(['id', 'version_number', 'version_sha256'])
    .where('sheet_id', '=', sheet.id)
    .where('version_number', '=', input.versionNumber)
    .where('state', '=', 'approved')
    .executeTakeFirst();
  if (!approved)
    throw new AppError(
      'conflict',
      `Version ${input.versionNumber} is not approved; only an approved version is issued.`,
      { state: 'not_approved' },
    );
  const issued = await db
    .selectFrom('revisions')
    .select(['code', 'version_number'])
    .where('sheet_id', '=', sheet.id)
    .where('version_number', '>=', input.versionNumber)
    .orderBy('sequence', 'desc')
    .executeTakeFirst();
  if (issued)
    throw new AppError(
      'conflict',
      `Version ${issued.version_number} is already issued as revision ${issued.code}; a revision is issued from a later approved version.`,
    );
  // A revision is never issued on an input that has since been superseded or withdrawn.
  const stale = await supersededInputs(db, sheet.id, input.versionNumber);
  if (stale.length) {
    const list = stale
      .map(
        (s) =>
          `${s.sheet} rev. ${s.revision} (${s.status === 'withdrawn' ? 'withdrawn' : `superseded by rev. ${s.currentRevision}`})`,
      )
      .join(', ');
    throw new AppError(
      'conflict',
      `Version ${input.versionNumber} cites ${list}; revise the sheet to cite the current revision, have it checked and approved, then issue.`,
      {
        state: 'superseded_inputs',
        citations: stale.map((s) => ({
          sheet: s.sheet,
          revision: s.revision,
          status: s.status,
          currentRevision: s.currentRevision,
        })),
      },
    );
  }

  await reauthenticateToSign(db, actor, {
    sheet,
    meaning: 'issued',
    password: input.password,
    // A disabled or locked account is told what a wrong password is told, as issuing always has.
    messages: {
      noPassword: 'Your account has no password; set one on your account page to sign records.',
      disabledOrLocked: WRONG_PASSWORD_MESSAGE,
    },
  });

  const project = await db
    .selectFrom('projects')
    .select(['revision_scheme'])
    .where('id', '=', sheet.project_id)
    .executeTakeFirstOrThrow();
  try {
    return await db.transaction().execute(async (trx) => {
      await trx.selectFrom('sheets').select('id').where('id', '=', sheet.id).forUpdate().executeTakeFirstOrThrow();
      const last = await trx
        .selectFrom('revisions')
        .select(sql<number | null>`max(sequence)`.as('n'))
        .where('sheet_id', '=', sheet.id)
        .executeTakeFirstOrThrow();
      const sequence = last.n === null ? 0 : Number(last.n) + 1;
      const code = revisionCode(project.revision_scheme, sequence);
      const job = await trx
        .insertInto('issue_jobs')
        .values({
          sheet_id: sheet.id,
          project_id: sheet.project_id,
          version_number: approved.version_number,
          version_sha256: approved.version_sha256,
          check_id: approved.id,
          revision_code: code,
          revision_sequence: sequence,
          verification_code: newVerificationCode(),
          requested_by: actor.userId,
          signed_at: new Date(),
        })
        .returning(['id'])
        .executeTakeFirstOrThrow();
      await jobSender().send(ISSUE_QUEUE, { issueJobId: job.id }, { db: kyselyJobDb(trx), singletonKey: job.id });
      await recordAudit(trx, actor, {
        action: 'revision.request',
        objectType: 'sheet',
        objectId: sheet.id,
        projectId: sheet.project_id,
        newValue: { version: approved.version_number, revision: code, job: job.id },
      });
      return { jobId: job.id, revision: code, versionNumber: approved.version_number };
    });
  } catch (error) {
    if ((error as { constraint?: string }).constraint === 'issue_jobs_one_pending_per_sheet') {
      throw new AppError('conflict', 'A revision of this sheet is being issued already; wait for it to finish.');
    }
    throw error;
  }
}

export async function issueJobStatus(db: Kysely<Database>, jobId: string) {
  if (!/^[0-9a-f-]{36}$/.test(jobId)) return undefined;
  return db
    .selectFrom('issue_jobs as j')
    .leftJoin('revisions as r', 'r.id', 'j.revision_id')
    .select([
      'j.id',
      'j.sheet_id',
      'j.project_id',
      'j.state',
      'j.step',
      'j.error',
      'j.revision_code',
      'j.version_number',
      'j.created_at',
      'j.finished_at',
      'r.id as revision_id',
      'r.pdf_sha256',
      'r.verification_code',
    ])
    .where('j.id', '=', jobId)
    .executeTakeFirst();
}

// ── The job ──────────────────────────────────────────────────────────────────────────────────

const pdfPrefixOf = (jobId: string) => `revisions/issue-${jobId}/`;

async function setStep(db: Kysely<Database>, jobId: string, step: string) {
  await db.updateTable('issue_jobs').set({ step }).where('id', '=', jobId).where('state', '=', 'pending').execute();
  // Fault-injection for the crash tests: a pause after each step gives them time to kill the worker there.
  const pause = Number(process.env.WORLDSHEET_ISSUE_STEP_PAUSE_MS ?? 0);
  if (pause > 0) await new Promise((r) => setTimeout(r, pause));
}

/** Issue requests left pending (their worker died, or the queue lost them): the worker queues them again on start. */
export async function pendingIssueJobs(db: Kysely<Database>): Promise<string[]> {
  return (await db.selectFrom('issue_jobs').select('id').where('state', '=', 'pending').execute()).map((r) => r.id);
}

/** Gathers what the PDF shows. */
export async function revisionPdfData(db: Kysely<Database>, jobId: string): Promise<RevisionPdfData> {
  const job = await db.selectFrom('issue_jobs').selectAll().where('id', '=', jobId).executeTakeFirstOrThrow();
  const sheet = await db
    .selectFrom('sheets')
    .select(['number', 'safety_related'])
    .where('id', '=', job.sheet_id)
    .executeTakeFirstOrThrow();
  const project = await db
    .selectFrom('projects')
    .select(['code', 'name', 'legal_owner'])
    .where('id', '=', job.project_id)
    .executeTakeFirstOrThrow();
  const version = (await getVersion(db, job.sheet_id, job.version_number))!;
  const check = await db
    .selectFrom('checks')
    .select([
      'verification_method',
      'base_version_number',
      'alternate_results',
      'tolerance',
      'tolerance_text',
      'acknowledgements',
    ])
    .where('id', '=', job.check_id)
    .executeTakeFirstOrThrow();
  const alternate = compareAlternate(
    version.results,
    check.alternate_results as SheetResult | null,
    check.tolerance,
    check.tolerance_text,
  );
  const previous = await db
    .selectFrom('revisions as r')
    .innerJoin('signatures as s', (j) => j.onRef('s.check_id', '=', 'r.check_id').on('s.meaning', '=', 'approved'))
    .innerJoin('versions as v', (j) =>
      j.onRef('v.sheet_id', '=', 'r.sheet_id').onRef('v.number', '=', 'r.version_number'),
    )
    .select(['r.code', 'r.issued_at', 'r.version_number', 'r.status', 's.printed_name', 'v.message'])
    .where('r.sheet_id', '=', job.sheet_id)
    .orderBy('r.sequence')
    .execute();
  const signatures = await db
    .selectFrom('signatures')
    .select(['printed_name', 'meaning', 'signed_at'])
    .where('check_id', '=', job.check_id)
    .orderBy('signed_at')
    .execute();
  const controller = await db
    .selectFrom('users')
    .select('display_name')
    .where('id', '=', job.requested_by)
    .executeTakeFirstOrThrow();
  const lastIssued = previous.length ? previous[previous.length - 1].version_number : 0;
  const creators = await db
    .selectFrom('versions as v')
    .innerJoin('users as u', 'u.id', 'v.author_id')
    .select('u.display_name')
    .distinct()
    .where('v.sheet_id', '=', job.sheet_id)
    .where('v.number', '>', lastIssued)
    .where('v.number', '<=', job.version_number)
    .execute();
  const approver = signatures.find((s) => s.meaning === 'approved')?.printed_name ?? '';
  const sources = version.content.cells.map((c) => c.source).join('\n');
  const signedAt = new Date(job.signed_at);
  return {
    titleBlock: {
      legalOwner: project.legal_owner,
      identificationNumber: formatSheetNumber(project.code, sheet.number),
      revisionIndex: job.revision_code,
      dateOfIssue: signedAt.toISOString().slice(0, 10),
      title: version.content.title,
      documentType: 'Calculation',
      creator: creators
        .map((c) => c.display_name)
        .sort()
        .join(', '),
      approvalPerson: approver,
      status: 'Issued',
      language: 'en',
      project: { code: project.code, name: project.name },
    },
    safetyRelated: sheet.safety_related,
    cautions: [...(sheet.safety_related ? [SAFETY_RELATED_CAUTION] : []), ...CAUTIONS],
    revisionHistory: [
      ...previous.map((p) => ({
        revision: p.code,
        date: new Date(p.issued_at).toISOString().slice(0, 10),
        version: p.version_number,
        description: p.message,
        approvedBy: p.printed_name,
        status: p.status === 'current' ? 'superseded' : p.status,
      })),
      {
        revision: job.revision_code,
        date: signedAt.toISOString().slice(0, 10),
        version: job.version_number,
        description: version.message,
        approvedBy: approver,
        status: 'current',
      },
    ],
    version: {
      number: version.number,
      sha256: version.sha256,
      content: version.content,
      results: version.results!,
      engineVersion: version.engineVersion ?? '',
      constantsEdition: version.constantsEdition ?? '',
    },
    constants: CONSTANTS.filter((k) => new RegExp(`(^|[^A-Za-z0-9_])${k.name}($|[^A-Za-z0-9_])`).test(sources)).map(
      (k) => ({ name: k.name, value: `${k.value} ${k.unit}`.trim(), provenance: k.provenance }),
    ),
    signatures: [
      ...signatures.map((s) => ({
        printedName: s.printed_name,
        meaning: s.meaning,
        signedAt: utc(new Date(s.signed_at)),
      })),
      { printedName: controller.display_name, meaning: 'issued', signedAt: utc(signedAt) },
    ],
    verificationMethod: check.verification_method ? VERIFICATION_LABELS[check.verification_method] : null,
    acknowledgements: ((check.acknowledgements ?? []) as StoredAcknowledgement[]).map((a) => ({
      item: `${FINDING_LABELS[a.kind]}: ${a.message}`,
      text: a.text,
    })),
    designInputChecks: checkDesignInputs(version.content.record, version.results).map((d) => ({
      index: d.index,
      cell: d.cell,
      engineValue: d.engineValue,
      match: d.status === 'match',
      words: d.words,
    })),
    alternateComparison: alternate.rows.length
      ? {
          toleranceText: alternate.toleranceText,
          rows: alternate.rows.map((r) => ({
            name: r.name,
            sheet: r.sheet,
            alternate: r.alternate,
            relativeDifference: r.relativeDifferenceText,
            outcome: r.words,
          })),
        }
      : null,
    verificationCode: job.verification_code,
    verifyUrl: `${appUrl()}/verify`,
  };
}

/**
 * Works one issue job to its end. Safe to run again at any point: a stored PDF is reused, and the
 * revision is recorded once. Returns the revision id.
 */
export async function processIssueJob(db: Kysely<Database>, store: ObjectStore, jobId: string): Promise<string | null> {
  const job = await db.selectFrom('issue_jobs').selectAll().where('id', '=', jobId).executeTakeFirst();
  if (!job) return null;
  if (job.state !== 'pending') return job.revision_id;
  // The PDF a request produces is stored under the request's prefix by its own SHA-256, and then
  // claimed in the request's row; only the claimed one is ever recorded. A rerun reuses a claimed
  // or stored PDF rather than making a new one, and a duplicate from a concurrent run is discarded.
  const prefix = pdfPrefixOf(job.id);
  const claim = async (key: string): Promise<string> => {
    await db
      .updateTable('issue_jobs')
      .set({ pdf_key: key })
      .where('id', '=', job.id)
      .where('pdf_key', 'is', null)
      .execute();
    return (await db.selectFrom('issue_jobs').select('pdf_key').where('id', '=', job.id).executeTakeFirstOrThrow())
      .pdf_key!;
  };
  let key = job.pdf_key;
  if (!key) {
    const stored = await store.list(prefix);
    if (stored.length) key = await claim(stored[0]);
  }
  if (!key) {
    await setStep(db, job.id, 'rendering');
    const data = await revisionPdfData(db, job.id);
    const unsigned = await renderRevisionPdf(data);
    await setStep(db, job.id, 'signing');
    const legalOwner = data.titleBlock.legalOwner;
    const signed = await signPdf(unsigned, {
      reason: `Issued: ${data.titleBlock.identificationNumber} revision ${job.revision_code} (version ${job.version_number}, SHA-256 ${job.version_sha256})`,
      location: legalOwner,
      contactInfo: 'document control',
      name: legalOwner,
      signingTime: new Date(job.signed_at),
    });
    await setStep(db, job.id, 'storing');
    const mine = `${prefix}${createHash('sha256').update(signed).digest('hex')}.pdf`;
    await store.putOnce(mine, signed, 'application/pdf');
    key = await claim(mine);
  }
  for (const other of await store.list(prefix)) if (other !== key) await store.discard(other);
  const pdf = await store.get(key);
  if (!pdf) throw new Error(`the PDF ${key} of issue request ${job.id} is missing from the object store`);
  await setStep(db, job.id, 'recording');
  const sha256 = createHash('sha256').update(pdf).digest('hex');
  return db.transaction().execute(async (trx) => {
    const current = await trx
      .selectFrom('issue_jobs')
      .select(['state', 'revision_id'])
      .where('id', '=', job.id)
      .forUpdate()
      .executeTakeFirstOrThrow();
    if (current.state !== 'pending') return current.revision_id;
    const previous = await trx
      .selectFrom('revisions')
      .select(['id', 'code'])
      .where('sheet_id', '=', job.sheet_id)
      .where('status', '=', 'current')
      .forUpdate()
      .executeTakeFirst();
    if (previous)
      await trx
        .updateTable('revisions')
        .set({ status: 'superseded', superseded_at: sql`now()` })
        .where('id', '=', previous.id)
        .execute();
    const revision = await trx
      .insertInto('revisions')
      .values({
        sheet_id: job.sheet_id,
        project_id: job.project_id,
        version_number: job.version_number,
        version_sha256: job.version_sha256,
        check_id: job.check_id,
        issue_job_id: job.id,
        code: job.revision_code,
        sequence: job.revision_sequence,
        issued_by: job.requested_by,
        issued_at: job.signed_at,
        pdf_key: key,
        pdf_sha256: sha256,
        pdf_size: pdf.length,
        verification_code: job.verification_code,
      })
      .returning(['id'])
      .executeTakeFirstOrThrow();
    if (previous)
      await trx.updateTable('revisions').set({ superseded_by: revision.id }).where('id', '=', previous.id).execute();
    const controller = await trx
      .selectFrom('users')
      .select(['id', 'email', 'display_name'])
      .where('id', '=', job.requested_by)
      .executeTakeFirstOrThrow();
    await trx
      .insertInto('signatures')
      .values({
        sheet_id: job.sheet_id,
        version_number: job.version_number,
        version_sha256: job.version_sha256,
        check_id: job.check_id,
        user_id: controller.id,
        printed_name: controller.display_name,
        meaning: 'issued',
        signed_at: job.signed_at,
      })
      .execute();
    await trx
      .updateTable('issue_jobs')
      .set({ state: 'done', step: 'done', revision_id: revision.id, finished_at: sql`now()` })
      .where('id', '=', job.id)
      .execute();
    const actor: Actor = {
      userId: controller.id,
      email: controller.email,
      name: controller.display_name,
      isAdmin: false,
      via: 'system',
      sessionId: null,
      tokenId: null,
    };
    await recordAudit(trx, actor, {
      action: 'revision.issue',
      objectType: 'sheet',
      objectId: job.sheet_id,
      projectId: job.project_id,
      newValue: {
        revision: job.revision_code,
        version: job.version_number,
        versionSha256: job.version_sha256,
        pdfSha256: sha256,
        verificationCode: job.verification_code,
        supersedes: previous?.code ?? null,
      },
    });
    await notifyIssued(trx, job, revision.id, previous?.code ?? null, sha256);
    return revision.id;
  });
}

async function notifyIssued(
  trx: Transaction<Database>,
  job: {
    sheet_id: string;
    project_id: string;
    check_id: string;
    revision_code: string;
    version_number: number;
    verification_code: string;
  },
  revisionId: string,
  supersedes: string | null,
  sha256: string,
) {
  const sheet = await trx
    .selectFrom('sheets as s')
    .innerJoin('projects as p', 'p.id', 's.project_id')
    .select(['s.number', 's.title', 'p.code'])
    .where('s.id', '=', job.sheet_id)
    .executeTakeFirstOrThrow();
  const check = await trx
    .selectFrom('checks')
    .select(['submitted_by', 'checker_id'])
    .where('id', '=', job.check_id)
    .executeTakeFirstOrThrow();
  const approvers = await trx
    .selectFrom('signatures')
    .select('user_id')
    .where('check_id', '=', job.check_id)
    .where('meaning', '=', 'approved')
    .execute();
  const ids = [...new Set([check.submitted_by, check.checker_id, ...approvers.map((a) => a.user_id)])];
  const people = await trx
    .selectFrom('users')
    .select(['email', 'display_name'])
    .where('id', 'in', ids)
    .where('disabled_at', 'is', null)
    .execute();
  const code = formatSheetNumber(sheet.code, sheet.number);
  for (const p of people) {
    await enqueueMail(trx, {
      to: p.email,
      kind: 'revision-issued',
      subject: `${code} revision ${job.revision_code} is issued`,
      text: [
        `Hello ${p.display_name},`,
        '',
        `${code} "${sheet.title}" is issued as revision ${job.revision_code} (version ${job.version_number})${supersedes ? `, superseding revision ${supersedes}` : ''}.`,
        `Verification code: ${job.verification_code}`,
        `SHA-256 of the PDF: ${sha256}`,
        '',
        `The signed PDF: ${appUrl()}/api/revisions/${revisionId}/pdf`,
        `The sheet: ${appUrl()}/projects/${sheet.code}/sheets/${sheet.number}`,
        '',
        '— Worldsheet',
      ].join('\n'),
    });
  }
}

/** Marks a job failed for good (after the queue gave up), keeping the reason for the screen. */
export async function failIssueJob(db: Kysely<Database>, jobId: string, error: string) {
  await db
    .updateTable('issue_jobs')
    .set({ state: 'failed', error: error.slice(0, 2000), finished_at: sql`now()` })
    .where('id', '=', jobId)
    .where('state', '=', 'pending')
    .execute();
}

// ── Reading, downloading, withdrawing ─────────────────────────────────────────────────────────

export async function listRevisions(
  db: Kysely<Database>,
  filter: { projectId?: string; sheetId?: string; status?: string; q?: string },
) {
  let q = db
    .selectFrom('revisions as r')
    .innerJoin('sheets as s', 's.id', 'r.sheet_id')
    .innerJoin('projects as p', 'p.id', 'r.project_id')
    .innerJoin('users as u', 'u.id', 'r.issued_by')
    .leftJoin('revisions as n', 'n.id', 'r.superseded_by')
    .select([
      'r.id',
      'r.code',
      'r.status',
      'r.version_number',
      'r.version_sha256',
      'r.issued_at',
      'r.pdf_sha256',
      'r.pdf_size',
      'r.verification_code',
      'r.withdrawn_reason',
      'r.withdrawn_at',
      'r.superseded_at',
      'n.code as superseded_by_code',
      's.id as sheet_id',
      's.number as sheet_number',
      's.title',
      's.safety_related',
      'p.code as project_code',
      'u.display_name as issued_by',
    ]);
  if (filter.projectId) q = q.where('r.project_id', '=', filter.projectId);
  if (filter.sheetId) q = q.where('r.sheet_id', '=', filter.sheetId);
  if (filter.status && filter.status !== 'all') q = q.where('r.status', '=', filter.status as 'current');
  if (filter.q) {
    const like = `%${filter.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    q = q.where((eb) =>
      eb.or([
        eb('s.title', 'ilike', like),
        eb(sql<string>`p.code || '-CALC-' || lpad(s.number::text, 4, '0')`, 'ilike', like),
      ]),
    );
  }
  const rows = await q.orderBy('s.number').orderBy('r.sequence', 'desc').execute();
  return rows.map((r) => ({
    id: r.id,
    sheetId: r.sheet_id,
    sheet: formatSheetNumber(r.project_code, r.sheet_number),
    sheetNumber: r.sheet_number,
    projectCode: r.project_code,
    title: r.title,
    safetyRelated: r.safety_related,
    revision: r.code,
    status: r.status,
    versionNumber: r.version_number,
    versionSha256: r.version_sha256,
    issuedAt: new Date(r.issued_at).toISOString(),
    issuedBy: r.issued_by,
    pdfSha256: r.pdf_sha256,
    pdfSize: Number(r.pdf_size),
    verificationCode: r.verification_code,
    supersededBy: r.superseded_by_code,
    supersededAt: r.superseded_at ? new Date(r.superseded_at).toISOString() : null,
    withdrawnReason: r.withdrawn_reason,
    withdrawnAt: r.withdrawn_at ? new Date(r.withdrawn_at).toISOString() : null,
  }));
}
export type RegisterRow = Awaited<ReturnType<typeof listRevisions>>[number];

const csvField = (v: unknown) => {
  const s = v === null || v === undefined ? '' : String(v);
  // A leading =, +, - or @ would be read as a formula by spreadsheet programs (OWASP CSV injection).
  const safe = /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
  return /[",\n\r]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
};

/**
 * The register as CSV. `staleInputs` (revision id → its citations of revisions no longer current, from
 * `revisionInputFlags`) fills the last column, `superseded_inputs`.
 */
export function registerCsv(
  rows: RegisterRow[],
  staleInputs: ReadonlyMap<
    string,
    ReadonlyArray<{ sheet: string; revision: string; status: string; currentRevision: string | null }>
  > = new Map(),
): string {
  const header = [
    'sheet',
    'title',
    'revision',
    'status',
    'version',
    'issued_at_utc',
    'issued_by',
    'superseded_by',
    'withdrawn_reason',
    'pdf_sha256',
    'version_sha256',
    'verification_code',
    'superseded_inputs',
  ];
  const stale = (id: string) =>
    (staleInputs.get(id) ?? [])
      .map(
        (c) =>
          `${c.sheet} rev. ${c.revision} (${c.status === 'withdrawn' ? 'withdrawn' : `superseded by rev. ${c.currentRevision}`})`,
      )
      .join('; ');
  const lines = rows.map((r) =>
    [
      r.sheet,
      r.title,
      r.revision,
      r.status,
      r.versionNumber,
      r.issuedAt,
      r.issuedBy,
      r.supersededBy,
      r.withdrawnReason,
      r.pdfSha256,
      r.versionSha256,
      r.verificationCode,
      stale(r.id),
    ]
      .map(csvField)
      .join(','),
  );
  return `${[header.join(','), ...lines].join('\r\n')}\r\n`;
}

export async function getRevision(db: Kysely<Database>, revisionId: string) {
  if (!/^[0-9a-f-]{36}$/.test(revisionId)) return undefined;
  return db
    .selectFrom('revisions as r')
    .innerJoin('sheets as s', 's.id', 'r.sheet_id')
    .innerJoin('projects as p', 'p.id', 'r.project_id')
    .leftJoin('revisions as n', 'n.id', 'r.superseded_by')
    .selectAll('r')
    .select([
      's.number as sheet_number',
      'p.code as project_code',
      'n.code as superseded_by_code',
      'n.issued_at as superseded_by_issued_at',
    ])
    .where('r.id', '=', revisionId)
    .executeTakeFirst();
}

/**
 * The PDF of a revision. The original file, byte for byte, while it is current (or when document
 * control asks for it); a superseded or withdrawn revision comes as a copy stamped on every page
 * with its status, made once for each status and kept beside the original.
 */
export async function revisionPdf(db: Kysely<Database>, store: ObjectStore, revisionId: string, original: boolean) {
  const r = await getRevision(db, revisionId);
  if (!r) throw new AppError('not_found', 'No such revision.');
  const name = `${formatSheetNumber(r.project_code, r.sheet_number)}-rev-${r.code}`;
  const bytes = await store.get(r.pdf_key);
  if (!bytes)
    throw new AppError(
      'unavailable',
      'The issued PDF is missing from the file store; report this to your administrator.',
    );
  if (createHash('sha256').update(bytes).digest('hex') !== r.pdf_sha256) {
    throw new AppError(
      'unavailable',
      'The stored PDF no longer matches its recorded SHA-256; it is not served. Report this to your administrator.',
    );
  }
  if (original || r.status === 'current') return { fileName: `${name}.pdf`, bytes, stamped: false };
  // A copy is stamped once for each status (a superseded revision later withdrawn gets a new one).
  const keyPrefix = `revisions/stamped-${r.id}-${r.status}-`;
  if (r.stamped_key && r.stamped_sha256 && r.stamped_key.startsWith(keyPrefix)) {
    const stamped = await store.get(r.stamped_key);
    if (stamped && createHash('sha256').update(stamped).digest('hex') === r.stamped_sha256)
      return { fileName: `${name}-${r.status}.pdf`, bytes: stamped, stamped: true };
  }
  const label =
    r.status === 'withdrawn'
      ? `WITHDRAWN ${r.withdrawn_at ? new Date(r.withdrawn_at).toISOString().slice(0, 10) : ''}: ${r.withdrawn_reason ?? ''}`
      : `SUPERSEDED by revision ${r.superseded_by_code} issued ${r.superseded_by_issued_at ? new Date(r.superseded_by_issued_at).toISOString().slice(0, 10) : ''}`;
  // The copy is an incremental update of the issued file (lib/issue/stamp.ts): the original's
  // signature still verifies, and document control signs the stamp over the whole file.
  const stamped = await stampIssuedPdf(bytes, {
    status: r.status,
    headline: label,
    note: 'Not for use. Copy of an issued revision, stamped and signed by document control; the original stays in the register.',
    signingTime: new Date(),
  });
  const sha = createHash('sha256').update(stamped).digest('hex');
  const key = `${keyPrefix}${sha}.pdf`;
  await store.putOnce(key, stamped, 'application/pdf');
  await db
    .updateTable('revisions')
    .set({ stamped_key: key, stamped_sha256: sha })
    .where('id', '=', r.id)
    .where('status', '=', r.status)
    .where((eb) => eb.or([eb('stamped_sha256', 'is', null), eb('stamped_key', 'not like', `${keyPrefix}%`)]))
    .execute()
    .catch(() => undefined);
  return { fileName: `${name}-${r.status}.pdf`, bytes: Buffer.from(stamped), stamped: true };
}

export async function withdrawRevision(db: Kysely<Database>, actor: Actor, revisionId: string, reason: string) {
  const r = await getRevision(db, revisionId);
  if (!r) throw new AppError('not_found', 'No such revision.');
  if (r.status === 'withdrawn')
    throw new AppError('conflict', `Revision ${r.code} is withdrawn already.`, { status: r.status });
  return db.transaction().execute(async (trx) => {
    const moved = await trx
      .updateTable('revisions')
      .set({ status: 'withdrawn', withdrawn_at: sql`now()`, withdrawn_by: actor.userId, withdrawn_reason: reason })
      .where('id', '=', r.id)
      .where('status', '=', r.status)
      .returning('id')
      .executeTakeFirst();
    if (!moved) throw new AppError('conflict', 'The revision changed meanwhile; reload and try again.');
    await recordAudit(trx, actor, {
      action: 'revision.withdraw',
      objectType: 'sheet',
      objectId: r.sheet_id,
      projectId: r.project_id,
      oldValue: { revision: r.code, status: r.status },
      newValue: { status: 'withdrawn' },
      reason,
    });
    return { id: r.id, status: 'withdrawn' as const };
  });
}

// ── Verification, for anyone ─────────────────────────────────────────────────────────────────

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
      summary: 'A verification code has 12 letters and digits, like K7QF-2M9D-XW4T.',
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

/** For the sheet page: approved versions newer than the last issued one, and the code the next revision gets. */
export async function issueCandidates(db: Kysely<Database>, sheetId: string) {
  const [approved, last, project, pending] = await Promise.all([
    db
      .selectFrom('checks')
      .select('version_number')
      .where('sheet_id', '=', sheetId)
      .where('state', '=', 'approved')
      .orderBy('version_number')
      .execute(),
    db
      .selectFrom('revisions')
      .select(['sequence', 'version_number'])
      .where('sheet_id', '=', sheetId)
      .orderBy('sequence', 'desc')
      .limit(1)
      .executeTakeFirst(),
    db
      .selectFrom('sheets as s')
      .innerJoin('projects as p', 'p.id', 's.project_id')
      .select('p.revision_scheme')
      .where('s.id', '=', sheetId)
      .executeTakeFirstOrThrow(),
    db
      .selectFrom('issue_jobs')
      .select(['id'])
      .where('sheet_id', '=', sheetId)
      .where('state', '=', 'pending')
      .executeTakeFirst(),
  ]);
  return {
    approvedVersions: approved.map((a) => a.version_number).filter((v) => !last || v > last.version_number),
    nextRevision: revisionCode(project.revision_scheme, last ? last.sequence + 1 : 0),
    pendingJobId: pending?.id ?? null,
  };
}
