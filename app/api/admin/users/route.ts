import { getDb } from '@/db';
import { requireAdmin } from '@/lib/auth/current-actor';
import { handle, parseJson } from '@/lib/http/route';
import { inviteSchema, inviteUser, listUsers } from '@/lib/projects/users';

export const dynamic = 'force-dynamic';

export function GET(request: Request): Promise<Response> {
  return handle(request, async () => {
    await requireAdmin();
    return Response.json({ users: await listUsers(getDb()) });
  });
}

/** Invites a user by e-mail: the account is created and a link to choose a password is sent. */
export function POST(request: Request): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireAdmin();
    return Response.json(await inviteUser(getDb(), actor, await parseJson(request, inviteSchema)), { status: 201 });
  });
}
