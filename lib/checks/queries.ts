// The read model of the check workflow: one check as the check view and GET /api/checks/<id> show
// it (the version against its base, the threads, the checker's work, the signatures and the
// policy's answers for the caller), the queues "My checks" and "My approvals", and where a sheet
// stands (its checks and signatures).
import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import type { SheetResult } from '@/lib/calc/types';
import { AppError } from '@/lib/errors/app-error';
import type { Cell } from '@/lib/sheets/content';
import { compareStoredVersions } from '@/lib/sheets/comparison';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { getVersion } from '@/lib/sheets/sheets';
import { compareAlternate } from './alternate-comparison';
import { readCarriedOver } from './carried-over';
import { policyFor, requireCheck, threadRoots } from './context';
import { person, versionSafetyFlag } from './participants';
import { offeredDecisions, seesEvidenceSummary } from './policy';
import { returnedCheckBefore } from './recheck';
import { listSignatures } from './signing';
import { statusOf } from './status';
import { checkDesignInputs } from './submission-findings';
import { STATE_LABELS, type StoredAcknowledgement } from './workflow';

type Db = Kysely<Database> | Transaction<Database>;

export async function getCheckDetail(db: Kysely<Database>, actor: Actor, checkId: string) {
  const { check, roles } = await requireCheck(db, actor, checkId);
  const [version, base, comments, signatures, submitter, checker] = await Promise.all([
    getVersion(db, check.sheet_id, check.version_number),
    check.base_version_number ? getVersion(db, check.sheet_id, check.base_version_number) : Promise.resolve(null),
    db
      .selectFrom('check_comments as c')
      .innerJoin('users as u', 'u.id', 'c.author_id')
      .innerJoin('checks as k', 'k.id', 'c.check_id')
      .leftJoin('users as r', 'r.id', 'c.resolved_by')
      .select([
        'c.id',
        'c.thread_id',
        'c.cell_id',
        'c.statement_line',
        'c.body',
        'c.created_at',
        'c.resolved_at',
        'u.display_name as author',
        'r.display_name as resolved_by',
        'k.version_number as check_version',
      ])
      .where((eb) =>
        eb.or([
          eb('c.id', 'in', threadRoots(db, check).select('t.id')),
          eb('c.thread_id', 'in', threadRoots(db, check).select('t.id')),
        ]),
      )
      .orderBy('c.created_at')
      .execute(),
    listSignatures(db, check.sheet_id),
    person(db, check.project_id, check.submitted_by),
    person(db, check.project_id, check.checker_id),
  ]);
  if (!version) throw new AppError('not_found', 'The version under check is missing.');
  // The comparison with the base, the returned check before this one (a re-check after a return: what
  // changed since the version that was returned comes first) and the policy's answers for the caller (the
  // policy the mutations enforce, policy.ts) do not depend on each other.
  const [comparison, returned, { policy, facts }] = await Promise.all([
    compareStoredVersions(db, check.sheet_id, base ?? null, version),
    returnedCheckBefore(db, check),
    policyFor(db, check, actor, roles, version.results),
  ]);
  const returnedVersion = returned ? await getVersion(db, check.sheet_id, returned.versionNumber) : null;
  const sinceReturn =
    returned && returnedVersion
      ? {
          ...returned,
          sha256: returnedVersion.sha256,
          comparison: await compareStoredVersions(db, check.sheet_id, returnedVersion, version),
        }
      : null;
  const threads = comments
    .filter((c) => c.thread_id === null)
    .map((t) => ({
      id: t.id,
      cellId: t.cell_id,
      statementLine: t.statement_line,
      resolvedAt: t.resolved_at ? new Date(t.resolved_at).toISOString() : null,
      resolvedBy: t.resolved_by,
      /** The version under check when the thread was opened (an earlier one for a thread carried over a return). */
      openedOnVersion: t.check_version,
      comments: comments
        .filter((c) => c.id === t.id || c.thread_id === t.id)
        .map((c) => ({ id: c.id, author: c.author, body: c.body, createdAt: new Date(c.created_at).toISOString() })),
    }));
  const who = facts.participants;
  const sign = policy.sign;
  const approve = policy.approve;
  return {
    id: check.id,
    state: check.state,
    stateLabel: STATE_LABELS[check.state],
    sheet: {
      id: check.sheet_id,
      number: check.sheet_number,
      code: formatSheetNumber(check.project_code, check.sheet_number),
      title: check.sheet_title,
      safetyRelated: who.safetyRelated,
      projectCode: check.project_code,
    },
    version: {
      number: version.number,
      sha256: version.sha256,
      author: version.author,
      createdAt: new Date(version.createdAt).toISOString(),
      message: version.message,
      content: version.content,
      results: version.results,
    },
    base: base ? { number: base.number, sha256: base.sha256, content: base.content, results: base.results } : null,
    comparison,
    /** For a re-check after a return: the returned check, its version and the comparison since that version; null otherwise. */
    sinceReturn,
    submittedBy: submitter.name,
    checker: { userId: checker.userId, name: checker.name },
    submittedAt: new Date(check.created_at).toISOString(),
    verificationMethod: check.verification_method,
    checkerNotes: check.checker_notes,
    alternateCells: check.alternate_cells as Cell[],
    alternateResults: check.alternate_results as SheetResult | null,
    tolerance: check.tolerance,
    toleranceText: check.tolerance_text,
    /** Each name both the sheet and the alternate calculation define, compared (lib/checks/alternate-comparison.ts). */
    alternateComparison: compareAlternate(
      version.results,
      check.alternate_results as SheetResult | null,
      check.tolerance,
      check.tolerance_text,
    ),
    /** What the originator acknowledged in writing on submitting: each cell error, failed criterion, engine warning and mismatched design input. */
    acknowledgements: (check.acknowledgements ?? []) as StoredAcknowledgement[],
    /** Each design input that names a cell quantity, with the value the engine used and whether they match. */
    designInputs: checkDesignInputs(version.content.record, version.results),
    /** Work carried over from the returned check of an earlier version, and which of it is still as carried over. */
    carriedOver: readCarriedOver(check.carried_over),
    returnReason: check.return_reason,
    threads,
    signatures: signatures.filter((s) => s.versionNumber === check.version_number),
    you: {
      isChecker: check.checker_id === actor.userId,
      /** Every action on the check with whether the caller may take it now and, if not, why (policy.ts). */
      policy,
      canComment: policy.reply.allowed,
      canOpenThreads: policy.openThread.allowed,
      canResolve: policy.resolveThread.allowed,
      canRecordWork: policy.recordWork.allowed,
      /** The decisions offered: those allowed now, and signing while it waits for work on the check. */
      actions: offeredDecisions(policy),
      /** What signing as checked still waits for (open threads, the method, carried-over work, the tolerance). */
      signWaitsFor: sign.allowed ? [] : (sign.waitingFor ?? []).map((d) => d.reason),
      /** Why the caller, an approver, may not approve it (an independence rule), while it awaits approval. */
      approverRefusal: !approve.allowed && approve.rule && approve.rule !== 'approver-role' ? approve.reason : null,
      /** Why the named checker may not return or sign it (the rules read again at every transition). */
      checkerRefusal: !sign.allowed && sign.rule ? sign.reason : null,
      /** Whether the decision column shows the checker's evidence to the caller. */
      seesEvidence: seesEvidenceSummary(check, actor),
    },
  };
}
export type CheckDetail = Awaited<ReturnType<typeof getCheckDetail>>;

