// The audit trail of a project, filtered by person, action and date, as rows or as CSV.
import type { Kysely } from 'kysely';
import { z } from 'zod';
import type { Database } from '@/db/schema';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import type { AuditNames } from './sentences';

export const auditFilterSchema = z.object({
  person: z
    .string()
    .uuid()
    .optional()
    .or(z.literal('').transform(() => undefined)),
  action: z
    .string()
    .regex(/^[a-z][a-z0-9_.-]*$/)
    .max(64)
    .optional()
    .or(z.literal('').transform(() => undefined)),
  from: z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}$/)
    .optional()
    .or(z.literal('').transform(() => undefined)),
  to: z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}$/)
    .optional()
    .or(z.literal('').transform(() => undefined)),
  limit: z.coerce.number().int().min(1).max(10_000).default(500),
});

export type AuditFilter = z.infer<typeof auditFilterSchema>;

/** The query of GET /api/projects/{projectId}/audit: the filter, and `format=csv` for a CSV download. */
export const auditQuerySchema = auditFilterSchema.extend({ format: z.enum(['json', 'csv']).default('json') });

export async function listProjectAudit(db: Kysely<Database>, projectId: string, filter: AuditFilter) {
  let q = db
    .selectFrom('audit_events as e')
    .leftJoin('users as u', 'u.id', 'e.actor_id')
    .select([
      'e.id',
      'e.occurred_at',
      'e.action',
      'e.object_type',
      'e.object_id',
      'e.old_value',
      'e.new_value',
      'e.reason',
      'e.session_id',
      'e.token_id',
      'e.hash',
      'u.display_name as actor_name',
      'u.email as actor_email',
    ])
    .where('e.project_id', '=', projectId);
  if (filter.person) q = q.where('e.actor_id', '=', filter.person);
  if (filter.action) q = q.where('e.action', '=', filter.action);
  if (filter.from) q = q.where('e.occurred_at', '>=', new Date(`${filter.from}T00:00:00Z`));
  if (filter.to) q = q.where('e.occurred_at', '<', new Date(new Date(`${filter.to}T00:00:00Z`).getTime() + 86_400_000));
  return q.orderBy('e.id', 'desc').limit(filter.limit).execute();
}

export async function listProjectAuditActions(db: Kysely<Database>, projectId: string): Promise<string[]> {
  const rows = await db
    .selectFrom('audit_events')
    .select('action')
    .distinct()
    .where('project_id', '=', projectId)
    .orderBy('action')
    .execute();
  return rows.map((r) => r.action);
}

function csvField(value: unknown): string {
  if (value === null || value === undefined) return '';
  const text = typeof value === 'string' ? value : value instanceof Date ? value.toISOString() : JSON.stringify(value);
  // RFC 4180 quoting; a leading =, +, - or @ is prefixed so spreadsheet programs do not run it.
  const safe = /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

export function auditCsv(rows: Awaited<ReturnType<typeof listProjectAudit>>): string {
  const header = [
    'id',
    'time_utc',
    'person',
    'email',
    'action',
    'object_type',
    'object_id',
    'old_value',
    'new_value',
    'reason',
    'session',
    'token',
    'hash',
  ];
  const lines = rows.map((r) =>
    [
      r.id,
      r.occurred_at,
      r.actor_name ?? 'system',
      r.actor_email,
      r.action,
      r.object_type,
      r.object_id,
      r.old_value,
      r.new_value,
      r.reason,
      r.session_id,
      r.token_id,
      r.hash,
    ]
      .map(csvField)
      .join(','),
  );
  return `${[header.join(','), ...lines].join('\r\n')}\r\n`;
}

/** The names the audit page's sentences need (lib/audit/sentences.ts) for the events shown. */
export async function auditNames(
  db: Kysely<Database>,
  project: { id: string; code: string },
  events: ReadonlyArray<{ object_type: string; object_id: string | null }>,
): Promise<AuditNames> {
  const ids = (type: string) => [
    ...new Set(events.filter((e) => e.object_type === type && e.object_id).map((e) => e.object_id!)),
  ];
  const checkIds = ids('check');
  const userIds = ids('user');
  const [sheets, checks, users] = await Promise.all([
    db.selectFrom('sheets').select(['id', 'number']).where('project_id', '=', project.id).execute(),
    checkIds.length
      ? db.selectFrom('checks').select(['id', 'sheet_id']).where('id', 'in', checkIds).execute()
      : Promise.resolve([]),
    userIds.length
      ? db.selectFrom('users').select(['id', 'display_name']).where('id', 'in', userIds).execute()
      : Promise.resolve([]),
  ]);
  return {
    sheets: new Map(sheets.map((s) => [s.id, { number: s.number, code: formatSheetNumber(project.code, s.number) }])),
    checks: new Map(checks.map((c) => [c.id, c.sheet_id])),
    users: new Map(users.map((u) => [u.id, u.display_name])),
  };
}
