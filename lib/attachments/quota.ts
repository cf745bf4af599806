// The storage quota of a project's attachments. What counts: the bytes of each distinct content
// (SHA-256) stored for the project's sheets, once per project. The object store keeps one copy of
// any content (attachments/sha256/<hex>), so the same file attached to two sheets, or twice under
// two names, costs its bytes once; attachments are never deleted, so usage only grows. The quota
// is one setting for every project, WORLDSHEET_PROJECT_STORAGE_QUOTA_MB (MiB, 1 MiB = 1,048,576
// bytes; default 2048), set by whoever runs the installation.
import { sql, type Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import { DEFAULTS, settingsOf, type Environment } from '@/lib/config';
import { AppError } from '@/lib/errors/app-error';

export const DEFAULT_PROJECT_STORAGE_QUOTA_MB = DEFAULTS.WORLDSHEET_PROJECT_STORAGE_QUOTA_MB;
const MIB = 1024 * 1024;

/** The quota in bytes, read from the environment at each use (so a restart with a new value applies). */
export function projectStorageQuotaBytes(env?: Environment): number {
  return Math.floor(settingsOf(env).WORLDSHEET_PROJECT_STORAGE_QUOTA_MB * MIB);
}

/** "2048 MiB", "1.5 MiB", "900 bytes": as the quota message writes sizes. */
export function formatQuotaSize(bytes: number): string {
  if (bytes < MIB) return `${bytes} ${bytes === 1 ? 'byte' : 'bytes'}`;
  const mib = bytes / MIB;
  return `${Number.isInteger(mib) ? mib : Number(mib.toFixed(mib < 10 ? 2 : 1))} MiB`;
}

/** Bytes of attachments stored for the project, each distinct content counted once. */
export async function projectStorageUsed(db: Kysely<Database>, projectId: string): Promise<number> {
  const row = await db
    .selectFrom((eb) =>
      eb
        .selectFrom('attachments')
        .select(['sha256', sql<string>`max(size)`.as('size')])
        .where('project_id', '=', projectId)
        .groupBy('sha256')
        .as('distinct_contents'),
    )
    .select(sql<string>`coalesce(sum(size), 0)`.as('used'))
    .executeTakeFirstOrThrow();
  return Number(row.used);
}

/** Whether the project already stores this content (it then costs nothing more). */
async function projectHasContent(db: Kysely<Database>, projectId: string, sha256: string): Promise<boolean> {
  return (
    (await db
      .selectFrom('attachments')
      .select('id')
      .where('project_id', '=', projectId)
      .where('sha256', '=', sha256)
      .limit(1)
      .executeTakeFirst()) !== undefined
  );
}

/**
 * Refuses with 413 an upload of `size` bytes of content `sha256` that would take the project over
 * its quota. Inside the upload's transaction pass `lock: true`: the project's row is locked first,
 * so concurrent uploads to one project are checked one after the other, each seeing the ones
 * before it (two uploads that fit only one at a time cannot both pass).
 */
export async function checkProjectStorageQuota(
  db: Kysely<Database>,
  projectId: string,
  upload: { sha256: string; size: number },
  options: { lock?: boolean } = {},
): Promise<void> {
  // FOR NO KEY UPDATE: it excludes another upload's check, but not the key-share locks that inserts
  // referencing the project take (sheets, audit events), which go on meanwhile.
  if (options.lock)
    await db.selectFrom('projects').select('id').where('id', '=', projectId).forNoKeyUpdate().executeTakeFirstOrThrow();
  if (await projectHasContent(db, projectId, upload.sha256)) return;
  const quota = projectStorageQuotaBytes();
  const used = await projectStorageUsed(db, projectId);
  if (used + upload.size <= quota) return;
  throw new AppError(
    'too_large',
    `This project's attachments may take at most ${formatQuotaSize(quota)}; ${formatQuotaSize(used)} ${used === 1 ? 'is' : 'are'} used and this file needs ${formatQuotaSize(upload.size)} more. ` +
      'The administrator of this Worldsheet installation can raise the quota (the setting WORLDSHEET_PROJECT_STORAGE_QUOTA_MB).',
    { quotaBytes: quota, usedBytes: used, fileBytes: upload.size },
  );
}
