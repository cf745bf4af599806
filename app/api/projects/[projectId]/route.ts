import { getDb } from '@/db';
import { requireProjectRole } from '@/lib/auth/current-actor';
import { handle } from '@/lib/http/route';
import { listMembers } from '@/lib/projects/projects';

export const dynamic = 'force-dynamic';

export function GET(_request: Request, { params }: { params: Promise<{ projectId: string }> }): Promise<Response> {
  return handle(async () => {
    const { project, roles } = await requireProjectRole((await params).projectId);
    return Response.json({ project, roles, members: await listMembers(getDb(), project.id) });
  });
}
