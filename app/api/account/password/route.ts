import { getDb } from '@/db';
import { changePassword, passwordChangeSchema } from '@/lib/auth/account';
import { requireActor } from '@/lib/auth/current-actor';
import { AppError } from '@/lib/errors/app-error';
import { handle, parseJson } from '@/lib/http/route';

export const dynamic = 'force-dynamic';

export function POST(request: Request): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireActor();
    if (actor.via === 'token') throw new AppError('forbidden', 'Change the password from a signed-in browser session.');
    await changePassword(getDb(), actor, await parseJson(request, passwordChangeSchema));
    return Response.json({ ok: true });
  });
}