/** "My checks" (open checks naming me) or "My approvals" (checked versions I may approve). */
export async function listQueue(db: Kysely<Database>, actor: Actor, queue: 'check' | 'approval') {
  let q = db
    .selectFrom('checks as c')
    .innerJoin('sheets as s', 's.id', 'c.sheet_id')
    .innerJoin('projects as p', 'p.id', 'c.project_id')
    .innerJoin('users as o', 'o.id', 'c.submitted_by')
    .innerJoin('users as k', 'k.id', 'c.checker_id')
    .innerJoin('versions as v', (j) =>
      j.onRef('v.sheet_id', '=', 'c.sheet_id').onRef('v.number', '=', 'c.version_number'),
    )
    .select([
      'c.id',
      'c.state',
      'c.version_number',
      'c.version_sha256',
      'c.created_at',
      'c.updated_at',
      's.number',
      's.title',
      'p.code',
      'p.id as project_id',
      'o.display_name as submitted_by',
      'k.display_name as checker',
    ])
    .select(versionSafetyFlag('v').as('safety_related'));
  if (queue === 'check') q = q.where('c.checker_id', '=', actor.userId).where('c.state', '=', 'in_check');
  else
    q = q
      .where('c.state', '=', 'checked')
      .where(
        'c.project_id',
        'in',
        db
          .selectFrom('project_members')
          .select('project_id')
          .where('user_id', '=', actor.userId)
          .where('role', '=', 'approver'),
      );
  const rows = await q.orderBy('c.updated_at').execute();
  const out = [];
  for (const r of rows) {
    let eligible = true;
    let reason: string | null = null;
    if (queue === 'approval') {
      // The policy's own answer, as the check view shows it and the server enforces it.
      const { check, roles } = await requireCheck(db, actor, r.id);
      const approve = (await policyFor(db, check, actor, roles)).policy.approve;
      eligible = approve.allowed;
      reason = approve.allowed ? null : approve.reason;
    }
    out.push({
      id: r.id,
      state: r.state,
      sheet: {
        code: formatSheetNumber(r.code, r.number),
        title: r.title,
        safetyRelated: r.safety_related,
        projectCode: r.code,
        number: r.number,
      },
      versionNumber: r.version_number,
      sha256: r.version_sha256,
      submittedBy: r.submitted_by,
      checker: r.checker,
      submittedAt: new Date(r.created_at).toISOString(),
      updatedAt: new Date(r.updated_at).toISOString(),
      eligible,
      reason,
    });
  }
  return out;
}

