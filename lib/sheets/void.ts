// Voiding a sheet started by mistake. The sheet stays in the register, marked void, with every
// version it had; nothing is deleted. Once void it takes no new version, check or revision: the
// database refuses them (migration 20261204T032000_sheet_void), and saveVersion says so first.
//
// Who may void: the person who created the sheet, while they hold the originator role on the
// project, or a document controller of the project (who keeps the register). Refused when the sheet
// has any issued revision (whatever its status now: an issued revision is withdrawn, not voided) and
// while a check is open on it (in check, or checked and awaiting approval): the check is finished or
// returned first, so no checker's or approver's work is silently discarded.
import type { Kysely } from 'kysely';
import { z } from 'zod';
import type { Database, ProjectRole } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { recordAudit } from '@/lib/audit/record';
import { AppError } from '@/lib/errors/app-error';

export const voidSheetSchema = z.object({
  reason: z.string().trim().min(1, 'say why the sheet is void').max(2000),
});

/** May this person void this sheet (ignoring its state)? The one rule, used by the route and the page. */
export function mayVoidSheet(actor: Actor, roles: readonly ProjectRole[], sheet: { created_by: string }): boolean {
  return roles.includes('controller') || (roles.includes('originator') && sheet.created_by === actor.userId);
}

export async function voidSheet(
  db: Kysely<Database>,
  actor: Actor,
  roles: readonly ProjectRole[],
  sheetId: string,
  raw: z.input<typeof voidSheetSchema>,
): Promise<{ voidedAt: Date; reason: string }> {
  const input = voidSheetSchema.parse(raw);
  return db.transaction().execute(async (trx) => {
    const sheet = await trx
      .selectFrom('sheets')
      .select(['id', 'project_id', 'created_by', 'voided_at'])
      .where('id', '=', sheetId)
      .forUpdate()
      .executeTakeFirst();
    if (!sheet) throw new AppError('not_found', 'No such sheet.');
    if (!mayVoidSheet(actor, roles, sheet)) {
      throw new AppError(
        'forbidden',
        'Only the originator who created the sheet or a document controller of the project can void it.',
      );
    }
    if (sheet.voided_at) throw new AppError('conflict', 'The sheet is already void.', { voided: true });
    const revision = await trx
      .selectFrom('revisions')
      .select('code')
      .where('sheet_id', '=', sheet.id)
      .orderBy('issued_at')
      .limit(1)
      .executeTakeFirst();
    if (revision) {
      throw new AppError(
        'conflict',
        `The sheet was issued (revision ${revision.code}); an issued sheet is withdrawn, never voided.`,
        { issuedRevision: revision.code },
      );
    }
    const open = await trx
      .selectFrom('checks')
      .select(['version_number', 'state'])
      .where('sheet_id', '=', sheet.id)
      .where('state', 'in', ['in_check', 'checked'])
      .limit(1)
      .executeTakeFirst();
    if (open) {
      throw new AppError(
        'conflict',
        `Version ${open.version_number} is ${open.state === 'in_check' ? 'in check' : 'checked and awaiting approval'}; it must be decided or returned before the sheet can be voided.`,
        {
          openCheckVersion: open.version_number,
        },
      );
    }
    const voidedAt = new Date();
    await trx
      .updateTable('sheets')
      .set({ voided_at: voidedAt, voided_by: actor.userId, void_reason: input.reason })
      .where('id', '=', sheet.id)
      .execute();
    await recordAudit(trx, actor, {
      action: 'sheet.void',
      objectType: 'sheet',
      objectId: sheet.id,
      projectId: sheet.project_id,
      oldValue: { status: 'active' },
      newValue: { status: 'void' },
      reason: input.reason,
    });
    return { voidedAt, reason: input.reason };
  });
}
