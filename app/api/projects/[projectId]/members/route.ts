import { getDb } from '@/db';
import { requireActor, requireAdmin, requireProjectRole } from '@/lib/auth/current-actor';
import { AppError } from '@/lib/errors/app-error';
import { handle, parseJson } from '@/lib/http/route';
import { grantRole, listMembers, revokeRole, roleChangeSchema } from '@/lib/projects/projects';

export const dynamic = 'force-dynamic';

type Context = { params: Promise<{ projectId: string }> };

async function projectForAdmin(projectId: string): Promise<string> {
  if (!/^[0-9a-f-]{36}$/.test(projectId)) throw new AppError('not_found', 'No such project.');
  const project = await getDb().selectFrom('projects').select('id').where('id', '=', projectId).executeTakeFirst();
  if (!project) throw new AppError('not_found', 'No such project.');
  return project.id;
}

/** Members see their project's members; administrators see any project's. */
export function GET(_request: Request, { params }: Context): Promise<Response> {
  return handle(async () => {
    const { projectId } = await params;
    const actor = await requireActor();
    const id = actor.isAdmin ? await projectForAdmin(projectId) : (await requireProjectRole(projectId)).project.id;
    return Response.json({ members: await listMembers(getDb(), id) });
  });
}

/** Gives a role: administrators only, with a reason. */
export function POST(request: Request, { params }: Context): Promise<Response> {
  return handle(async () => {
    const actor = await requireAdmin();
    const projectId = await projectForAdmin((await params).projectId);
    await grantRole(getDb(), actor, projectId, await parseJson(request, roleChangeSchema));
    return Response.json({ ok: true }, { status: 201 });
  });
}

/** Takes a role away: administrators only, with a reason. */
export function DELETE(request: Request, { params }: Context): Promise<Response> {
  return handle(async () => {
    const actor = await requireAdmin();
    const projectId = await projectForAdmin((await params).projectId);
    await revokeRole(getDb(), actor, projectId, await parseJson(request, roleChangeSchema));
    return Response.json({ ok: true });
  });
}
