import 'server-only';
import { notFound, redirect } from 'next/navigation';
import type { ProjectRole } from '@/db/schema';
import { AppError } from '@/lib/errors/app-error';
import { pageParams } from '@/lib/http/params';
import type { Actor } from './actor';
import { getActor, requireProjectRole, type ProjectAccess } from './current-actor';

/** For pages: the signed-in actor, or a redirect to the sign-in page that comes back here. */
export async function pageActor(returnTo: string): Promise<Actor> {
  const actor = await getActor();
  if (!actor) redirect(`/sign-in?callbackUrl=${encodeURIComponent(returnTo)}`);
  return actor;
}

/**
 * Pages of a project that need a role beyond membership, by the key the project page explains them
 * under (`?notAllowed=`): a member without the role is told what their roles allow, not that the page
 * does not exist.
 */
export const ROLE_PAGES = {
  audit: 'The audit trail is for the project’s originators, checkers, approvers and document controllers.',
  edit: 'Editing a sheet needs the originator role.',
} as const;

export type RolePage = keyof typeof ROLE_PAGES;

/**
 * For project pages: membership (with one of `roles`, when given), else not found. A member without
 * one of `roles` is sent to the project's page, which says what the page needs (`page`).
 */
export async function pageProject(
  projectRef: string,
  returnTo: string,
  roles?: readonly ProjectRole[],
  page?: RolePage,
): Promise<ProjectAccess> {
  await pageActor(returnTo);
  if (!pageParams({ projectCode: projectRef })) notFound();
  let access: ProjectAccess;
  try {
    access = await requireProjectRole(projectRef, roles);
  } catch (error) {
    if (error instanceof AppError && error.code === 'forbidden' && page)
      redirect(`/projects/${encodeURIComponent(projectRef)}?notAllowed=${page}`);
    if (error instanceof AppError && (error.code === 'not_found' || error.code === 'forbidden')) notFound();
    throw error;
  }
  return access;
}
