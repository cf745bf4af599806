import { getDb } from '@/db';
import { confirmPasswordReset, resetConfirmSchema } from '@/lib/auth/account';
import { handle, parseJson } from '@/lib/http/route';

export const dynamic = 'force-dynamic';

export function POST(request: Request): Promise<Response> {
  return handle(request, async () => {
    await confirmPasswordReset(getDb(), await parseJson(request, resetConfirmSchema));
    return Response.json({ ok: true });
  });
}
