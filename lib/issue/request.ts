// Issuing, the request: document control asks for an approved version to be issued as the next
// revision of its sheet. The request checks the approval (newer than the last issued version, no
// superseded or withdrawn input) and the controller's password (the "issued" signature, 21 CFR
// Part 11 §11.200), numbers the revision and queues one job for it in the same transaction; the
// database allows one pending request per sheet, so a second request is refused (409) rather than
// issuing twice. Also the request's progress and what the sheet page may offer to issue next.
import { sql, type Kysely } from 'kysely';
import { z } from 'zod';
import { INT4_MAX } from '@/lib/http/params';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { reauthenticateToSign, WRONG_PASSWORD_MESSAGE } from '@/lib/auth/reauthenticate';
import { recordAudit } from '@/lib/audit/record';
import { AppError } from '@/lib/errors/app-error';
import { jobSender, kyselyJobDb } from '@/lib/jobs/queue';
import { supersededInputs } from '@/lib/sheets/impact';
import { newVerificationCode, revisionCode } from './codes';

export const ISSUE_QUEUE = 'issue';

export const issueRequestSchema = z.object({
  versionNumber: z.number().int().positive().max(INT4_MAX),
  password: z.string().min(1, 'enter your password to sign').max(200),
});

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
