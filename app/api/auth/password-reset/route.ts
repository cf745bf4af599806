import { getDb } from '@/db';
import { requestPasswordReset, resetRequestSchema } from '@/lib/auth/account';
import { handle, parseJson } from '@/lib/http/route';

export const dynamic = 'force-dynamic';

/** Sends a reset link if the address has an account; the answer is the same either way. */
export function POST(request: Request): Promise<Response> {
  return handle(request, async () => {
    const { email } = await parseJson(request, resetRequestSchema);
    await requestPasswordReset(getDb(), email);
    return Response.json(
      { ok: true, message: 'If this address has an account, a link to reset the password is on its way.' },
      { status: 202 },
    );
  });
}
