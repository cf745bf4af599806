// Every action that creates or changes something records an audit event in the same transaction
// as the change: a failed change leaves no event and a change never lacks its event. The database
// numbers, time-stamps (its own clock, UTC) and hash-chains each event.
import type { Kysely, Transaction } from 'kysely';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';

export interface AuditInput {
  action: string;
  objectType: string;
  objectId?: string | null;
  projectId?: string | null;
  oldValue?: unknown;
  newValue?: unknown;
  reason?: string | null;
}

/** The columns an audit event is inserted with (the database adds its number, time and hashes). */
export function auditRow(actor: Actor | null, event: AuditInput) {
  return {
    actor_id: actor?.userId ?? null,
    session_id: actor?.sessionId ?? null,
    token_id: actor?.tokenId ?? null,
    project_id: event.projectId ?? null,
    action: event.action,
    object_type: event.objectType,
    object_id: event.objectId ?? null,
    old_value: event.oldValue === undefined ? null : JSON.stringify(event.oldValue),
    new_value: event.newValue === undefined ? null : JSON.stringify(event.newValue),
    reason: event.reason ?? null,
  };
}

export async function recordAudit(
  db: Kysely<Database> | Transaction<Database>,
  actor: Actor | null,
  event: AuditInput,
): Promise<void> {
  await db.insertInto('audit_events').values(auditRow(actor, event)).execute();
}
