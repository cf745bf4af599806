import { getDb } from '@/db';
import { requireProjectRole } from '@/lib/auth/current-actor';
import { routeParams } from '@/lib/http/params';
import { handle } from '@/lib/http/route';
import { listMembers } from '@/lib/projects/projects';

export const dynamic = 'force-dynamic';

export function GET(request: Request, { params }: { params: Promise<{ projectId: string }> }): Promise<Response> {
  return handle(request, async () => {
    const { project, roles } = await requireProjectRole((await routeParams(params)).projectId);
    return Response.json({ project, roles, members: await listMembers(getDb(), project.id) });
  });
}
