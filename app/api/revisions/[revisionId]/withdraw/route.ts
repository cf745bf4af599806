import { getDb } from '@/db';
import { requireActor, requireProjectRole } from '@/lib/auth/current-actor';
import { AppError } from '@/lib/errors/app-error';
import { routeParams } from '@/lib/http/params';
import { handle, parseJson } from '@/lib/http/route';
import { getRevision } from '@/lib/issue/register';
import { withdrawRevision, withdrawSchema } from '@/lib/issue/withdraw';

export const dynamic = 'force-dynamic';

/** Withdraws a revision (document control), with a reason. */
export function POST(request: Request, { params }: { params: Promise<{ revisionId: string }> }): Promise<Response> {
  return handle(request, async () => {
    await requireActor();
    const revision = await getRevision(getDb(), (await routeParams(params)).revisionId);
    if (!revision) throw new AppError('not_found', 'No such revision.');
    const { actor } = await requireProjectRole(revision.project_id, ['controller']);
    const { reason } = await parseJson(request, withdrawSchema);
    return Response.json(await withdrawRevision(getDb(), actor, revision.id, reason));
  });
}