/** Where a sheet stands: its open or latest check, its last approved version, its signatures. */
export async function sheetWorkflow(db: Db, sheetId: string) {
  const [checks, signatures, latest] = await Promise.all([
    db
      .selectFrom('checks as c')
      .innerJoin('users as k', 'k.id', 'c.checker_id')
      .select([
        'c.id',
        'c.state',
        'c.version_number',
        'c.version_sha256',
        'c.created_at',
        'c.return_reason',
        'k.display_name as checker',
      ])
      .where('c.sheet_id', '=', sheetId)
      .orderBy('c.created_at', 'desc')
      .execute(),
    listSignatures(db, sheetId),
    db
      .selectFrom('versions')
      .select(sql<number>`max(number)`.as('n'))
      .where('sheet_id', '=', sheetId)
      .executeTakeFirstOrThrow(),
  ]);
  const latestNumber = Number(latest.n);
  const lastApproved = checks
    .filter((c) => c.state === 'approved')
    .reduce<number | null>((m, c) => (m === null || c.version_number > m ? c.version_number : m), null);
  const newest = checks[0];
  const status = statusOf(
    newest ? { state: newest.state, versionNumber: newest.version_number } : undefined,
    latestNumber,
  );
  return {
    status,
    latestVersion: latestNumber,
    lastApprovedVersion: lastApproved,
    checks: checks.map((c) => ({
      id: c.id,
      state: c.state,
      stateLabel: STATE_LABELS[c.state],
      versionNumber: c.version_number,
      sha256: c.version_sha256,
      checker: c.checker,
      submittedAt: new Date(c.created_at).toISOString(),
      returnReason: c.return_reason,
    })),
    signatures,
  };
}
export type SheetWorkflow = Awaited<ReturnType<typeof sheetWorkflow>>;
