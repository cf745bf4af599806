import { getDb } from '@/db';
import { revokeApiToken } from '@/lib/auth/api-tokens';
import { requireActor } from '@/lib/auth/current-actor';
import { routeParams } from '@/lib/http/params';
import { handle } from '@/lib/http/route';

export const dynamic = 'force-dynamic';

export function DELETE(request: Request, { params }: { params: Promise<{ tokenId: string }> }): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireActor();
    const { tokenId } = await routeParams(params);
    await revokeApiToken(getDb(), actor, tokenId);
    return Response.json({ ok: true });
  });
}
