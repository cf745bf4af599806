// Independent check and approval. A version is submitted (signed "prepared" by its originator) to a
// named checker; the checker reviews it against the last approved version, comments on cells,
// records the verification method, and returns it or signs it "checked"; an approver approves it
// (signed "approved") or returns it. Every transition is one guarded UPDATE in a transaction with
// its signature, audit event and e-mails, so two people acting at once record exactly one outcome.
import { sql, type Kysely, type Transaction } from 'kysely';
import { z } from 'zod';
import { INT4_MAX } from '@/lib/http/params';
import type { CheckState, Database, ProjectRole, SignatureMeaning, VerificationMethod } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { reauthenticateToSign } from '@/lib/auth/reauthenticate';
import { recordAudit } from '@/lib/audit/record';
import type { SheetResult } from '@/lib/calc/types';
import { AppError } from '@/lib/errors/app-error';
import { evaluateInContext } from '@/lib/sheets/evaluate-in-context';
import { appUrl } from '@/lib/http/app-url';
import { enqueueMail } from '@/lib/mail/outbox';
import { cellSchema, refuseBidiControls, type Cell } from '@/lib/sheets/content';
import type { VersionComparison } from '@/lib/sheets/compare';
import { compareStoredVersions } from '@/lib/sheets/comparison';
import { returnedCheckBefore } from './recheck';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { getVersion } from '@/lib/sheets/sheets';
import {
  approverRefusal,
  checkerRefusal,
  mayAnswerThreads,
  type Participants,
  type Person,
  type Refusal,
} from './rules';
import { statusOf } from './status';
import { compareAlternate, parseTolerance } from './alternate-comparison';
import { checkDesignInputs, submissionFindings, unacknowledged, type SubmissionFinding } from './submission-findings';
import {
  carryOverWork,
  carriedFieldsText,
  readCarriedOver,
  unconfirmedCarriedOver,
  type CarriedField,
} from './carry-over';

type Db = Kysely<Database> | Transaction<Database>;

export const VERIFICATION_METHODS = [
  'design_review',
  'alternate_calculation',
  'qualification_test',
] as const satisfies readonly VerificationMethod[];
export const VERIFICATION_LABELS: Record<VerificationMethod, string> = {
  design_review: 'Design review',
  alternate_calculation: 'Alternate calculation',
  qualification_test: 'Qualification test',
};
export const STATE_LABELS: Record<CheckState, string> = {
  in_check: 'in check',
  returned: 'returned by the checker',
  checked: 'checked, awaiting approval',
  approved: 'approved',
  approval_returned: 'returned by the approver',
};
export const MEANING_LABELS: Record<SignatureMeaning, string> = {
  prepared: 'Prepared',
  checked: 'Checked',
  approved: 'Approved',
  issued: 'Issued',
};

const password = z.string().min(1, 'enter your password to sign').max(200);

export const submitSchema = z.object({
  versionNumber: z.number().int().positive().max(INT4_MAX),
  checkerId: z.string().uuid(),
  password,
  /**
   * The originator's written acknowledgement of each cell error, failed criterion, engine warning
   * and mismatched design input of the version (lib/checks/submission-findings.ts), by key.
   */
  acknowledgements: z
    .array(z.object({ key: z.string().min(1).max(200), text: z.string().trim().max(5000) }))
    .max(1000)
    .default([]),
});

export const checkWorkSchema = z.object({
  verificationMethod: z.enum(VERIFICATION_METHODS).nullable().optional(),
  checkerNotes: z.string().max(20_000).optional(),
  alternateCells: z
    .array(cellSchema)
    .max(200)
    .superRefine((cells, ctx) => refuseBidiControls(cells, ctx, []))
    .optional(),
  /** The relative tolerance of the alternate comparison as written: "1e-6", "0.1 %", "5 ppm"; null clears it. */
  tolerance: z
    .string()
    .trim()
    .max(40)
    .superRefine((t, ctx) => {
      const parsed = parseTolerance(t);
      if (!parsed.ok) ctx.addIssue({ code: 'custom', message: parsed.message });
    })
    .nullable()
    .optional(),
  /** The checker confirms the work carried over from the returned check of an earlier version. */
  confirmCarriedOver: z.literal(true).optional(),
});

export const commentSchema = z.object({
  cellId: z.string().regex(/^[a-z0-9][a-z0-9-]{0,39}$/),
  statementLine: z.number().int().positive().max(INT4_MAX).nullable().default(null),
  body: z.string().trim().min(1, 'write the comment').max(10_000),
  /** The thread answered; absent for a new thread. */
  threadId: z.string().uuid().optional(),
});

export const decisionSchema = z.discriminatedUnion('action', [
  z.object({ action: z.literal('return'), reason: z.string().trim().min(1, 'say why it is returned').max(5000) }),
  z.object({ action: z.literal('sign'), password }),
  z.object({ action: z.literal('approve'), password }),
  z.object({ action: z.literal('reject'), reason: z.string().trim().min(1, 'say why it is returned').max(5000) }),
]);
export type Decision = z.infer<typeof decisionSchema>;

