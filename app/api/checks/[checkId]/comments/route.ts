import { getDb } from '@/db';
import { requireActor } from '@/lib/auth/current-actor';
import { addComment } from '@/lib/checks/threads';
import { commentSchema } from '@/lib/checks/workflow';
import { routeParams } from '@/lib/http/params';
import { handle, parseJson } from '@/lib/http/route';

export const dynamic = 'force-dynamic';

/** Opens a comment thread on a cell (checker) or answers one (checker or originator). */
export function POST(request: Request, { params }: { params: Promise<{ checkId: string }> }): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireActor();
    const input = await parseJson(request, commentSchema);
    return Response.json(await addComment(getDb(), actor, (await routeParams(params)).checkId, input), { status: 201 });
  });
}
