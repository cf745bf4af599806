// The checker's work carries over a return: when a sheet returned by its checker (or its approver)
// is submitted again, the new check starts with the verification method, notes, alternate
// calculation and tolerance of the returned check, marked "from the check of version N". The mark
// stays on each field until the checker edits it, and the checker confirms what is left before
// signing as checked; the approval view shows what is still carried over. Audited as
// `check.carry_over` and, at the confirmation, in `check.work`.
import type { Transaction } from 'kysely';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { recordAudit } from '@/lib/audit/record';
import type { CarriedField, CarriedOver } from './carried-over';

export * from './carried-over';

/**
 * Copies the work of the sheet's latest earlier check into the new check `checkId` when that check
 * was returned (by its checker or its approver) and recorded any work. Runs in the submission's
 * transaction.
 */
export async function carryOverWork(
  trx: Transaction<Database>,
  actor: Actor,
  check: { id: string; sheetId: string; projectId: string },
): Promise<CarriedOver | null> {
  const earlier = await trx
    .selectFrom('checks')
    .select([
      'id',
      'state',
      'version_number',
      'verification_method',
      'checker_notes',
      'alternate_cells',
      'alternate_results',
      'tolerance',
      'tolerance_text',
    ])
    .where('sheet_id', '=', check.sheetId)
    .where('id', '<>', check.id)
    .orderBy('created_at', 'desc')
    .limit(1)
    .executeTakeFirst();
  if (!earlier || (earlier.state !== 'returned' && earlier.state !== 'approval_returned')) return null;
  const cells = Array.isArray(earlier.alternate_cells) ? earlier.alternate_cells : [];
  const fields: CarriedField[] = [];
  if (earlier.verification_method) fields.push('verificationMethod');
  if (earlier.checker_notes.trim()) fields.push('checkerNotes');
  if (cells.length) fields.push('alternateCells');
  if (earlier.tolerance !== null) fields.push('tolerance');
  if (fields.length === 0) return null;
  const carried: CarriedOver = {
    fromCheckId: earlier.id,
    fromVersion: earlier.version_number,
    fields,
    confirmedAt: null,
    confirmedBy: null,
  };
  await trx
    .updateTable('checks')
    .set({
      verification_method: earlier.verification_method,
      checker_notes: earlier.checker_notes,
      alternate_cells: JSON.stringify(cells),
      alternate_results: earlier.alternate_results ? JSON.stringify(earlier.alternate_results) : null,
      tolerance: earlier.tolerance,
      tolerance_text: earlier.tolerance_text,
      carried_over: JSON.stringify(carried),
    })
    .where('id', '=', check.id)
    .execute();
  await recordAudit(trx, actor, {
    action: 'check.carry_over',
    objectType: 'check',
    objectId: check.id,
    projectId: check.projectId,
    newValue: {
      fromCheckId: earlier.id,
      fromVersion: earlier.version_number,
      fields,
      verificationMethod: earlier.verification_method,
      checkerNotes: earlier.checker_notes,
      alternateCells: cells,
      tolerance: earlier.tolerance_text,
    },
  });
  return carried;
}
