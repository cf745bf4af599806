// Who did what on a sheet, read from the database for the independence rules (rules.ts): the
// project roles of a person, the last approved version, every author since it, whoever signed the
// version under check, and the safety flag the version records in its own content.
import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database, ProjectRole } from '@/db/schema';
import { AppError } from '@/lib/errors/app-error';
import type { Participants, Person } from './rules';

type Db = Kysely<Database> | Transaction<Database>;

export async function rolesOf(db: Db, projectId: string, userId: string): Promise<ProjectRole[]> {
  return (
    await db
      .selectFrom('project_members')
      .select('role')
      .where('project_id', '=', projectId)
      .where('user_id', '=', userId)
      .execute()
  ).map((r) => r.role);
}

export async function person(
  db: Db,
  projectId: string,
  userId: string,
): Promise<Person & { email: string; passwordHash: string | null; disabled: boolean }> {
  const u = await db
    .selectFrom('users')
    .select(['id', 'display_name', 'email', 'password_hash', 'disabled_at'])
    .where('id', '=', userId)
    .executeTakeFirst();
  if (!u) throw new AppError('not_found', 'No such person.');
  return {
    userId: u.id,
    name: u.display_name,
    email: u.email,
    passwordHash: u.password_hash,
    disabled: u.disabled_at !== null,
    roles: await rolesOf(db, projectId, userId),
  };
}

/** The number of the last approved version of a sheet, or null. */
export async function lastApprovedNumber(db: Db, sheetId: string): Promise<number | null> {
  const row = await db
    .selectFrom('checks')
    .select(sql<number | null>`max(version_number)`.as('n'))
    .where('sheet_id', '=', sheetId)
    .where('state', '=', 'approved')
    .executeTakeFirst();
  return row?.n === null || row?.n === undefined ? null : Number(row.n);
}

/**
 * Everyone who saved a version after `after` (the last approved version): those saved after the
 * version under check count too (a newer version is the same change carried on).
 */
async function originatorsSince(db: Db, sheetId: string, after: number | null): Promise<Set<string>> {
  let q = db.selectFrom('versions').select('author_id').distinct().where('sheet_id', '=', sheetId);
  if (after !== null) q = q.where('number', '>', after);
  return new Set((await q.execute()).map((r) => r.author_id));
}

/** The safety flag a version records in its content (hashed and immutable); a version without one counts as safety-related. */
export const versionSafetyFlag = (alias: 'v') =>
  sql<boolean>`coalesce((${sql.ref(`${alias}.content`)} ->> 'safetyRelated')::boolean, true)`;

/**
 * Who authored or signed anything on version `versionNumber` of a sheet since the last approved
 * version `after`, and the safety flag that version records: the independence rules read this.
 * `current` names the submitter and checker of the submission being made or the check being decided.
 */
export async function participants(
  db: Db,
  sheetId: string,
  after: number | null,
  versionNumber: number,
  current: { preparerId?: string; checkerId?: string } = {},
): Promise<Participants> {
  const originators = await originatorsSince(db, sheetId, after);
  const signed = await db
    .selectFrom('signatures')
    .select(['user_id', 'meaning'])
    .where('sheet_id', '=', sheetId)
    .where('version_number', '=', versionNumber)
    .where('meaning', 'in', ['prepared', 'checked'])
    .execute();
  const version = await db
    .selectFrom('versions as v')
    .select(versionSafetyFlag('v').as('safety_related'))
    .where('v.sheet_id', '=', sheetId)
    .where('v.number', '=', versionNumber)
    .executeTakeFirst();
  const preparers = new Set(signed.filter((s) => s.meaning === 'prepared').map((s) => s.user_id));
  const checkers = new Set(signed.filter((s) => s.meaning === 'checked').map((s) => s.user_id));
  if (current.preparerId) preparers.add(current.preparerId);
  if (current.checkerId) checkers.add(current.checkerId);
  return { originators, preparers, checkers, safetyRelated: version?.safety_related ?? true };
}
