import { getDb } from '@/db';
import { apiTokenInputSchema, createApiToken, listApiTokens } from '@/lib/auth/api-tokens';
import { requireActor } from '@/lib/auth/current-actor';
import { AppError } from '@/lib/errors/app-error';
import { handle, parseJson } from '@/lib/http/route';

export const dynamic = 'force-dynamic';

export function GET(request: Request): Promise<Response> {
  return handle(request, async () =>
    Response.json({ tokens: await listApiTokens(getDb(), (await requireActor()).userId) }),
  );
}

/**
 * Creates a token with its scope and expiry; its secret is in this response only. A token cannot
 * create further tokens.
 */
export function POST(request: Request): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireActor();
    if (actor.via === 'token') throw new AppError('forbidden', 'Create tokens from a signed-in browser session.');
    const { name, scope, expiresInDays } = await parseJson(request, apiTokenInputSchema);
    return Response.json(await createApiToken(getDb(), actor, name, { scope, expiresInDays }), { status: 201 });
  });
}