export const queueQuerySchema = z.object({ queue: z.enum(['check', 'approval']).default('check') });

// ── Who did what ──────────────────────────────────────────────────────────────────────────────

async function rolesOf(db: Db, projectId: string, userId: string): Promise<ProjectRole[]> {
  return (
    await db
      .selectFrom('project_members')
      .select('role')
      .where('project_id', '=', projectId)
      .where('user_id', '=', userId)
      .execute()
  ).map((r) => r.role);
}

async function person(
  db: Db,
  projectId: string,
  userId: string,
): Promise<Person & { email: string; passwordHash: string | null; disabled: boolean }> {
  const u = await db
    .selectFrom('users')
    .select(['id', 'display_name', 'email', 'password_hash', 'disabled_at'])
    .where('id', '=', userId)
    .executeTakeFirst();
  if (!u) throw new AppError('not_found', 'No such person.');
  return {
    userId: u.id,
    name: u.display_name,
    email: u.email,
    passwordHash: u.password_hash,
    disabled: u.disabled_at !== null,
    roles: await rolesOf(db, projectId, userId),
  };
}

/** The number of the last approved version of a sheet, or null. */
export async function lastApprovedNumber(db: Db, sheetId: string): Promise<number | null> {
  const row = await db
    .selectFrom('checks')
    .select(sql<number | null>`max(version_number)`.as('n'))
    .where('sheet_id', '=', sheetId)
    .where('state', '=', 'approved')
    .executeTakeFirst();
  return row?.n === null || row?.n === undefined ? null : Number(row.n);
}

/**
 * Everyone who saved a version after `after` (the last approved version): those saved after the
 * version under check count too (a newer version is the same change carried on).
 */
export async function originatorsSince(db: Db, sheetId: string, after: number | null): Promise<Set<string>> {
  let q = db.selectFrom('versions').select('author_id').distinct().where('sheet_id', '=', sheetId);
  if (after !== null) q = q.where('number', '>', after);
  return new Set((await q.execute()).map((r) => r.author_id));
}

/** The safety flag a version records in its content (hashed and immutable); a version without one counts as safety-related. */
const versionSafetyFlag = (alias: 'v') =>
  sql<boolean>`coalesce((${sql.ref(`${alias}.content`)} ->> 'safetyRelated')::boolean, true)`;

/**
 * Who authored or signed anything on version `versionNumber` of a sheet since the last approved
 * version `after`, and the safety flag that version records: the independence rules read this.
 * `current` names the submitter and checker of the submission being made or the check being decided.
 */
export async function participants(
  db: Db,
  sheetId: string,
  after: number | null,
  versionNumber: number,
  current: { preparerId?: string; checkerId?: string } = {},
): Promise<Participants> {
  const originators = await originatorsSince(db, sheetId, after);
  const signed = await db
    .selectFrom('signatures')
    .select(['user_id', 'meaning'])
    .where('sheet_id', '=', sheetId)
    .where('version_number', '=', versionNumber)
    .where('meaning', 'in', ['prepared', 'checked'])
    .execute();
  const version = await db
    .selectFrom('versions as v')
    .select(versionSafetyFlag('v').as('safety_related'))
    .where('v.sheet_id', '=', sheetId)
    .where('v.number', '=', versionNumber)
    .executeTakeFirst();
  const preparers = new Set(signed.filter((s) => s.meaning === 'prepared').map((s) => s.user_id));
  const checkers = new Set(signed.filter((s) => s.meaning === 'checked').map((s) => s.user_id));
  if (current.preparerId) preparers.add(current.preparerId);
  if (current.checkerId) checkers.add(current.checkerId);
  return { originators, preparers, checkers, safetyRelated: version?.safety_related ?? true };
}

// ── Signatures ───────────────────────────────────────────────────────────────────────────────

async function refuse(
  db: Kysely<Database>,
  actor: Actor,
  sheet: { id: string; project_id: string },
  refusal: Refusal,
  attempted: string,
): Promise<never> {
  await recordAudit(db, actor, {
    action: 'workflow.refused',
    objectType: 'sheet',
    objectId: sheet.id,
    projectId: sheet.project_id,
    newValue: { attempted, rule: refusal.rule },
    reason: refusal.message,
  });
  throw new AppError('forbidden', refusal.message, { rule: refusal.rule });
}

/** Re-authentication at the moment of signing (21 CFR Part 11 §11.200(a)(1)). Refusals are audited. */
function confirmPassword(
  db: Kysely<Database>,
  actor: Actor,
  sheet: { id: string; project_id: string },
  meaning: SignatureMeaning,
  given: string,
): Promise<void> {
  return reauthenticateToSign(db, actor, {
    sheet,
    meaning,
    password: given,
    messages: {
      noPassword:
        'Your account has no password (you sign in through single sign-on); set one on your account page to sign records.',
      disabledOrLocked: 'Your account is disabled or locked and cannot sign.',
    },
  });
}

