// Issuing, the job (lib/jobs/issue-job.ts runs it): renders the PDF of a requested revision, signs
// it with the organisation's certificate, stores it in object storage and then, in one transaction,
// records the revision, supersedes the previous one, records the signature and queues the e-mails.
// Each step is resumable: the PDF of a job is stored under the job's own key, so a job run again
// after a crash reuses it, and the final transaction happens once (all or nothing).
import { createHash } from 'node:crypto';
import { sql, type Kysely, type Selectable, type Transaction } from 'kysely';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { recordAudit } from '@/lib/audit/record';
import { CONSTANTS } from '@/lib/calc/constants';
import { VERIFICATION_LABELS, type StoredAcknowledgement } from '@/lib/checks/workflow';
import { compareAlternate } from '@/lib/checks/alternate-comparison';
import { checkDesignInputs, FINDING_LABELS } from '@/lib/checks/submission-findings';
import type { SheetResult } from '@/lib/calc/types';
import { appUrl } from '@/lib/http/app-url';
import { enqueueMail } from '@/lib/mail/outbox';
import { CAUTIONS, SAFETY_RELATED_CAUTION } from '@/lib/safety/cautions';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { getVersion } from '@/lib/sheets/sheets';
import type { ObjectStore } from '@/lib/storage/object-store';
import { config } from '@/lib/config';
import type { RevisionPdfData } from './pdf-data';
import { renderRevisionPdf } from './pdf/render';
import { signPdf } from './sign-pdf';

const utc = (d: Date) => `${d.toISOString().slice(0, 19).replace('T', ' ')} UTC`;

const pdfPrefixOf = (jobId: string) => `revisions/issue-${jobId}/`;

async function setStep(db: Kysely<Database>, jobId: string, step: string) {
  await db.updateTable('issue_jobs').set({ step }).where('id', '=', jobId).where('state', '=', 'pending').execute();
  // Fault-injection for the crash tests: a pause after each step gives them time to kill the worker there.
  const pause = config().WORLDSHEET_ISSUE_STEP_PAUSE_MS;
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

/** How long a lease lasts without being renewed (renewed every third of it while the job is worked). */
const leaseSeconds = () => config().WORLDSHEET_ISSUE_LEASE_SECONDS;

/**
 * Takes (or renews) the lease of a pending request for `owner`: granted when no one holds it, when
 * `owner` does, or when the holder's lease has lapsed. False when another live worker holds it or
 * the request is no longer pending.
 */
async function takeLease(db: Kysely<Database>, jobId: string, owner: string): Promise<boolean> {
  const taken = await db
    .updateTable('issue_jobs')
    .set({ lease_owner: owner, lease_expires_at: sql`now() + make_interval(secs => ${leaseSeconds()})` })
    .where('id', '=', jobId)
    .where('state', '=', 'pending')
    .where((eb) =>
      eb.or([
        eb('lease_owner', 'is', null),
        eb('lease_owner', '=', owner),
        eb('lease_expires_at', '<', sql<Date>`now()`),
      ]),
    )
    .returning('id')
    .executeTakeFirst();
  return taken !== undefined;
}

/**
 * Pending requests whose worker's lease has lapsed (the worker died or was cut off while working
 * them): another worker queues them again (lib/jobs/issue-job.ts).
 */
export async function lapsedIssueJobs(db: Kysely<Database>): Promise<Array<{ id: string; lapsedAt: Date }>> {
  const rows = await db
    .selectFrom('issue_jobs')
    .select(['id', 'lease_expires_at'])
    .where('state', '=', 'pending')
    .where('lease_expires_at', '<', sql<Date>`now()`)
    .execute();
  return rows.map((r) => ({ id: r.id, lapsedAt: r.lease_expires_at! }));
}

/** Ends `owner`'s leases at once (a worker stopping with requests in hand): another worker resumes them. */
export async function releaseIssueLeases(db: Kysely<Database>, owner: string): Promise<void> {
  await db
    .updateTable('issue_jobs')
    .set({ lease_expires_at: sql`now() - interval '1 second'` })
    .where('lease_owner', '=', owner)
    .where('state', '=', 'pending')
    .execute();
}

/**
 * Works one issue job to its end. Safe to run again at any point: a stored PDF is reused, and the
 * revision is recorded once. Returns the revision id. With `options.owner` (a job worker), the
 * request is worked only under that worker's lease, renewed while it works; null when another live
 * worker holds it (that worker finishes it, or another resumes it once its lease lapses).
 */
export async function processIssueJob(
  db: Kysely<Database>,
  store: ObjectStore,
  jobId: string,
  options: { owner?: string } = {},
): Promise<string | null> {
  const job = await db.selectFrom('issue_jobs').selectAll().where('id', '=', jobId).executeTakeFirst();
  if (!job) return null;
  if (job.state !== 'pending') return job.revision_id;
  const owner = options.owner;
  if (owner === undefined) return workIssueJob(db, store, job);
  if (!(await takeLease(db, jobId, owner))) {
    const now = await db
      .selectFrom('issue_jobs')
      .select(['state', 'revision_id'])
      .where('id', '=', jobId)
      .executeTakeFirst();
    return now && now.state !== 'pending' ? now.revision_id : null;
  }
  const renew = setInterval(() => void takeLease(db, jobId, owner).catch(() => undefined), (leaseSeconds() * 1000) / 3);
  try {
    return await workIssueJob(db, store, job);
  } finally {
    clearInterval(renew);
  }
}

async function workIssueJob(
  db: Kysely<Database>,
  store: ObjectStore,
  job: Selectable<Database['issue_jobs']>,
): Promise<string | null> {
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
