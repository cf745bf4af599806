// The decisions on a check, by the transition table (transitions.ts): the checker returns the version
// or signs it "checked", an approver approves it (signed "approved") or returns it. The policy
// (policy.ts) is enforced first, then the password is asked again for a signature, and the move is
// one guarded UPDATE in a transaction with its signature, audit event and e-mails, so two people
// acting at once record exactly one outcome.
import { sql, type Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { recordAudit } from '@/lib/audit/record';
import { AppError } from '@/lib/errors/app-error';
import { appUrl } from '@/lib/http/app-url';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { enforce, policyFor, requireCheck } from './context';
import { notify } from './notify';
import { person } from './participants';
import { stateConflict } from './policy';
import { approverRefusal } from './rules';
import { confirmPassword, sign } from './signing';
import { TRANSITIONS } from './transitions';
import type { Decision } from './workflow';

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
  const submitter = await person(db, check.project_id, check.submitted_by);
  const checker = await person(db, check.project_id, check.checker_id);
  const me = await person(db, check.project_id, actor.userId);
  // The policy, read again at every decision: roles, authors and the check's work may have changed.
  const { policy, facts } = await policyFor(db, check, { userId: actor.userId, name: me.name }, roles);
  await enforce(db, actor, check, policy[decision.action], decision.action);
  const t = TRANSITIONS[decision.action];
  // Re-authentication at the moment of signing; a decision that signs always carries a password (decisionSchema).
  if (t.signs) await confirmPassword(db, actor, sheet, t.signs, 'password' in decision ? decision.password : '');
  const { from, to: state } = t;
  const reason = decision.action === 'return' || decision.action === 'reject' ? decision.reason : null;
  const who = facts.participants;

  return db.transaction().execute(async (trx) => {
    const moved = await trx
      .updateTable('checks')
      .set({
        state,
        decided_by: actor.userId,
        updated_at: sql`now()`,
        ...(reason ? { return_reason: reason } : {}),
        ...(t.closes ? { closed_at: sql`now()` } : {}),
      })
      .where('id', '=', check.id)
      .where('state', '=', from)
      .returning('id')
      .executeTakeFirst();
    if (!moved) {
      // Someone else decided first: their outcome stands.
      const now = await trx.selectFrom('checks').select('state').where('id', '=', check.id).executeTakeFirstOrThrow();
      const conflict = stateConflict(now.state, 'decided again');
      throw new AppError(conflict.code, conflict.reason, conflict.details);
    }
    if (t.signs) await sign(trx, actor, version, t.signs, check.id);
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
