// Projects and their members. Administrators create projects and give roles; every change to a
// role carries a reason and is audited in the same transaction.
import { sql, type Kysely } from 'kysely';
import { z } from 'zod';
import type { Database, ProjectRole } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { recordAudit } from '@/lib/audit/record';
import { AppError } from '@/lib/errors/app-error';
import { PROJECT_ROLES } from './roles';

export const ROLE_LABELS: Record<ProjectRole, string> = {
  originator: 'Originator',
  checker: 'Checker',
  approver: 'Approver',
  controller: 'Document controller',
  viewer: 'Viewer',
};

export const projectInputSchema = z.object({
  code: z
    .string()
    .trim()
    .regex(/^[A-Z][A-Z0-9]{1,9}$/, 'a code is 2 to 10 capital letters or digits, starting with a letter'),
  name: z.string().trim().min(1, 'give the project a name').max(200),
  legalOwner: z.string().trim().min(1, 'name the legal owner').max(200),
  revisionScheme: z.enum(['letters', 'numbers']),
});

export const roleChangeSchema = z.object({
  userId: z.string().uuid(),
  role: z.enum(PROJECT_ROLES),
  reason: z.string().trim().min(3, 'give a reason for the change').max(1000),
});

export async function createProject(db: Kysely<Database>, actor: Actor, input: z.infer<typeof projectInputSchema>) {
  return db.transaction().execute(async (trx) => {
    const existing = await trx.selectFrom('projects').select('id').where('code', '=', input.code).executeTakeFirst();
    if (existing) throw new AppError('conflict', `A project with the code ${input.code} exists already.`);
    const project = await trx
      .insertInto('projects')
      .values({
        code: input.code,
        name: input.name,
        legal_owner: input.legalOwner,
        revision_scheme: input.revisionScheme,
        created_by: actor.userId,
      })
      .returning(['id', 'code'])
      .executeTakeFirstOrThrow();
    await recordAudit(trx, actor, {
      action: 'project.create',
      objectType: 'project',
      objectId: project.id,
      projectId: project.id,
      newValue: input,
    });
    return project;
  });
}

/** Projects the user is a member of, with the roles held; administrators see every project. */
export async function listProjectsFor(db: Kysely<Database>, actor: Actor) {
  const rows = await db
    .selectFrom('projects as p')
    .leftJoin('project_members as m', (j) => j.onRef('m.project_id', '=', 'p.id').on('m.user_id', '=', actor.userId))
    .select([
      'p.id',
      'p.code',
      'p.name',
      'p.legal_owner',
      'p.revision_scheme',
      'p.created_at',
      sql<ProjectRole[]>`coalesce(array_agg(m.role order by m.role) filter (where m.role is not null), '{}')`.as(
        'roles',
      ),
    ])
    .groupBy('p.id')
    .orderBy('p.code')
    .execute();
  return rows.filter((r) => actor.isAdmin || r.roles.length > 0);
}

/** The id of a project an administrator names by its id or its code, as members do. */
export async function projectIdForAdmin(db: Kysely<Database>, idOrCode: string): Promise<string> {
  const project = await db
    .selectFrom('projects')
    .select('id')
    .where(z.uuid().safeParse(idOrCode).success ? 'id' : 'code', '=', idOrCode)
    .executeTakeFirst();
  if (!project) throw new AppError('not_found', 'No such project.');
  return project.id;
}

export async function listMembers(db: Kysely<Database>, projectId: string) {
  return db
    .selectFrom('project_members as m')
    .innerJoin('users as u', 'u.id', 'm.user_id')
    .select([
      'u.id as userId',
      'u.email',
      'u.display_name as name',
      'u.disabled_at as disabledAt',
      sql<ProjectRole[]>`array_agg(m.role order by m.role)`.as('roles'),
    ])
    .where('m.project_id', '=', projectId)
    .groupBy(['u.id', 'u.email', 'u.display_name', 'u.disabled_at'])
    .orderBy('u.display_name')
    .execute();
}

export async function grantRole(
  db: Kysely<Database>,
  actor: Actor,
  projectId: string,
  input: z.infer<typeof roleChangeSchema>,
): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const user = await trx
      .selectFrom('users')
      .select(['id', 'disabled_at'])
      .where('id', '=', input.userId)
      .executeTakeFirst();
    if (!user) throw new AppError('not_found', 'No such user.');
    if (user.disabled_at) throw new AppError('conflict', 'A disabled user cannot be given a role.');
    const added = await trx
      .insertInto('project_members')
      .values({ project_id: projectId, user_id: input.userId, role: input.role, granted_by: actor.userId })
      .onConflict((oc) => oc.columns(['project_id', 'user_id', 'role']).doNothing())
      .returning('role')
      .executeTakeFirst();
    if (!added) throw new AppError('conflict', 'The user holds this role already.');
    await recordAudit(trx, actor, {
      action: 'membership.grant',
      objectType: 'user',
      objectId: input.userId,
      projectId,
      newValue: { role: input.role },
      reason: input.reason,
    });
  });
}

export async function revokeRole(
  db: Kysely<Database>,
  actor: Actor,
  projectId: string,
  input: z.infer<typeof roleChangeSchema>,
): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const removed = await trx
      .deleteFrom('project_members')
      .where('project_id', '=', projectId)
      .where('user_id', '=', input.userId)
      .where('role', '=', input.role)
      .returning('role')
      .executeTakeFirst();
    if (!removed) throw new AppError('not_found', 'The user does not hold this role.');
    await recordAudit(trx, actor, {
      action: 'membership.revoke',
      objectType: 'user',
      objectId: input.userId,
      projectId,
      oldValue: { role: input.role },
      reason: input.reason,
    });
  });
}
