import { getDb } from '@/db';
import { requireActor } from '@/lib/auth/current-actor';
import { listQueue } from '@/lib/checks/queries';
import { queueQuerySchema } from '@/lib/checks/workflow';
import { handle, parseValue, searchParams } from '@/lib/http/route';

export const dynamic = 'force-dynamic';

/** "My checks" (`?queue=check`) or "My approvals" (`?queue=approval`). */
export function GET(request: Request): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireActor();
    const { queue } = parseValue(searchParams(request), queueQuerySchema);
    return Response.json({ queue, checks: await listQueue(getDb(), actor, queue) });
  });
}