async function sign(
  trx: Transaction<Database>,
  actor: Actor,
  v: { sheetId: string; projectId: string; number: number; sha256: string },
  meaning: SignatureMeaning,
  checkId: string | null,
) {
  const u = await trx
    .selectFrom('users')
    .select('display_name')
    .where('id', '=', actor.userId)
    .executeTakeFirstOrThrow();
  const row = await trx
    .insertInto('signatures')
    .values({
      sheet_id: v.sheetId,
      version_number: v.number,
      version_sha256: v.sha256,
      check_id: checkId,
      user_id: actor.userId,
      printed_name: u.display_name,
      meaning,
    })
    .returning(['id', 'signed_at'])
    .executeTakeFirstOrThrow();
  await recordAudit(trx, actor, {
    action: 'signature.sign',
    objectType: 'sheet',
    objectId: v.sheetId,
    projectId: v.projectId,
    newValue: {
      meaning,
      version: v.number,
      sha256: v.sha256,
      printedName: u.display_name,
      signedAt: new Date(row.signed_at).toISOString(),
      signatureId: row.id,
    },
  });
}

export async function listSignatures(db: Db, sheetId: string) {
  const rows = await db
    .selectFrom('signatures')
    .select(['id', 'version_number', 'version_sha256', 'printed_name', 'meaning', 'signed_at', 'check_id', 'user_id'])
    .where('sheet_id', '=', sheetId)
    .orderBy('signed_at')
    .execute();
  return rows.map((r) => ({
    id: r.id,
    versionNumber: r.version_number,
    sha256: r.version_sha256,
    printedName: r.printed_name,
    meaning: r.meaning,
    signedAt: new Date(r.signed_at).toISOString(),
    checkId: r.check_id,
    userId: r.user_id,
  }));
}

// ── E-mail ───────────────────────────────────────────────────────────────────────────────────

async function notify(
  trx: Transaction<Database>,
  to: Array<{ email: string; name: string }>,
  kind: string,
  subject: string,
  lines: string[],
  link: string,
) {
  const seen = new Set<string>();
  for (const r of to) {
    if (seen.has(r.email)) continue;
    seen.add(r.email);
    await enqueueMail(trx, {
      to: r.email,
      kind,
      subject,
      text: [`Hello ${r.name},`, '', ...lines, '', `Open it: ${link}`, '', '— Worldsheet'].join('\n'),
    });
  }
}

// ── Loading a check ──────────────────────────────────────────────────────────────────────────

async function loadCheck(db: Db, checkId: string) {
  if (!/^[0-9a-f-]{36}$/.test(checkId)) return undefined;
  return db
    .selectFrom('checks as c')
    .innerJoin('sheets as s', 's.id', 'c.sheet_id')
    .innerJoin('projects as p', 'p.id', 'c.project_id')
    .selectAll('c')
    .select(['s.number as sheet_number', 's.title as sheet_title', 'p.code as project_code'])
    .where('c.id', '=', checkId)
    .executeTakeFirst();
}
type CheckRow = NonNullable<Awaited<ReturnType<typeof loadCheck>>>;

/** The check and the caller's roles in its project: 404 unless a member. */
export async function requireCheck(
  db: Kysely<Database>,
  actor: Actor,
  checkId: string,
): Promise<{ check: CheckRow; roles: ProjectRole[] }> {
  const check = await loadCheck(db, checkId);
  const roles = check ? await rolesOf(db, check.project_id, actor.userId) : [];
  if (!check || roles.length === 0)
    throw new AppError('not_found', 'No such check, or you are not a member of its project.');
  return { check, roles };
}

const conflict = (check: { state: CheckState }, wanted: string) =>
  new AppError('conflict', `This check is ${STATE_LABELS[check.state]}; it cannot be ${wanted} now.`, {
    state: check.state,
  });

/** A finding as acknowledged on submission, stored with the check. */
export type StoredAcknowledgement = SubmissionFinding & { text: string };

// ── Submit ───────────────────────────────────────────────────────────────────────────────────

/**
 * The project's checkers, each with the reason they cannot check version `versionNumber` if
 * `submitterId` submitted it now (the submitter signs it prepared and cannot also check it).
 */
export async function eligibleCheckers(
  db: Db,
  sheet: { id: string; project_id: string },
  versionNumber: number,
  submitterId?: string,
) {
  const after = await lastApprovedNumber(db, sheet.id);
  const who = await participants(db, sheet.id, after, versionNumber, { preparerId: submitterId });
  const members = await db
    .selectFrom('project_members as m')
    .innerJoin('users as u', 'u.id', 'm.user_id')
    .select(['u.id', 'u.display_name'])
    .where('m.project_id', '=', sheet.project_id)
    .where('m.role', '=', 'checker')
    .where('u.disabled_at', 'is', null)
    .orderBy('u.display_name')
    .execute();
  return members.map((m) => {
    const refusal = checkerRefusal({ userId: m.id, name: m.display_name, roles: ['checker'] }, who);
    return { userId: m.id, name: m.display_name, eligible: refusal === null, reason: refusal?.message ?? null };
  });
}

