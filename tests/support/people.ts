import type { Kysely } from 'kysely';
import type { Database, ProjectRole } from '../../db/schema';
import type { Actor } from '../../lib/auth/actor';
import { hashPassword } from '../../lib/auth/password';

export const PASSWORD = 'correct horse battery';

export async function makeUser(
  db: Kysely<Database>,
  email: string,
  options: { admin?: boolean; password?: string | null } = {},
): Promise<Actor> {
  const password = options.password === undefined ? PASSWORD : options.password;
  const row = await db
    .insertInto('users')
    .values({
      email,
      display_name: `Person ${email.split('@')[0]}`,
      password_hash: password ? await hashPassword(password) : null,
      is_admin: options.admin ?? false,
    })
    .returning(['id', 'email', 'display_name', 'is_admin'])
    .executeTakeFirstOrThrow();
  return {
    userId: row.id,
    email: row.email,
    name: row.display_name,
    isAdmin: row.is_admin,
    via: 'session',
    sessionId: null,
    tokenId: null,
  };
}

export async function makeProject(
  db: Kysely<Database>,
  code = 'PRJ',
  members: Array<[Actor, ProjectRole]> = [],
): Promise<string> {
  const p = await db
    .insertInto('projects')
    .values({ code, name: `Project ${code}`, legal_owner: 'Fixture Ltd' })
    .returning('id')
    .executeTakeFirstOrThrow();
  for (const [actor, role] of members)
    await db.insertInto('project_members').values({ project_id: p.id, user_id: actor.userId, role }).execute();
  return p.id;
}

/** The Actor of an existing account (e.g. one of the demo seed's people), as a browser session would carry it. */
export async function actorByEmail(db: Kysely<Database>, email: string): Promise<Actor> {
  const u = await db
    .selectFrom('users')
    .select(['id', 'email', 'display_name', 'is_admin'])
    .where('email', '=', email)
    .executeTakeFirstOrThrow();
  return {
    userId: u.id,
    email: u.email,
    name: u.display_name,
    isAdmin: u.is_admin,
    via: 'session',
    sessionId: null,
    tokenId: null,
  };
}
