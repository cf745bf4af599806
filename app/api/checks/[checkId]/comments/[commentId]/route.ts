import { getDb } from '@/db';
import { requireActor } from '@/lib/auth/current-actor';
import { resolveSchema } from '@/lib/checks/workflow';
import { resolveThread } from '@/lib/checks/threads';
import { routeParams } from '@/lib/http/params';
import { handle, parseJson } from '@/lib/http/route';

export const dynamic = 'force-dynamic';

/** Resolves a comment thread (`{"resolved": true}`; the checker only). */
export function PATCH(
  request: Request,
  { params }: { params: Promise<{ checkId: string; commentId: string }> },
): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireActor();
    await parseJson(request, resolveSchema);
    const { checkId, commentId } = await routeParams(params);
    return Response.json(await resolveThread(getDb(), actor, checkId, commentId));
  });
}
