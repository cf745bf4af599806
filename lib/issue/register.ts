// The register of issued revisions: the list (by project or sheet, by status, by title or number),
// its CSV export, and one revision with what superseded it. Queries only.
import { sql, type Kysely } from 'kysely';
import { z } from 'zod';
import type { Database } from '@/db/schema';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';

export const registerQuerySchema = z.object({
  status: z.enum(['current', 'superseded', 'withdrawn', 'all']).default('all'),
  q: z.string().max(200).optional(),
  format: z.enum(['json', 'csv']).default('json'),
});

export async function listRevisions(
  db: Kysely<Database>,
  filter: { projectId?: string; sheetId?: string; status?: string; q?: string },
) {
  let q = db
    .selectFrom('revisions as r')
    .innerJoin('sheets as s', 's.id', 'r.sheet_id')
    .innerJoin('projects as p', 'p.id', 'r.project_id')
    .innerJoin('users as u', 'u.id', 'r.issued_by')
    .leftJoin('revisions as n', 'n.id', 'r.superseded_by')
    .select([
      'r.id',
      'r.code',
      'r.status',
      'r.version_number',
      'r.version_sha256',
      'r.issued_at',
      'r.pdf_sha256',
      'r.pdf_size',
      'r.verification_code',
      'r.withdrawn_reason',
      'r.withdrawn_at',
      'r.superseded_at',
      'n.code as superseded_by_code',
      's.id as sheet_id',
      's.number as sheet_number',
      's.title',
      's.safety_related',
      'p.code as project_code',
      'u.display_name as issued_by',
    ]);
  if (filter.projectId) q = q.where('r.project_id', '=', filter.projectId);
  if (filter.sheetId) q = q.where('r.sheet_id', '=', filter.sheetId);
  if (filter.status && filter.status !== 'all') q = q.where('r.status', '=', filter.status as 'current');
  if (filter.q) {
    const like = `%${filter.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    q = q.where((eb) =>
      eb.or([
        eb('s.title', 'ilike', like),
        eb(sql<string>`p.code || '-CALC-' || lpad(s.number::text, 4, '0')`, 'ilike', like),
      ]),
    );
  }
  const rows = await q.orderBy('s.number').orderBy('r.sequence', 'desc').execute();
  return rows.map((r) => ({
    id: r.id,
    sheetId: r.sheet_id,
    sheet: formatSheetNumber(r.project_code, r.sheet_number),
    sheetNumber: r.sheet_number,
    projectCode: r.project_code,
    title: r.title,
    safetyRelated: r.safety_related,
    revision: r.code,
    status: r.status,
    versionNumber: r.version_number,
    versionSha256: r.version_sha256,
    issuedAt: new Date(r.issued_at).toISOString(),
    issuedBy: r.issued_by,
    pdfSha256: r.pdf_sha256,
    pdfSize: Number(r.pdf_size),
    verificationCode: r.verification_code,
    supersededBy: r.superseded_by_code,
    supersededAt: r.superseded_at ? new Date(r.superseded_at).toISOString() : null,
    withdrawnReason: r.withdrawn_reason,
    withdrawnAt: r.withdrawn_at ? new Date(r.withdrawn_at).toISOString() : null,
  }));
}
export type RegisterRow = Awaited<ReturnType<typeof listRevisions>>[number];

const csvField = (v: unknown) => {
  const s = v === null || v === undefined ? '' : String(v);
  // A leading =, +, - or @ would be read as a formula by spreadsheet programs (OWASP CSV injection).
  const safe = /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
  return /[",\n\r]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
};

/**
 * The register as CSV. `staleInputs` (revision id → its citations of revisions no longer current, from
 * `revisionInputFlags`) fills the last column, `superseded_inputs`.
 */
export function registerCsv(
  rows: RegisterRow[],
  staleInputs: ReadonlyMap<
    string,
    ReadonlyArray<{ sheet: string; revision: string; status: string; currentRevision: string | null }>
  > = new Map(),
): string {
  const header = [
    'sheet',
    'title',
    'revision',
    'status',
    'version',
    'issued_at_utc',
    'issued_by',
    'superseded_by',
    'withdrawn_reason',
    'pdf_sha256',
    'version_sha256',
    'verification_code',
    'superseded_inputs',
  ];
  const stale = (id: string) =>
    (staleInputs.get(id) ?? [])
      .map(
        (c) =>
          `${c.sheet} rev. ${c.revision} (${c.status === 'withdrawn' ? 'withdrawn' : `superseded by rev. ${c.currentRevision}`})`,
      )
      .join('; ');
  const lines = rows.map((r) =>
    [
      r.sheet,
      r.title,
      r.revision,
      r.status,
      r.versionNumber,
      r.issuedAt,
      r.issuedBy,
      r.supersededBy,
      r.withdrawnReason,
      r.pdfSha256,
      r.versionSha256,
      r.verificationCode,
      stale(r.id),
    ]
      .map(csvField)
      .join(','),
  );
  return `${[header.join(','), ...lines].join('\r\n')}\r\n`;
}

export async function getRevision(db: Kysely<Database>, revisionId: string) {
  if (!/^[0-9a-f-]{36}$/.test(revisionId)) return undefined;
  return db
    .selectFrom('revisions as r')
    .innerJoin('sheets as s', 's.id', 'r.sheet_id')
    .innerJoin('projects as p', 'p.id', 'r.project_id')
    .leftJoin('revisions as n', 'n.id', 'r.superseded_by')
    .selectAll('r')
    .select([
      's.number as sheet_number',
      'p.code as project_code',
      'n.code as superseded_by_code',
      'n.issued_at as superseded_by_issued_at',
    ])
    .where('r.id', '=', revisionId)
    .executeTakeFirst();
}
