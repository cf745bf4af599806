// The one comparison of two stored versions, used by the compare page, GET /api/sheets/{id}/compare
// and the check view: the pure `compareVersions` (./compare.ts) fed with the parsed CSV tables the
// versions' attachments cite, so the three cannot disagree.
import type { Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import { attachmentTables } from '@/lib/attachments/attachments';
import { compareVersions, type ComparedVersion, type VersionComparison } from './compare';

/** Compares `base` (null: a first check, everything new) with `target`, both versions of sheet `sheetId`. */
export async function compareStoredVersions(
  db: Kysely<Database>,
  sheetId: string,
  base: ComparedVersion | null,
  target: ComparedVersion,
): Promise<VersionComparison> {
  const hashes = [...(base?.content.attachments ?? []), ...target.content.attachments].map((a) => a.sha256);
  const tables = await attachmentTables(db, sheetId, hashes);
  return compareVersions(
    base ? { content: base.content, results: base.results } : null,
    { content: target.content, results: target.results },
    { tables },
  );
}
