// Content-Security-Policy violation reports, as browsers send them to CSP_REPORT_PATH: the report-uri
// form (application/csp-report, one report) and the Reporting API form (application/reports+json, a
// batch). Anyone can post here, so everything is capped: the body's size, the reports in one body,
// the length of every text kept, the reports kept per address and in all per period, and their age.
import { sql, type Kysely } from 'kysely';
import { z } from 'zod';
import type { Database } from '@/db/schema';
import { AppError } from '@/lib/errors/app-error';

export const CSP_REPORT_LIMITS = {
  bodyBytes: 64 * 1024,
  reportsPerBody: 20,
  textChars: 1024,
  perAddress: { count: 60, minutes: 10 },
  overall: { count: 10_000, hours: 24 },
  keepDays: 30,
} as const;

export const CSP_REPORT_TYPES = ['application/csp-report', 'application/reports+json', 'application/json'] as const;

/** The two forms a body may take (parseCspReports checks it, then reads the fields leniently, as browsers vary). */
export const cspReportBodySchema = z.union([
  z.object({
    'csp-report': z
      .record(z.string(), z.unknown())
      .meta({ description: 'document-uri, blocked-uri, effective-directive, disposition, …' }),
  }),
  z
    .array(z.object({ type: z.string(), url: z.string().optional(), body: z.record(z.string(), z.unknown()) }))
    .meta({ description: 'A Reporting API batch (application/reports+json); only `csp-violation` reports are kept.' }),
]);

export interface CspViolation {
  documentUri: string | null;
  blockedUri: string | null;
  directive: string | null;
  disposition: string | null;
  report: Record<string, unknown>;
}

function isObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** The report with every string cut to the limit and nothing nested beyond one level kept. */
function trimmed(report: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(report).slice(0, 40)) {
    const k = key.slice(0, 64);
    if (typeof value === 'string') out[k] = value.slice(0, CSP_REPORT_LIMITS.textChars);
    else if (typeof value === 'number' || typeof value === 'boolean' || value === null) out[k] = value;
  }
  return out;
}

function text(value: unknown): string | null {
  return typeof value === 'string' && value !== '' ? value.slice(0, CSP_REPORT_LIMITS.textChars) : null;
}

/** From the report-uri form: { "csp-report": { "document-uri", "blocked-uri", "violated-directive", … } }. */
function fromReportUri(body: Record<string, unknown>): CspViolation | null {
  const r = body['csp-report'];
  if (!isObject(r)) return null;
  const report = trimmed(r);
  return {
    documentUri: text(r['document-uri']),
    blockedUri: text(r['blocked-uri']),
    directive: text(r['effective-directive']) ?? text(r['violated-directive']),
    disposition: text(r.disposition),
    report,
  };
}

/** From the Reporting API form: [{ "type": "csp-violation", "url", "body": { "documentURL", "blockedURL", … } }]. */
function fromReportingApi(item: unknown): CspViolation | null {
  if (!isObject(item) || item.type !== 'csp-violation' || !isObject(item.body)) return null;
  const b = item.body;
  return {
    documentUri: text(b.documentURL) ?? text(item.url),
    blockedUri: text(b.blockedURL),
    directive: text(b.effectiveDirective),
    disposition: text(b.disposition),
    report: { ...trimmed(b), user_agent: text(item.user_agent) },
  };
}

/** The violations a body holds (others, such as deprecation reports in a batch, are left out); 400 when it holds none. */
export function parseCspReports(body: unknown): CspViolation[] {
  if (!cspReportBodySchema.safeParse(body).success) {
    throw new AppError('bad_request', 'The body is not a Content-Security-Policy violation report.');
  }
  const items = Array.isArray(body) ? body.slice(0, CSP_REPORT_LIMITS.reportsPerBody) : [body];
  const violations = items
    .map((item) => (isObject(item) && 'csp-report' in item ? fromReportUri(item) : fromReportingApi(item)))
    .filter((v): v is CspViolation => v !== null);
  if (violations.length === 0 && !(Array.isArray(body) && body.length > 0)) {
    throw new AppError('bad_request', 'The body is not a Content-Security-Policy violation report.');
  }
  return violations;
}

export type RecordOutcome =
  { stored: number; limited: false } | { stored: number; limited: true; retryAfterSeconds: number };

/**
 * Stores the violations from `ip` within the caps; when a cap is reached the rest are dropped and the
 * outcome says so. One transaction under an advisory lock, so concurrent posts cannot pass a cap.
 */
export async function recordCspReports(
  db: Kysely<Database>,
  { ip, violations }: { ip: string; violations: CspViolation[] },
): Promise<RecordOutcome> {
  const L = CSP_REPORT_LIMITS;
  return db.transaction().execute(async (trx) => {
    await sql`select pg_advisory_xact_lock(hashtext('csp_reports'))`.execute(trx);
    await trx
      .deleteFrom('csp_reports')
      .where('received_at', '<', sql<Date>`now() - make_interval(days => ${L.keepDays})`)
      .execute();
    const counts = await trx
      .selectFrom('csp_reports')
      .select([
        sql<string>`count(*) filter (where ip = ${ip} and received_at > now() - make_interval(mins => ${L.perAddress.minutes}))`.as(
          'address',
        ),
        sql<string>`count(*) filter (where received_at > now() - make_interval(hours => ${L.overall.hours}))`.as(
          'overall',
        ),
      ])
      .executeTakeFirstOrThrow();
    const addressRoom = L.perAddress.count - Number(counts.address);
    const overallRoom = L.overall.count - Number(counts.overall);
    const room = Math.max(0, Math.min(addressRoom, overallRoom));
    const kept = violations.slice(0, room);
    if (kept.length > 0) {
      await trx
        .insertInto('csp_reports')
        .values(
          kept.map((v) => ({
            ip,
            document_uri: v.documentUri,
            blocked_uri: v.blockedUri,
            directive: v.directive,
            disposition: v.disposition,
            report: JSON.stringify(v.report),
          })),
        )
        .execute();
    }
    if (kept.length === violations.length) return { stored: kept.length, limited: false };
    return {
      stored: kept.length,
      limited: true,
      retryAfterSeconds: addressRoom <= overallRoom ? L.perAddress.minutes * 60 : 3600,
    };
  });
}
