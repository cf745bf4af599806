import { getDb } from '@/db';
import { requireActor, requireAdmin } from '@/lib/auth/current-actor';
import { handle, parseJson } from '@/lib/http/route';
import { createProject, listProjectsFor, projectInputSchema } from '@/lib/projects/projects';

export const dynamic = 'force-dynamic';

export function GET(request: Request): Promise<Response> {
  return handle(request, async () => Response.json({ projects: await listProjectsFor(getDb(), await requireActor()) }));
}

export function POST(request: Request): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireAdmin();
    const input = await parseJson(request, projectInputSchema);
    return Response.json(await createProject(getDb(), actor, input), { status: 201 });
  });
}
