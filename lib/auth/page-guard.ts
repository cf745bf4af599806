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

/** For project pages: membership (with one of `roles`, when given), else not found. */
export async function pageProject(
  projectRef: string,
  returnTo: string,
  roles?: readonly ProjectRole[],
): Promise<ProjectAccess> {
  await pageActor(returnTo);
  if (!pageParams({ projectCode: projectRef })) notFound();
  try {
    return await requireProjectRole(projectRef, roles);
  } catch (error) {
    if (error instanceof AppError && (error.code === 'not_found' || error.code === 'forbidden')) notFound();
    throw error;
  }
}
