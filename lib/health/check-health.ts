import { sql, type Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import { isDraining } from './draining';

export interface Health {
  /** 'draining': this instance is stopping and takes no new work (the database may still be up). */
  status: 'ok' | 'unavailable' | 'draining';
  version: string;
  database: { status: 'up' | 'down'; latencyMs: number | null; migration: string | null; error?: string };
}

/**
 * Readiness: asks the database one cheap question; never throws. Not ready (503) while the
 * database cannot be reached or while this instance drains.
 */
export async function checkHealth(db: Kysely<Database>, version: string): Promise<Health> {
  const started = performance.now();
  try {
    const row = await sql<{ name: string | null }>`select max(name) as name from kysely_migration`.execute(db);
    const latencyMs = Math.round((performance.now() - started) * 10) / 10;
    return {
      status: isDraining() ? 'draining' : 'ok',
      version,
      database: { status: 'up', latencyMs, migration: row.rows[0]?.name ?? null },
    };
  } catch {
    return {
      status: 'unavailable',
      version,
      database: { status: 'down', latencyMs: null, migration: null, error: 'database unreachable' },
    };
  }
}

export async function healthResponse(db: Kysely<Database>, version: string): Promise<Response> {
  const health = await checkHealth(db, version);
  return Response.json(health, {
    status: health.status === 'ok' ? 200 : 503,
    headers: { 'Cache-Control': 'no-store' },
  });
}
