// Software problem reporting (ASME NQA-1 Part II, Subpart 2.7): when a problem is found in
// the engine or in a constants edition, every calculation that used it must be found so its users
// can be told. Each version records the engine version and the constants edition it was evaluated
// with; this lists the versions (and the revisions issued from them) that match, optionally only
// those whose calculation cells call a given function.
import { sql, type Kysely } from 'kysely';
import { z } from 'zod';
import type { Database, RevisionStatus } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { formatSheetNumber } from './sheet-number';

/** The query of GET /api/software-impact. Empty values mean "any". */
export const softwareImpactQuerySchema = z.object({
  engineVersion: z
    .string()
    .trim()
    .max(100)
    .optional()
    .meta({ description: 'Engine version the versions were evaluated with, exactly as recorded.' }),
  constantsEdition: z
    .string()
    .trim()
    .max(100)
    .optional()
    .meta({ description: 'Constants edition, exactly as recorded.' }),
  function: z
    .string()
    .trim()
    .regex(/^([A-Za-z_][A-Za-z0-9_]{0,99})?$/, 'a function name: a letter or _, then letters, digits or _')
    .optional()
    .meta({
      description:
        'Only versions whose calculation cells call this function (a call written as `name(`, comments included).',
    }),
  format: z.enum(['json', 'csv']).default('json'),
});
export type SoftwareImpactQuery = z.infer<typeof softwareImpactQuerySchema>;

/** At most this many versions are listed (JSON) or exported (CSV); `truncated` says when more match. */
export const SOFTWARE_IMPACT_LIMIT = { json: 2000, csv: 50_000 } as const;

export interface SoftwareImpactRow {
  projectCode: string;
  sheetId: string;
  sheet: string;
  sheetNumber: number;
  title: string;
  safetyRelated: boolean;
  versionNumber: number;
  versionSha256: string;
  engineVersion: string | null;
  constantsEdition: string | null;
  savedAt: string;
  author: string;
  /** The revision issued from this version, if any, and its status now. */
  revision: string | null;
  revisionId: string | null;
  revisionStatus: RevisionStatus | null;
}

export interface Facet {
  value: string;
  versions: number;
  revisions: number;
}

export interface SoftwareImpact {
  filter: { engineVersion: string | null; constantsEdition: string | null; function: string | null };
  /** Distinct engine versions and constants editions in the projects the caller may see, with counts. */
  engineVersions: Facet[];
  constantsEditions: Facet[];
  /** Null when no filter is given: pick an engine version, a constants edition or a function first. */
  rows: SoftwareImpactRow[] | null;
  summary: {
    versions: number;
    sheets: number;
    revisions: number;
    currentRevisions: number;
    safetyRelatedSheets: number;
  } | null;
  truncated: boolean;
}

/** Projects the actor may see here: all for administrators, else those they are a member of. */
function visibleSheets(db: Kysely<Database>, actor: Actor) {
  let q = db.selectFrom('sheets as s').innerJoin('projects as p', 'p.id', 's.project_id');
  if (!actor.isAdmin)
    q = q.where('s.project_id', 'in', (eb) =>
      eb.selectFrom('project_members').select('project_id').where('user_id', '=', actor.userId),
    );
  return q;
}

async function facet(
  db: Kysely<Database>,
  actor: Actor,
  column: 'engine_version' | 'constants_edition',
): Promise<Facet[]> {
  const rows = await visibleSheets(db, actor)
    .innerJoin('versions as v', 'v.sheet_id', 's.id')
    .leftJoin('revisions as r', (j) =>
      j.onRef('r.sheet_id', '=', 'v.sheet_id').onRef('r.version_number', '=', 'v.number'),
    )
    .select([
      `v.${column} as value`,
      sql<string>`count(distinct v.id)`.as('versions'),
      sql<string>`count(distinct r.id)`.as('revisions'),
    ])
    .where(`v.${column}`, 'is not', null)
    .groupBy(`v.${column}`)
    .orderBy(`v.${column}`, 'desc')
    .execute();
  return rows.map((r) => ({ value: r.value as string, versions: Number(r.versions), revisions: Number(r.revisions) }));
}

