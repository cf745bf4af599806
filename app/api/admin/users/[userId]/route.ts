import { getDb } from '@/db';
import { requireAdmin } from '@/lib/auth/current-actor';
import { routeParams } from '@/lib/http/params';
import { handle, parseJson } from '@/lib/http/route';
import { changeUser, userChangeSchema } from '@/lib/projects/users';

export const dynamic = 'force-dynamic';

/**
 * Disables, enables, locks or unlocks an account, or mails it a password-reset link, with a reason.
 * Accounts are never deleted.
 */
export function PATCH(request: Request, { params }: { params: Promise<{ userId: string }> }): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireAdmin();
    const { userId } = await routeParams(params);
    await changeUser(getDb(), actor, userId, await parseJson(request, userChangeSchema));
    return Response.json({ ok: true });
  });
}
