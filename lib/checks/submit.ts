// Submitting a version for check: the originator names a checker (the independence rules of
// rules.ts decide who may check it), acknowledges in writing every finding of the version
// (submission-findings.ts), and signs it "prepared"; the check starts with the work carried over
// from a returned check (carry-over.ts), and the checker is told by e-mail.
import type { Kysely, Transaction } from 'kysely';
import type { z } from 'zod';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { recordAudit } from '@/lib/audit/record';
import { AppError } from '@/lib/errors/app-error';
import { appUrl } from '@/lib/http/app-url';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { getVersion } from '@/lib/sheets/sheets';
import { carryOverWork } from './carry-over';
import { refuse } from './context';
import { notify } from './notify';
import { lastApprovedNumber, participants, person } from './participants';
import { checkerRefusal } from './rules';
import { confirmPassword, sign } from './signing';
import { submissionFindings, unacknowledged } from './submission-findings';
import { STATE_LABELS, type StoredAcknowledgement, type submitSchema } from './workflow';

type Db = Kysely<Database> | Transaction<Database>;

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