export async function softwareImpact(
  db: Kysely<Database>,
  actor: Actor,
  query: SoftwareImpactQuery,
): Promise<SoftwareImpact> {
  const engineVersion = query.engineVersion || null;
  const constantsEdition = query.constantsEdition || null;
  const fn = query.function || null;
  const [engineVersions, constantsEditions] = await Promise.all([
    facet(db, actor, 'engine_version'),
    facet(db, actor, 'constants_edition'),
  ]);
  const filter = { engineVersion, constantsEdition, function: fn };
  if (!engineVersion && !constantsEdition && !fn)
    return { filter, engineVersions, constantsEditions, rows: null, summary: null, truncated: false };

  const limit = SOFTWARE_IMPACT_LIMIT[query.format];
  let q = visibleSheets(db, actor)
    .innerJoin('versions as v', 'v.sheet_id', 's.id')
    .innerJoin('users as u', 'u.id', 'v.author_id')
    .leftJoin('revisions as r', (j) =>
      j.onRef('r.sheet_id', '=', 'v.sheet_id').onRef('r.version_number', '=', 'v.number'),
    )
    .select([
      'p.code as project_code',
      's.id as sheet_id',
      's.number as sheet_number',
      's.title',
      's.safety_related',
      'v.number as version_number',
      'v.content_hash',
      'v.engine_version',
      'v.constants_edition',
      'v.created_at',
      'u.display_name as author',
      'r.id as revision_id',
      'r.code as revision_code',
      'r.status as revision_status',
    ]);
  if (engineVersion) q = q.where('v.engine_version', '=', engineVersion);
  if (constantsEdition) q = q.where('v.constants_edition', '=', constantsEdition);
  if (fn) {
    // A call is the name as a whole word followed by "(" (PostgreSQL's \m is the start of a word);
    // the name is an identifier (checked by the schema), so it needs no escaping in the pattern.
    const pattern = `\\m${fn}\\s*\\(`;
    q = q.where(
      sql<boolean>`exists (select 1 from jsonb_array_elements(v.content -> 'cells') as c(cell) where c.cell ->> 'kind' = 'calc' and c.cell ->> 'source' ~ ${pattern})`,
    );
  }
  const found = await q
    .orderBy('p.code')
    .orderBy('s.number')
    .orderBy('v.number')
    .limit(limit + 1)
    .execute();
  const truncated = found.length > limit;
  const rows: SoftwareImpactRow[] = found.slice(0, limit).map((r) => ({
    projectCode: r.project_code,
    sheetId: r.sheet_id,
    sheet: formatSheetNumber(r.project_code, r.sheet_number),
    sheetNumber: r.sheet_number,
    title: r.title,
    safetyRelated: r.safety_related,
    versionNumber: r.version_number,
    versionSha256: r.content_hash,
    engineVersion: r.engine_version,
    constantsEdition: r.constants_edition,
    savedAt: new Date(r.created_at).toISOString(),
    author: r.author,
    revision: r.revision_code,
    revisionId: r.revision_id,
    revisionStatus: r.revision_status,
  }));
  const sheets = new Set(rows.map((r) => r.sheetId));
  const summary = {
    versions: rows.length,
    sheets: sheets.size,
    revisions: rows.filter((r) => r.revision !== null).length,
    currentRevisions: rows.filter((r) => r.revisionStatus === 'current').length,
    safetyRelatedSheets: new Set(rows.filter((r) => r.safetyRelated).map((r) => r.sheetId)).size,
  };
  return { filter, engineVersions, constantsEditions, rows, summary, truncated };
}

const csvField = (v: unknown) => {
  const s = v === null || v === undefined ? '' : String(v);
  // A leading =, +, - or @ would be read as a formula by spreadsheet programs (OWASP CSV injection).
  const safe = /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
  return /[",\n\r]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
};

export function softwareImpactCsv(rows: SoftwareImpactRow[]): string {
  const header = [
    'project',
    'sheet',
    'title',
    'safety_related',
    'version',
    'version_sha256',
    'engine_version',
    'constants_edition',
    'saved_at_utc',
    'author',
    'revision',
    'revision_status',
  ];
  const lines = rows.map((r) =>
    [
      r.projectCode,
      r.sheet,
      r.title,
      r.safetyRelated ? 'yes' : 'no',
      r.versionNumber,
      r.versionSha256,
      r.engineVersion,
      r.constantsEdition,
      r.savedAt,
      r.author,
      r.revision,
      r.revisionStatus,
    ]
      .map(csvField)
      .join(','),
  );
  return `${[header.join(','), ...lines].join('\r\n')}\r\n`;
}
