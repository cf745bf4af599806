import { getDb } from '@/db';
import { requireActor, requireAdmin, requireProjectRole } from '@/lib/auth/current-actor';
import { routeParams } from '@/lib/http/params';
import { handle, parseJson } from '@/lib/http/route';
import { grantRole, listMembers, projectIdForAdmin, revokeRole, roleChangeSchema } from '@/lib/projects/projects';

export const dynamic = 'force-dynamic';

type Context = { params: Promise<{ projectId: string }> };

/** Members see their project's members; administrators see any project's. */
export function GET(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const { projectId } = await routeParams(params);
    const actor = await requireActor();
    const id = actor.isAdmin
      ? await projectIdForAdmin(getDb(), projectId)
      : (await requireProjectRole(projectId)).project.id;
    return Response.json({ members: await listMembers(getDb(), id) });
  });
}

/** Gives a role: administrators only, with a reason. */
export function POST(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireAdmin();
    const projectId = await projectIdForAdmin(getDb(), (await routeParams(params)).projectId);
    await grantRole(getDb(), actor, projectId, await parseJson(request, roleChangeSchema));
    return Response.json({ ok: true }, { status: 201 });
  });
}

/** Takes a role away: administrators only, with a reason. */
export function DELETE(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireAdmin();
    const projectId = await projectIdForAdmin(getDb(), (await routeParams(params)).projectId);
    await revokeRole(getDb(), actor, projectId, await parseJson(request, roleChangeSchema));
    return Response.json({ ok: true });
  });
}
