import { getDb } from '@/db';
import { healthResponse } from '@/lib/health/check-health';
import { APP_VERSION } from '@/lib/version';

export const dynamic = 'force-dynamic';

export async function GET(): Promise<Response> {
  return healthResponse(getDb(), APP_VERSION);
}
