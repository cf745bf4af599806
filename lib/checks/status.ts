// Where a sheet stands in the workflow, from its checks and its latest version number.
import type { Kysely } from 'kysely';
import type { CheckState, Database } from '@/db/schema';

export type SheetStatus = 'draft' | 'in_check' | 'checked' | 'approved' | 'returned';

export const SHEET_STATUS_LABELS: Record<SheetStatus, string> = {
  draft: 'Draft',
  in_check: 'In check',
  checked: 'Checked',
  approved: 'Approved',
  returned: 'Returned',
};

/**
 * An open check (in check, or checked and awaiting approval) decides; otherwise the newest check
 * decides when it is of the latest version (approved, or returned); anything saved since is a draft.
 */
export function statusOf(
  newest: { state: CheckState; versionNumber: number } | undefined,
  latestVersion: number,
): SheetStatus {
  if (!newest) return 'draft';
  if (newest.state === 'in_check' || newest.state === 'checked') return newest.state;
  if (newest.versionNumber !== latestVersion) return 'draft';
  return newest.state === 'approved' ? 'approved' : 'returned';
}

/** The status of each sheet, by id. */
export async function sheetStatuses(
  db: Kysely<Database>,
  sheets: ReadonlyArray<{ id: string; latestVersion: number | null }>,
): Promise<Map<string, SheetStatus>> {
  const out = new Map<string, SheetStatus>();
  if (sheets.length === 0) return out;
  const rows = await db
    .selectFrom('checks')
    .select(['sheet_id', 'state', 'version_number'])
    .distinctOn('sheet_id')
    .where(
      'sheet_id',
      'in',
      sheets.map((s) => s.id),
    )
    .orderBy('sheet_id')
    .orderBy('created_at', 'desc')
    .execute();
  const newest = new Map(rows.map((r) => [r.sheet_id, { state: r.state, versionNumber: r.version_number }]));
  for (const s of sheets) out.set(s.id, statusOf(newest.get(s.id), s.latestVersion ?? 0));
  return out;
}
