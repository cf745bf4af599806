import { APP_VERSION } from '@/lib/version';

export const dynamic = 'force-dynamic';

/** Liveness: the process answers. Asks nothing of the database (readiness, GET /api/health, does). */
export function GET(): Response {
  return Response.json({ status: 'ok', version: APP_VERSION }, { headers: { 'Cache-Control': 'no-store' } });
}