export async function submitForCheck(
  db: Kysely<Database>,
  actor: Actor,
  sheet: { id: string; project_id: string; number: number; title: string },
  raw: z.input<typeof submitSchema>,
) {
  const input = { ...raw, acknowledgements: raw.acknowledgements ?? [] };
  const version = await getVersion(db, sheet.id, input.versionNumber);
  if (!version) throw new AppError('not_found', `Version ${input.versionNumber} does not exist.`);
  const after = await lastApprovedNumber(db, sheet.id);
  if (after !== null && input.versionNumber <= after) {
    throw new AppError('conflict', `Version ${after} is already approved; submit a later version.`, {
      lastApproved: after,
    });
  }
  const checker = await person(db, sheet.project_id, input.checkerId);
  if (checker.disabled) throw new AppError('bad_request', `${checker.name}'s account is disabled.`);
  // The submitter signs it prepared: they count as its preparer, beside everyone who authored or signed it.
  const refusal = checkerRefusal(
    checker,
    await participants(db, sheet.id, after, input.versionNumber, { preparerId: actor.userId }),
  );
  if (refusal) await refuse(db, actor, sheet, refusal, 'submit');
  // Nothing is signed on a broken or unsupported sheet without the originator's written word on each item.
  const findings = submissionFindings(version.content, version.results);
  const { missing, unknown } = unacknowledged(findings, input.acknowledgements);
  if (unknown.length > 0)
    throw new AppError(
      'bad_request',
      `Acknowledgements name items this version does not have: ${unknown.join(', ')}.`,
      { unknownAcknowledgements: unknown },
    );
  if (missing.length > 0) {
    throw new AppError(
      'bad_request',
      `Version ${version.number} has ${missing.length === 1 ? 'an item' : `${missing.length} items`} to acknowledge in writing before it can be submitted: ${missing.map((f) => f.message).join('; ')}`,
      { acknowledgementsNeeded: findings },
    );
  }
  const texts = new Map(input.acknowledgements.map((a) => [a.key, a.text.trim()]));
  const acknowledgements: StoredAcknowledgement[] = findings.map((f) => ({ ...f, text: texts.get(f.key)! }));
  await confirmPassword(db, actor, sheet, 'prepared', input.password);

  const project = await db
    .selectFrom('projects')
    .select('code')
    .where('id', '=', sheet.project_id)
    .executeTakeFirstOrThrow();
  const code = formatSheetNumber(project.code, sheet.number);
  try {
    return await db.transaction().execute(async (trx) => {
      const check = await trx
        .insertInto('checks')
        .values({
          sheet_id: sheet.id,
          project_id: sheet.project_id,
          version_number: version.number,
          version_sha256: version.sha256,
          base_version_number: after,
          submitted_by: actor.userId,
          checker_id: checker.userId,
          acknowledgements: JSON.stringify(acknowledgements),
        })
        .returning(['id'])
        .executeTakeFirstOrThrow();
      await sign(
        trx,
        actor,
        { sheetId: sheet.id, projectId: sheet.project_id, number: version.number, sha256: version.sha256 },
        'prepared',
        check.id,
      );
      await carryOverWork(trx, actor, { id: check.id, sheetId: sheet.id, projectId: sheet.project_id });
      await recordAudit(trx, actor, {
        action: 'check.submit',
        objectType: 'check',
        objectId: check.id,
        projectId: sheet.project_id,
        newValue: {
          sheet: code,
          version: version.number,
          sha256: version.sha256,
          checker: checker.name,
          base: after,
          acknowledgements,
        },
      });
      await notify(
        trx,
        [checker],
        'check-submitted',
        `${code} version ${version.number} is submitted to you for check`,
        [
          `${actor.name} submitted version ${version.number} of ${code} "${sheet.title}" for your check.`,
          after === null
            ? 'It is a first check: review the whole sheet.'
            : `Review it against version ${after}, the last approved one.`,
        ],
        `${appUrl()}/checks/${check.id}`,
      );
      return { id: check.id, state: 'in_check' as const, versionNumber: version.number, sha256: version.sha256 };
    });
  } catch (error) {
    if ((error as { constraint?: string }).constraint === 'checks_one_open_per_sheet') {
      const open = await db
        .selectFrom('checks')
        .select(['id', 'state', 'version_number'])
        .where('sheet_id', '=', sheet.id)
        .where('state', 'in', ['in_check', 'checked'])
        .executeTakeFirst();
      throw new AppError(
        'conflict',
        `Version ${open?.version_number} of this sheet is ${open ? STATE_LABELS[open.state] : 'under check'}; one submission at a time.`,
        { checkId: open?.id, state: open?.state },
      );
    }
    throw error;
  }
}

// ── The checker's work and comments ──────────────────────────────────────────────────────────

type ThreadScope = Pick<CheckRow, 'id' | 'sheet_id' | 'base_version_number'>;

