import { getDb } from '@/db';
import { revokeApiToken } from '@/lib/auth/api-tokens';
import { requireActor } from '@/lib/auth/current-actor';
import { AppError } from '@/lib/errors/app-error';
import { handle } from '@/lib/http/route';

export const dynamic = 'force-dynamic';

export function DELETE(_request: Request, { params }: { params: Promise<{ tokenId: string }> }): Promise<Response> {
  return handle(async () => {
    const actor = await requireActor();
    const { tokenId } = await params;
    if (!/^[0-9a-f-]{36}$/.test(tokenId)) throw new AppError('not_found', 'No such token.');
    await revokeApiToken(getDb(), actor, tokenId);
    return Response.json({ ok: true });
  });
}
