import { z } from 'zod';
import { getDb } from '@/db';
import { requireActor, requireAdmin, requireProjectRole } from '@/lib/auth/current-actor';
import { AppError } from '@/lib/errors/app-error';
import { routeParams } from '@/lib/http/params';
import { handle, parseJson } from '@/lib/http/route';
import { grantRole, listMembers, revokeRole, roleChangeSchema } from '@/lib/projects/projects';

export const dynamic = 'force-dynamic';

type Context = { params: Promise<{ projectId: string }> };

/** An administrator names the project by its id or its code, as members do. */
async function projectForAdmin(projectId: string): Promise<string> {
  const project = await getDb()
    .selectFrom('projects')
    .select('id')
    .where(z.uuid().safeParse(projectId).success ? 'id' : 'code', '=', projectId)
    .executeTakeFirst();
  if (!project) throw new AppError('not_found', 'No such project.');
  return project.id;
}

/** Members see their project's members; administrators see any project's. */
export function GET(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const { projectId } = await routeParams(params);
    const actor = await requireActor();
    const id = actor.isAdmin ? await projectForAdmin(projectId) : (await requireProjectRole(projectId)).project.id;
    return Response.json({ members: await listMembers(getDb(), id) });
  });
}

/** Gives a role: administrators only, with a reason. */
export function POST(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireAdmin();
    const projectId = await projectForAdmin((await routeParams(params)).projectId);
    await grantRole(getDb(), actor, projectId, await parseJson(request, roleChangeSchema));
    return Response.json({ ok: true }, { status: 201 });
  });
}

/** Takes a role away: administrators only, with a reason. */
export function DELETE(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireAdmin();
    const projectId = await projectForAdmin((await routeParams(params)).projectId);
    await revokeRole(getDb(), actor, projectId, await parseJson(request, roleChangeSchema));
    return Response.json({ ok: true });
  });
}