/** The check's creation time, read in SQL (a JavaScript Date would lose the microseconds). */
const createdAtOf = (db: Db, checkId: string) =>
  db.selectFrom('checks as me').select('me.created_at').where('me.id', '=', checkId);

/**
 * The first comments of the threads a check carries: those opened on it, and those opened on the
 * earlier checks of the same sheet against the same base (versions returned with comments and
 * submitted again) that were still open when it was submitted. So a comment is answered after the
 * return and resolved by the checker at the resubmission, and signing waits for it.
 */
function threadRoots(db: Db, check: ThreadScope) {
  return db
    .selectFrom('check_comments as t')
    .innerJoin('checks as k', 'k.id', 't.check_id')
    .where('t.thread_id', 'is', null)
    .where((eb) =>
      eb.or([
        eb('t.check_id', '=', check.id),
        eb.and([
          eb('k.sheet_id', '=', check.sheet_id),
          sql<boolean>`k.base_version_number is not distinct from ${check.base_version_number}`,
          eb('k.created_at', '<', createdAtOf(db, check.id)),
          eb.or([eb('t.resolved_at', 'is', null), eb('t.resolved_at', '>=', createdAtOf(db, check.id))]),
        ]),
      ]),
    );
}

/** A returned check stays open to replies until the sheet is submitted again. */
async function submittedAgain(db: Db, check: ThreadScope): Promise<boolean> {
  return (
    (await db
      .selectFrom('checks')
      .select('id')
      .where('sheet_id', '=', check.sheet_id)
      .where('created_at', '>', createdAtOf(db, check.id))
      .executeTakeFirst()) !== undefined
  );
}

/** JSON with the keys of every object sorted (jsonb stores keys in its own order). */
const canonicalJson = (v: unknown): string =>
  JSON.stringify(v, (_k, x) =>
    x && typeof x === 'object' && !Array.isArray(x)
      ? Object.fromEntries(Object.entries(x).sort(([a], [b]) => (a < b ? -1 : 1)))
      : x,
  );

export async function saveCheckWork(
  db: Kysely<Database>,
  actor: Actor,
  checkId: string,
  input: z.infer<typeof checkWorkSchema>,
) {
  const { check } = await requireCheck(db, actor, checkId);
  if (check.checker_id !== actor.userId)
    throw new AppError('forbidden', 'Only the checker named on this check records its work.');
  if (check.state !== 'in_check') throw conflict(check, 'changed');
  let results: SheetResult | null | undefined;
  if (input.alternateCells) {
    // Evaluated as a save (stored with the check), with the checked version's settings and the sheet's citations.
    results = input.alternateCells.length
      ? (
          await evaluateInContext(db, {
            cells: input.alternateCells,
            settings: { ofVersion: check.version_number },
            sheet: { id: check.sheet_id, projectId: check.project_id },
            run: { kind: 'save', userId: actor.userId, affinity: `check:${check.id}` },
          })
        ).results
      : null;
  }
  const given = {
    method: input.verificationMethod !== undefined,
    notes: input.checkerNotes !== undefined,
    cells: input.alternateCells !== undefined,
    tolerance: input.tolerance !== undefined,
    confirm: input.confirmCarriedOver === true,
  };
  if (!given.method && !given.notes && !given.cells && !given.tolerance && !given.confirm)
    return { ok: true, alternateResults: null };
  return db.transaction().execute(async (trx) => {
    // The values before the change, read under a row lock, so that the audit event records them exactly.
    const before = await trx
      .selectFrom('checks')
      .select(['state', 'verification_method', 'checker_notes', 'alternate_cells', 'tolerance_text', 'carried_over'])
      .where('id', '=', check.id)
      .forUpdate()
      .executeTakeFirstOrThrow();
    if (before.state !== 'in_check') throw conflict(before, 'changed');
    const tolerance = input.tolerance ? parseTolerance(input.tolerance) : null;
    // A carried-over field the checker changes is their own work from now on; one saved unchanged stays marked.
    const edited = new Set<CarriedField>();
    if (given.method && input.verificationMethod !== before.verification_method) edited.add('verificationMethod');
    if (given.notes && input.checkerNotes !== before.checker_notes) edited.add('checkerNotes');
    if (given.cells && canonicalJson(input.alternateCells) !== canonicalJson(before.alternate_cells))
      edited.add('alternateCells');
    if (given.tolerance && (input.tolerance ?? null) !== before.tolerance_text) edited.add('tolerance');
    const carriedBefore = readCarriedOver(before.carried_over);
    if (given.confirm && !carriedBefore)
      throw new AppError('conflict', 'This check carries over no work from an earlier check.');
    const carried = carriedBefore
      ? {
          ...carriedBefore,
          fields: carriedBefore.fields.filter((f) => !edited.has(f)),
          ...(given.confirm && !carriedBefore.confirmedAt
            ? { confirmedAt: new Date().toISOString(), confirmedBy: actor.name }
            : {}),
        }
      : null;
    await trx
      .updateTable('checks')
      .set({
        ...(given.method ? { verification_method: input.verificationMethod } : {}),
        ...(given.notes ? { checker_notes: input.checkerNotes } : {}),
        ...(input.alternateCells
          ? {
              alternate_cells: JSON.stringify(input.alternateCells),
              alternate_results: results ? JSON.stringify(results) : null,
            }
          : {}),
        ...(given.tolerance
          ? { tolerance: tolerance?.ok ? tolerance.value : null, tolerance_text: input.tolerance || null }
          : {}),
        ...(carried ? { carried_over: JSON.stringify(carried) } : {}),
        updated_at: sql`now()`,
      })
      .where('id', '=', check.id)
      .execute();
    const oldValue: Record<string, unknown> = {};
    const newValue: Record<string, unknown> = {};
    if (given.method)
      [oldValue.verificationMethod, newValue.verificationMethod] = [
        before.verification_method,
        input.verificationMethod,
      ];
    if (given.notes) [oldValue.checkerNotes, newValue.checkerNotes] = [before.checker_notes, input.checkerNotes];
    if (given.cells)
      [oldValue.alternateCells, newValue.alternateCells] = [before.alternate_cells, input.alternateCells];
    if (given.tolerance) [oldValue.tolerance, newValue.tolerance] = [before.tolerance_text, input.tolerance || null];
    if (carried && JSON.stringify(carried) !== JSON.stringify(carriedBefore))
      [oldValue.carriedOver, newValue.carriedOver] = [carriedBefore, carried];
    await recordAudit(trx, actor, {
      action: 'check.work',
      objectType: 'check',
      objectId: check.id,
      projectId: check.project_id,
      oldValue,
      newValue,
    });
    return { ok: true, alternateResults: results ?? null };
  });
}

