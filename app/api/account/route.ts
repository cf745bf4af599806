import { requireActor } from '@/lib/auth/current-actor';
import { handle } from '@/lib/http/route';

export const dynamic = 'force-dynamic';

export function GET(request: Request): Promise<Response> {
  return handle(request, async () => {
    const a = await requireActor();
    return Response.json({ id: a.userId, email: a.email, name: a.name, isAdmin: a.isAdmin, via: a.via });
  });
}
