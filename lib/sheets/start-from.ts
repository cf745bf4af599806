// Starting a new sheet from another: from an approved version of any sheet in a project the person
// is a member of, or from a starter sheet (a worked sheet offered for the purpose, marked `starter`).
// The new sheet's version 2 is a copy of that version's content (cells, record, settings, the
// attachments it cites) under the new title; the sheet records the exact version it came from
// (`sheets.started_from_version_id`, never changed), the version's message and the audit trail say so,
// and the sheet page shows it. The copy is a new calculation: it goes through check and approval
// like any other; nothing of the source's checks or signatures carries over.
import type { Kysely } from 'kysely';
import { z } from 'zod';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { AppError } from '@/lib/errors/app-error';
import { INT4_MAX } from '@/lib/http/params';
import { formatSheetNumber } from './sheet-number';
import { createSheetWithContent, getVersion } from './sheets';

export const startFromSchema = z.object({
  sheetId: z.uuid(),
  version: z.number().int().positive().max(INT4_MAX),
  title: z.string().trim().min(1).max(300),
});

export interface StartCandidate {
  sheetId: string;
  code: string;
  title: string;
  version: number;
  sha256: string;
  /** 'starter': a starter sheet (its latest version); 'approved': the newest approved version of a sheet. */
  kind: 'starter' | 'approved';
}

/** Everything this person may start a new sheet from: starters, then approved versions, by sheet number. */
export async function startCandidates(db: Kysely<Database>, actor: Actor): Promise<StartCandidate[]> {
  const rows = await db
    .selectFrom('sheets as s')
    .innerJoin('projects as p', 'p.id', 's.project_id')
    .select(['s.id', 's.number', 's.title', 's.starter', 'p.code'])
    .where('s.voided_at', 'is', null)
    // Members only: an administrator manages accounts and projects, and reads no project's sheets without a role in it.
    .where((eb) =>
      eb.exists(
        eb
          .selectFrom('project_members as m')
          .select('m.user_id')
          .whereRef('m.project_id', '=', 's.project_id')
          .where('m.user_id', '=', actor.userId),
      ),
    )
    .where((eb) =>
      eb.or([
        eb('s.starter', '=', true),
        eb.exists(
          eb
            .selectFrom('checks as c')
            .select('c.id')
            .whereRef('c.sheet_id', '=', 's.id')
            .where('c.state', '=', 'approved'),
        ),
      ]),
    )
    .orderBy('p.code')
    .orderBy('s.number')
    .execute();
  if (rows.length === 0) return [];
  const ids = rows.map((r) => r.id);
  const [latest, approved] = await Promise.all([
    db
      .selectFrom('versions')
      .select(['sheet_id', 'number', 'content_hash'])
      .where('sheet_id', 'in', ids)
      .orderBy('sheet_id')
      .orderBy('number', 'desc')
      .distinctOn('sheet_id')
      .execute(),
    db
      .selectFrom('checks')
      .select(['sheet_id', 'version_number', 'version_sha256'])
      .where('sheet_id', 'in', ids)
      .where('state', '=', 'approved')
      .orderBy('sheet_id')
      .orderBy('version_number', 'desc')
      .distinctOn('sheet_id')
      .execute(),
  ]);
  const out: StartCandidate[] = [];
  for (const r of rows) {
    const code = formatSheetNumber(r.code, r.number);
    const a = approved.find((x) => x.sheet_id === r.id);
    const l = latest.find((x) => x.sheet_id === r.id);
    if (r.starter && l)
      out.push({ sheetId: r.id, code, title: r.title, version: l.number, sha256: l.content_hash, kind: 'starter' });
    else if (a)
      out.push({
        sheetId: r.id,
        code,
        title: r.title,
        version: a.version_number,
        sha256: a.version_sha256,
        kind: 'approved',
      });
  }
  return [...out.filter((c) => c.kind === 'starter'), ...out.filter((c) => c.kind === 'approved')];
}

/**
 * Creates a sheet of `project` from version `input.version` of sheet `input.sheetId`: 404 when the
 * person is not a member of that sheet's project or there is no such version; 409 when the sheet is
 * void, or the version is neither approved nor the latest version of a starter.
 */
export async function startSheetFrom(
  db: Kysely<Database>,
  actor: Actor,
  project: { id: string; code: string },
  raw: z.input<typeof startFromSchema>,
) {
  const input = startFromSchema.parse(raw);
  const source = await db
    .selectFrom('sheets as s')
    .innerJoin('projects as p', 'p.id', 's.project_id')
    .select(['s.id', 's.number', 's.starter', 's.voided_at', 's.project_id', 'p.code'])
    .where('s.id', '=', input.sheetId)
    .executeTakeFirst();
  const member =
    source &&
    (await db
      .selectFrom('project_members')
      .select('user_id')
      .where('project_id', '=', source.project_id)
      .where('user_id', '=', actor.userId)
      .executeTakeFirst()) !== undefined;
  if (!source || !member) throw new AppError('not_found', 'No such sheet.');
  const code = formatSheetNumber(source.code, source.number);
  if (source.voided_at) throw new AppError('conflict', `${code} is void; a new sheet cannot be started from it.`);
  const version = await getVersion(db, source.id, input.version);
  if (!version) throw new AppError('not_found', `${code} has no version ${input.version}.`);
  const approved = await db
    .selectFrom('checks')
    .select('id')
    .where('sheet_id', '=', source.id)
    .where('version_number', '=', version.number)
    .where('version_sha256', '=', version.sha256)
    .where('state', '=', 'approved')
    .executeTakeFirst();
  const latest = (await getVersion(db, source.id))!;
  const starterLatest = source.starter && latest.number === version.number;
  if (!approved && !starterLatest) {
    throw new AppError(
      'conflict',
      `Version ${version.number} of ${code} is not approved${source.starter ? ', nor the latest version of this starter' : ''}; a sheet is started only from an approved version or a starter.`,
    );
  }
  const { id: versionId } = await db
    .selectFrom('versions')
    .select('id')
    .where('sheet_id', '=', source.id)
    .where('number', '=', version.number)
    .executeTakeFirstOrThrow();
  const origin = { versionId, sheet: code, version: version.number, sha256: version.sha256 };
  const message = `Started from ${code} version ${version.number} (${approved ? 'approved' : 'starter'}; SHA-256 ${version.sha256.slice(0, 12)}…)`;
  return createSheetWithContent(db, actor, project, { ...version.content, title: input.title }, message, {
    copyFrom: { sheetId: source.id, origin },
  });
}

/** Where a sheet was started from, for its page: the sheet, version and hash, or null. */
export async function sheetOrigin(db: Kysely<Database>, sheetId: string) {
  const row = await db
    .selectFrom('sheets as s')
    .innerJoin('versions as v', 'v.id', 's.started_from_version_id')
    .innerJoin('sheets as o', 'o.id', 'v.sheet_id')
    .innerJoin('projects as p', 'p.id', 'o.project_id')
    .select(['p.code', 'o.number', 'v.number as version', 'v.content_hash'])
    .where('s.id', '=', sheetId)
    .executeTakeFirst();
  return row
    ? {
        code: formatSheetNumber(row.code, row.number),
        projectCode: row.code,
        number: row.number,
        version: row.version,
        sha256: row.content_hash,
      }
    : null;
}
