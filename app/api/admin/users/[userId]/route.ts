import { getDb } from '@/db';
import { requireAdmin } from '@/lib/auth/current-actor';
import { AppError } from '@/lib/errors/app-error';
import { handle, parseJson } from '@/lib/http/route';
import { changeUser, userChangeSchema } from '@/lib/projects/users';

export const dynamic = 'force-dynamic';

/** Disables, enables or unlocks an account, with a reason. Accounts are never deleted. */
export function PATCH(request: Request, { params }: { params: Promise<{ userId: string }> }): Promise<Response> {
  return handle(async () => {
    const actor = await requireAdmin();
    const { userId } = await params;
    if (!/^[0-9a-f-]{36}$/.test(userId)) throw new AppError('not_found', 'No such user.');
    await changeUser(getDb(), actor, userId, await parseJson(request, userChangeSchema));
    return Response.json({ ok: true });
  });
}