export async function addComment(
  db: Kysely<Database>,
  actor: Actor,
  checkId: string,
  input: z.infer<typeof commentSchema>,
) {
  const { check } = await requireCheck(db, actor, checkId);
  const isChecker = check.checker_id === actor.userId;
  if (!mayAnswerThreads(check, actor.userId))
    throw new AppError(
      'forbidden',
      'Only the people of this check (the person who submitted it, its checker and its approver) comment on it.',
    );
  const answeringReturn =
    input.threadId !== undefined &&
    (check.state === 'returned' || check.state === 'approval_returned') &&
    !(await submittedAgain(db, check));
  if (check.state !== 'in_check' && !answeringReturn) throw conflict(check, 'commented on');
  if (!input.threadId && !isChecker)
    throw new AppError('forbidden', 'The checker opens comment threads; originators answer them.');
  let cellId = input.cellId;
  let line = input.statementLine;
  if (input.threadId) {
    const thread = await threadRoots(db, check)
      .select(['t.id', 't.cell_id', 't.statement_line', 't.thread_id', 't.resolved_at'])
      .where('t.id', '=', input.threadId)
      .executeTakeFirst();
    if (!thread || thread.thread_id !== null) throw new AppError('not_found', 'No such comment thread on this check.');
    if (thread.resolved_at) throw new AppError('conflict', 'This thread is resolved.');
    cellId = thread.cell_id;
    line = thread.statement_line;
  } else {
    const version = await getVersion(db, check.sheet_id, check.version_number);
    const base = check.base_version_number ? await getVersion(db, check.sheet_id, check.base_version_number) : null;
    const known = new Set(
      [
        ...(version?.content.cells ?? []),
        ...(base?.content.cells ?? []),
        ...((check.alternate_cells as Cell[]) ?? []),
      ].map((c) => c.id),
    );
    if (!known.has(cellId)) throw new AppError('bad_request', `cellId: the version under check has no cell ${cellId}`);
  }
  return db.transaction().execute(async (trx) => {
    const row = await trx
      .insertInto('check_comments')
      .values({
        check_id: check.id,
        thread_id: input.threadId ?? null,
        cell_id: cellId,
        statement_line: line,
        author_id: actor.userId,
        body: input.body,
      })
      .returning(['id', 'created_at'])
      .executeTakeFirstOrThrow();
    await recordAudit(trx, actor, {
      action: input.threadId ? 'comment.reply' : 'comment.open',
      objectType: 'check',
      objectId: check.id,
      projectId: check.project_id,
      newValue: { commentId: row.id, cellId, line },
    });
    return { id: row.id };
  });
}

