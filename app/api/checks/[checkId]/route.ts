import { getDb } from '@/db';
import { requireActor } from '@/lib/auth/current-actor';
import { checkWorkSchema } from '@/lib/checks/workflow';
import { getCheckDetail } from '@/lib/checks/queries';
import { saveCheckWork } from '@/lib/checks/work';
import { routeParams } from '@/lib/http/params';
import { handle, parseJson } from '@/lib/http/route';

export const dynamic = 'force-dynamic';

type Context = { params: Promise<{ checkId: string }> };

/** The check: the version against its base, comments, signatures and what the caller may do. */
export function GET(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () =>
    Response.json(await getCheckDetail(getDb(), await requireActor(), (await routeParams(params)).checkId)),
  );
}

/** The checker's work: verification method, notes, alternate calculation cells (evaluated). */
export function PATCH(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireActor();
    const input = await parseJson(request, checkWorkSchema, 1024 * 1024);
    return Response.json(await saveCheckWork(getDb(), actor, (await routeParams(params)).checkId, input));
  });
}
