// A check as the mutations and the read model load it: the row (404 unless the caller is a member
// of its project), the comment threads it carries, the facts the policy (policy.ts) needs, and the
// enforcement of the policy's answer (the refusal it names, audited when an independence rule refuses).
import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database, ProjectRole } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { recordAudit } from '@/lib/audit/record';
import type { SheetResult } from '@/lib/calc/types';
import { AppError } from '@/lib/errors/app-error';
import { getVersion } from '@/lib/sheets/sheets';
import { compareAlternate } from './alternate-comparison';
import { readCarriedOver } from './carried-over';
import { participants, rolesOf } from './participants';
import { checkPolicy, type Answer, type CheckPolicy, type PolicyActor, type PolicyFacts } from './policy';
import type { Refusal } from './rules';

type Db = Kysely<Database> | Transaction<Database>;

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
export type CheckRow = NonNullable<Awaited<ReturnType<typeof loadCheck>>>;

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

export type ThreadScope = Pick<CheckRow, 'id' | 'sheet_id' | 'base_version_number'>;

/** The check's creation time, read in SQL (a JavaScript Date would lose the microseconds). */
const createdAtOf = (db: Db, checkId: string) =>
  db.selectFrom('checks as me').select('me.created_at').where('me.id', '=', checkId);

/**
 * The first comments of the threads a check carries: those opened on it, and those opened on the
 * earlier checks of the same sheet against the same base (versions returned with comments and
 * submitted again) that were still open when it was submitted. So a comment is answered after the
 * return and resolved by the checker at the resubmission, and signing waits for it.
 */
export function threadRoots(db: Db, check: ThreadScope) {
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

/** Refuses `attempted` by an independence rule: audited as `workflow.refused`, then 403 with `details.rule`. */
export async function refuse(
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

/**
 * What the policy needs to know about a check beyond its row. `versionResults` spares reading the
 * version again when the caller has it (the tolerance is needed only when names are shared).
 */
async function policyFacts(db: Db, check: CheckRow, versionResults?: SheetResult | null): Promise<PolicyFacts> {
  const [who, checker, open, again] = await Promise.all([
    participants(db, check.sheet_id, check.base_version_number, check.version_number, {
      preparerId: check.submitted_by,
      checkerId: check.checker_id,
    }),
    db.selectFrom('users').select('display_name').where('id', '=', check.checker_id).executeTakeFirstOrThrow(),
    threadRoots(db, check)
      .select(sql<number>`count(*)`.as('n'))
      .where('t.resolved_at', 'is', null)
      .executeTakeFirstOrThrow(),
    submittedAgain(db, check),
  ]);
  let toleranceMissing = false;
  if (check.tolerance === null && check.alternate_results) {
    const results =
      versionResults !== undefined
        ? versionResults
        : (await getVersion(db, check.sheet_id, check.version_number))?.results;
    toleranceMissing = compareAlternate(results, check.alternate_results as SheetResult, null).rows.length > 0;
  }
  return {
    participants: who,
    checkerName: checker.display_name,
    openThreads: Number(open.n),
    submittedAgain: again,
    carriedOver: readCarriedOver(check.carried_over),
    toleranceMissing,
  };
}

/** The policy's answers for `actor` on a loaded check. */
export async function policyFor(
  db: Db,
  check: CheckRow,
  actor: PolicyActor,
  roles: readonly ProjectRole[],
  versionResults?: SheetResult | null,
): Promise<{ policy: CheckPolicy; facts: PolicyFacts }> {
  const facts = await policyFacts(db, check, versionResults);
  return { policy: checkPolicy(check, actor, roles, facts), facts };
}

/**
 * Carries out the policy's answer: nothing when allowed; otherwise the refusal it names (an
 * independence rule audited and 403 with the rule; any other reason with its own status and details).
 */
export async function enforce(
  db: Kysely<Database>,
  actor: Actor,
  check: Pick<CheckRow, 'sheet_id' | 'project_id'>,
  answer: Answer,
  attempted: string,
): Promise<void> {
  if (answer.allowed) return;
  if (answer.rule)
    await refuse(
      db,
      actor,
      { id: check.sheet_id, project_id: check.project_id },
      { rule: answer.rule, message: answer.reason },
      attempted,
    );
  throw new AppError(answer.code, answer.reason, answer.details);
}
