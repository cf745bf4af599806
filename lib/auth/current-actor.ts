import 'server-only';
// The one place that decides who is asking and what they may do. Every route handler calls one of
// these; a page or layout hiding a button is never the protection.
//   401  not signed in (no live session, no valid API token)
//   403  signed in without the role
//   404  an object of a project the user is not a member of (its existence is not revealed)
import { getServerSession } from 'next-auth';
import { headers } from 'next/headers';
import { cache } from 'react';
import { getDb } from '@/db';
import type { ProjectRole } from '@/db/schema';
import { AppError } from '@/lib/errors/app-error';
import type { Actor } from './actor';
import { resolveApiToken } from './api-tokens';
import { authOptions } from './auth-options';
import { resumeSession } from './sessions';

export const getActor = cache(async (): Promise<Actor | null> => {
  const authorization = (await headers()).get('authorization');
  if (authorization) {
    const m = /^Bearer\s+(\S+)$/i.exec(authorization);
    return m ? resolveApiToken(getDb(), m[1]) : null;
  }
  const session = await getServerSession(authOptions);
  const sid = (session as { sid?: string } | null)?.sid;
  return sid ? resumeSession(getDb(), sid) : null;
});

export async function requireActor(): Promise<Actor> {
  const actor = await getActor();
  if (!actor) throw new AppError('unauthenticated', 'Sign in first.');
  return actor;
}

export async function requireAdmin(): Promise<Actor> {
  const actor = await requireActor();
  if (!actor.isAdmin) throw new AppError('forbidden', 'Only an administrator may do this.');
  return actor;
}

export interface ProjectAccess {
  actor: Actor;
  project: { id: string; code: string; name: string; legal_owner: string; revision_scheme: 'letters' | 'numbers' };
  roles: ProjectRole[];
}

/**
 * Requires membership of the project (404 otherwise) and, when `roles` is given, one of those roles
 * (403 otherwise). `projectRef` is the project's id or its code.
 */
export const requireProjectRole = cache(
  async (projectRef: string, roles?: readonly ProjectRole[]): Promise<ProjectAccess> => {
    const actor = await requireActor();
    const db = getDb();
    const isUuid = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/.test(projectRef);
    const project = await db
      .selectFrom('projects')
      .select(['id', 'code', 'name', 'legal_owner', 'revision_scheme'])
      .where(isUuid ? 'id' : 'code', '=', projectRef)
      .executeTakeFirst();
    const held = project
      ? (
          await db
            .selectFrom('project_members')
            .select('role')
            .where('project_id', '=', project.id)
            .where('user_id', '=', actor.userId)
            .execute()
        ).map((r) => r.role)
      : [];
    if (!project || held.length === 0)
      throw new AppError('not_found', 'No such project, or you are not a member of it.');
    if (roles && !roles.some((r) => held.includes(r))) {
      throw new AppError('forbidden', `This needs the ${roles.join(' or ')} role in ${project.code}.`);
    }
    return { actor, project, roles: held };
  },
);
