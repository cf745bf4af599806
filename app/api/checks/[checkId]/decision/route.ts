import { getDb } from '@/db';
import { requireActor } from '@/lib/auth/current-actor';
import { decide } from '@/lib/checks/decide';
import { decisionSchema } from '@/lib/checks/workflow';
import { routeParams } from '@/lib/http/params';
import { handle, parseJson } from '@/lib/http/route';

export const dynamic = 'force-dynamic';

/**
 * The checker returns the version or signs it as checked; an approver approves it or returns it.
 * Signing asks for the password again. An illegal transition is 409 with the current state.
 */
export function POST(request: Request, { params }: { params: Promise<{ checkId: string }> }): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireActor();
    const decision = await parseJson(request, decisionSchema);
    return Response.json(await decide(getDb(), actor, (await routeParams(params)).checkId, decision));
  });
}
