// A re-check: the sheet was returned (by its checker or its approver) and submitted again. The check
// view shows first what changed since the version that was returned, then what changed since the last
// approved version (the check's base).
import type { Kysely } from 'kysely';
import type { CheckState, Database } from '@/db/schema';

export interface ReturnedCheck {
  checkId: string;
  state: Extract<CheckState, 'returned' | 'approval_returned'>;
  versionNumber: number;
  /** Who returned it (the checker, or the approver), or null when not recorded. */
  returnedById: string | null;
  returnedBy: string | null;
  returnReason: string | null;
}

/**
 * The check this one follows when it is a re-check: the sheet's latest check submitted before it,
 * when that one was returned and its version comes after the check's base (the last approved
 * version). Null for a check after an approval or a sheet's first check.
 */
export async function returnedCheckBefore(
  db: Kysely<Database>,
  check: { id: string; sheet_id: string; base_version_number: number | null },
): Promise<ReturnedCheck | null> {
  const earlier = await db
    .selectFrom('checks as k')
    .leftJoin('users as u', 'u.id', 'k.decided_by')
    .select(['k.id', 'k.state', 'k.version_number', 'k.decided_by', 'k.return_reason', 'u.display_name'])
    .where('k.sheet_id', '=', check.sheet_id)
    .where('k.id', '<>', check.id)
    .where('k.created_at', '<', db.selectFrom('checks as me').select('me.created_at').where('me.id', '=', check.id))
    .orderBy('k.created_at', 'desc')
    .limit(1)
    .executeTakeFirst();
  if (!earlier || (earlier.state !== 'returned' && earlier.state !== 'approval_returned')) return null;
  if (check.base_version_number !== null && earlier.version_number <= check.base_version_number) return null;
  return {
    checkId: earlier.id,
    state: earlier.state,
    versionNumber: earlier.version_number,
    returnedById: earlier.decided_by,
    returnedBy: earlier.display_name,
    returnReason: earlier.return_reason,
  };
}
