import { getDb } from '@/db';
import { unlockSchema, unlockWithToken } from '@/lib/auth/lockout';
import { handle, parseJson } from '@/lib/http/route';

export const dynamic = 'force-dynamic';

/** The e-mailed unlock link (lib/auth/lockout.ts): lifts a lock set by failed passwords. */
export function POST(request: Request): Promise<Response> {
  return handle(request, async () => {
    await unlockWithToken(getDb(), (await parseJson(request, unlockSchema)).token);
    return Response.json({ ok: true });
  });
}