export async function resolveThread(db: Kysely<Database>, actor: Actor, checkId: string, commentId: string) {
  const { check } = await requireCheck(db, actor, checkId);
  if (check.checker_id !== actor.userId) throw new AppError('forbidden', 'Only the checker resolves comment threads.');
  if (check.state !== 'in_check') throw conflict(check, 'changed');
  // Not a uuid: no such thread (rather than PostgreSQL's error about the uuid's syntax).
  if (!/^[0-9a-f-]{36}$/.test(commentId)) throw new AppError('conflict', 'No open thread with this id on this check.');
  return db.transaction().execute(async (trx) => {
    const row = await trx
      .updateTable('check_comments')
      .set({ resolved_at: sql`now()`, resolved_by: actor.userId })
      .where('id', '=', commentId)
      .where('id', 'in', threadRoots(trx, check).select('t.id'))
      .where('resolved_at', 'is', null)
      .returning('id')
      .executeTakeFirst();
    if (!row) throw new AppError('conflict', 'No open thread with this id on this check.');
    await recordAudit(trx, actor, {
      action: 'comment.resolve',
      objectType: 'check',
      objectId: check.id,
      projectId: check.project_id,
      newValue: { commentId },
    });
    return { ok: true };
  });
}

// ── Decisions ────────────────────────────────────────────────────────────────────────────────

export async function decide(db: Kysely<Database>, actor: Actor, checkId: string, decision: Decision) {
  const { check, roles } = await requireCheck(db, actor, checkId);
  const sheet = { id: check.sheet_id, project_id: check.project_id };
  const code = formatSheetNumber(check.project_code, check.sheet_number);
  const link = `${appUrl()}/checks/${check.id}`;
  const version = {
    sheetId: check.sheet_id,
    projectId: check.project_id,
    number: check.version_number,
    sha256: check.version_sha256,
  };
  // Everyone who authored or signed anything on the version, read again at every transition.
  const who = await participants(db, check.sheet_id, check.base_version_number, check.version_number, {
    preparerId: check.submitted_by,
    checkerId: check.checker_id,
  });
  const submitter = await person(db, check.project_id, check.submitted_by);
  const checker = await person(db, check.project_id, check.checker_id);
  const me = await person(db, check.project_id, actor.userId);

  if (decision.action === 'return' || decision.action === 'sign') {
    if (check.checker_id !== actor.userId)
      throw new AppError(
        'forbidden',
        `Only ${checker.name}, the checker named on this check, can ${decision.action === 'sign' ? 'sign it as checked' : 'return it'}.`,
      );
    if (check.state !== 'in_check')
      throw conflict(check, decision.action === 'sign' ? 'signed as checked' : 'returned');
    // The rules are checked again at the decision: roles may have changed since the submission.
    const refusal = checkerRefusal(me, who);
    if (refusal) await refuse(db, actor, sheet, refusal, decision.action);
  } else {
    if (check.state !== 'checked')
      throw conflict(check, decision.action === 'approve' ? 'approved' : 'returned by an approver');
    const refusal = approverRefusal({ ...me, roles }, who);
    if (refusal) await refuse(db, actor, sheet, refusal, decision.action);
  }

  if (decision.action === 'sign') {
    const open = await threadRoots(db, check)
      .select(sql<number>`count(*)`.as('n'))
      .where('t.resolved_at', 'is', null)
      .executeTakeFirstOrThrow();
    if (Number(open.n) > 0)
      throw new AppError(
        'conflict',
        `${open.n} comment thread${Number(open.n) === 1 ? ' is' : 's are'} still open; resolve every thread before signing as checked.`,
        { openThreads: Number(open.n) },
      );
    if (!check.verification_method)
      throw new AppError(
        'bad_request',
        'Record the verification method (design review, alternate calculation or qualification test) before signing.',
      );
    const carried = readCarriedOver(check.carried_over);
    const pending = unconfirmedCarriedOver(carried);
    if (pending.length) {
      throw new AppError(
        'conflict',
        `The ${carriedFieldsText(pending)} ${pending.length === 1 ? 'is' : 'are'} still as carried over from the check of version ${carried!.fromVersion}; confirm or edit ${pending.length === 1 ? 'it' : 'them'} before signing.`,
        { carriedOver: pending },
      );
    }
    if (check.tolerance === null && check.alternate_results) {
      const v = await getVersion(db, check.sheet_id, check.version_number);
      if (compareAlternate(v?.results, check.alternate_results as SheetResult, null).rows.length) {
        throw new AppError(
          'bad_request',
          'State the tolerance of the comparison between the alternate calculation and the sheet before signing.',
        );
      }
    }
  }
  if (decision.action === 'sign' || decision.action === 'approve')
    await confirmPassword(db, actor, sheet, decision.action === 'sign' ? 'checked' : 'approved', decision.password);

  const target: Record<Decision['action'], CheckState> = {
    return: 'returned',
    sign: 'checked',
    approve: 'approved',
    reject: 'approval_returned',
  };
  const from: CheckState = decision.action === 'return' || decision.action === 'sign' ? 'in_check' : 'checked';
  const state = target[decision.action];
  const reason = decision.action === 'return' || decision.action === 'reject' ? decision.reason : null;

  return db.transaction().execute(async (trx) => {
    const moved = await trx
      .updateTable('checks')
      .set({
        state,
        decided_by: actor.userId,
        updated_at: sql`now()`,
        ...(reason ? { return_reason: reason } : {}),
        ...(state !== 'checked' ? { closed_at: sql`now()` } : {}),
      })
      .where('id', '=', check.id)
      .where('state', '=', from)
      .returning('id')
      .executeTakeFirst();
    if (!moved) {
      // Someone else decided first: their outcome stands.
      const now = await trx.selectFrom('checks').select('state').where('id', '=', check.id).executeTakeFirstOrThrow();
      throw conflict(now, 'decided again');
    }
    if (decision.action === 'sign') await sign(trx, actor, version, 'checked', check.id);
    if (decision.action === 'approve') await sign(trx, actor, version, 'approved', check.id);
    await recordAudit(trx, actor, {
      action: `check.${decision.action}`,
      objectType: 'check',
      objectId: check.id,
      projectId: check.project_id,
      oldValue: { state: from },
      newValue: { state, version: check.version_number, sha256: check.version_sha256 },
      reason: reason ?? undefined,
    });
    const v = `${code} version ${check.version_number}`;
    if (decision.action === 'return') {
      await notify(
        trx,
        [submitter],
        'check-returned',
        `${v} is returned with comments`,
        [
          `${actor.name} returned ${v} "${check.sheet_title}" with comments.`,
          `Reason: ${reason}`,
          'Answer the comments and submit a new version.',
        ],
        link,
      );
    } else if (decision.action === 'sign') {
      const approvers = await trx
        .selectFrom('project_members as m')
        .innerJoin('users as u', 'u.id', 'm.user_id')
        .select(['u.id', 'u.email', 'u.display_name'])
        .where('m.project_id', '=', check.project_id)
        .where('m.role', '=', 'approver')
        .where('u.disabled_at', 'is', null)
        .execute();
      const eligible = approvers.filter(
        (a) => !approverRefusal({ userId: a.id, name: a.display_name, roles: ['approver'] }, who),
      );
      await notify(
        trx,
        [submitter],
        'check-checked',
        `${v} is checked`,
        [`${actor.name} signed ${v} "${check.sheet_title}" as checked. It now awaits approval.`],
        link,
      );
      await notify(
        trx,
        eligible.map((a) => ({ email: a.email, name: a.display_name })),
        'approval-requested',
        `${v} awaits your approval`,
        [`${v} "${check.sheet_title}" is checked by ${actor.name} and awaits approval.`],
        link,
      );
    } else if (decision.action === 'approve') {
      await notify(
        trx,
        [submitter, checker],
        'check-approved',
        `${v} is approved`,
        [`${actor.name} approved ${v} "${check.sheet_title}".`, 'Document control can now issue it as a revision.'],
        link,
      );
    } else {
      await notify(
        trx,
        [submitter, checker],
        'approval-returned',
        `${v} is returned by the approver`,
        [`${actor.name} did not approve ${v} "${check.sheet_title}".`, `Reason: ${reason}`],
        link,
      );
    }
    return { id: check.id, state };
  });
}

// ── Reading ──────────────────────────────────────────────────────────────────────────────────

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
  const comparison: VersionComparison = await compareStoredVersions(db, check.sheet_id, base ?? null, version);
  // A re-check after a return: what changed since the version that was returned comes first.
  const returned = await returnedCheckBefore(db, check);
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
  const who = await participants(db, check.sheet_id, check.base_version_number, check.version_number, {
    preparerId: check.submitted_by,
    checkerId: check.checker_id,
  });
  const me = { userId: actor.userId, name: actor.name, roles };
  const isChecker = check.checker_id === actor.userId;
  const actions: Decision['action'][] = [];
  const checkerProblem = check.state === 'in_check' && isChecker ? checkerRefusal(me, who) : null;
  if (check.state === 'in_check' && isChecker && !checkerProblem) actions.push('return', 'sign');
  const approverProblem = approverRefusal(me, who);
  const answeringReturn =
    (check.state === 'returned' || check.state === 'approval_returned') &&
    threads.some((t) => !t.resolvedAt) &&
    !(await submittedAgain(db, check));
  if (check.state === 'checked' && !approverProblem) actions.push('approve', 'reject');
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
      isChecker,
      canComment: (check.state === 'in_check' || answeringReturn) && mayAnswerThreads(check, actor.userId),
      canOpenThreads: check.state === 'in_check' && isChecker,
      actions,
      approverRefusal:
        check.state === 'checked' && roles.includes('approver') ? (approverProblem?.message ?? null) : null,
      /** Why the named checker may not return or sign it (the rules read again at every transition). */
      checkerRefusal: checkerProblem?.message ?? null,
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
      'c.checker_id',
      'c.submitted_by as submitter_id',
      'c.base_version_number',
      'c.sheet_id',
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
      const who = await participants(db, r.sheet_id, r.base_version_number, r.version_number, {
        preparerId: r.submitter_id,
        checkerId: r.checker_id,
      });
      const refusal = approverRefusal({ userId: actor.userId, name: actor.name, roles: ['approver'] }, who);
      eligible = refusal === null;
      reason = refusal?.message ?? null;
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
export { SHEET_STATUS_LABELS } from './status';

export const resolveSchema = z.object({ resolved: z.literal(true) });
