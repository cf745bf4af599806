// What follows from citations between sheets (`version_references`): a sheet whose inputs were
// superseded since it cited them (the "Superseded input" caution on the sheet page, the flags in the
// registers), and everything that depends on a sheet's revisions, directly or through other sheets'
// revisions (the impact page). A version's citations never change; a cited revision's status does.
import { sql, type Kysely } from 'kysely';
import type { Database, RevisionStatus } from '@/db/schema';
import type { StatementResult } from '@/lib/calc/types';
import { formatSheetNumber } from './sheet-number';

/** A cited result as one revision's version recorded it. */
export interface CitedValue {
  /** Display text as recorded ("2.432 13 T·m"), or the error. */
  text: string;
  number: number | null;
  unit: string | null;
  error: string | null;
}

export interface SupersededInput {
  sheetId: string;
  /** "TPT2-CALC-0003". */
  sheet: string;
  sheetNumber: number;
  title: string;
  /** The revision cited, no longer current. */
  revision: string;
  status: Exclude<RevisionStatus, 'current'>;
  withdrawnReason: string | null;
  versionNumber: number;
  /** The sheet's current revision now, if it has one. */
  currentRevision: string | null;
  currentVersionNumber: number | null;
  /** Each cited name: its value in the cited revision, and in the current one (null: no longer defined, or no current revision). */
  names: Array<{ name: string; cited: CitedValue | null; current: CitedValue | null; changed: boolean }>;
  /** The comparison page between the two revisions' versions, when there is a current revision. */
  compareHref: string | null;
}

/** A citation, in a version issued or latest, of a revision that is no longer current. */
export interface StaleCitation {
  sheet: string;
  sheetNumber: number;
  revision: string;
  status: Exclude<RevisionStatus, 'current'>;
  currentRevision: string | null;
}

function valueOf(statement: StatementResult | null): CitedValue | null {
  if (!statement) return null;
  if (statement.error) return { text: statement.error, number: null, unit: null, error: statement.error };
  const v = statement.value;
  return { text: v?.text ?? '', number: v?.number ?? null, unit: v?.unit ?? null, error: null };
}

/** The first definition of each name in a version's stored results. */
async function definitions(
  db: Kysely<Database>,
  sheetId: string,
  versionNumber: number,
  names: string[],
): Promise<Map<string, CitedValue | null>> {
  if (names.length === 0) return new Map();
  const rows = await sql<{ name: string; statement: StatementResult | null }>`
    select n.name, jsonb_path_query_first(version_results(v), '$.cells[*].statements[*] ? (@.name == $name && @.kind == "definition")', jsonb_build_object('name', n.name)) as statement
    from versions v cross join unnest(${names}::text[]) as n(name)
    where v.sheet_id = ${sheetId} and v.number = ${versionNumber}`.execute(db);
  return new Map(rows.rows.map((r) => [r.name, valueOf(r.statement)]));
}

const sameValue = (a: CitedValue | null, b: CitedValue | null) =>
  a !== null && b !== null && a.error === null && b.error === null && a.number === b.number && a.unit === b.unit;

/**
 * The citations of a version (the sheet's latest when `versionNumber` is not given) whose revision
 * is no longer current (superseded, or withdrawn), with the values then and now. Empty when every
 * cited revision is current: the flag clears when the sheet saves a version citing the current one.
 */
export async function supersededInputs(
  db: Kysely<Database>,
  sheetId: string,
  versionNumber?: number,
): Promise<SupersededInput[]> {
  let version = db.selectFrom('versions').select(['id']).where('sheet_id', '=', sheetId);
  version =
    versionNumber === undefined
      ? version.orderBy('number', 'desc').limit(1)
      : version.where('number', '=', versionNumber);
  const v = await version.executeTakeFirst();
  if (!v) return [];
  const rows = await db
    .selectFrom('version_references as vr')
    .innerJoin('revisions as r', 'r.id', 'vr.revision_id')
    .innerJoin('sheets as s', 's.id', 'r.sheet_id')
    .innerJoin('projects as p', 'p.id', 's.project_id')
    .leftJoin('revisions as c', (j) => j.onRef('c.sheet_id', '=', 'r.sheet_id').on('c.status', '=', 'current'))
    .select([
      'vr.name',
      'r.id',
      'r.code',
      'r.status',
      'r.withdrawn_reason',
      'r.version_number',
      'r.sequence',
      's.id as sheet_id',
      's.number',
      's.title',
      'p.code as project_code',
      'c.code as current_code',
      'c.version_number as current_version',
    ])
    .where('vr.version_id', '=', v.id)
    .where('r.status', '<>', 'current')
    .orderBy('s.number')
    .orderBy('r.sequence')
    .orderBy('vr.name')
    .execute();
  const byRevision = new Map<string, { row: (typeof rows)[number]; names: string[] }>();
  for (const row of rows) {
    const entry = byRevision.get(row.id) ?? { row, names: [] };
    entry.names.push(row.name);
    byRevision.set(row.id, entry);
  }
  const out: SupersededInput[] = [];
  for (const { row, names } of byRevision.values()) {
    const [cited, current] = await Promise.all([
      definitions(db, row.sheet_id, row.version_number, names),
      row.current_version === null
        ? Promise.resolve(new Map<string, CitedValue | null>())
        : definitions(db, row.sheet_id, row.current_version, names),
    ]);
    out.push({
      sheetId: row.sheet_id,
      sheet: formatSheetNumber(row.project_code, row.number),
      sheetNumber: row.number,
      title: row.title,
      revision: row.code,
      status: row.status as SupersededInput['status'],
      withdrawnReason: row.withdrawn_reason,
      versionNumber: row.version_number,
      currentRevision: row.current_code,
      currentVersionNumber: row.current_version,
      names: names.map((name) => {
        const then = cited.get(name) ?? null;
        const now = current.get(name) ?? null;
        return { name, cited: then, current: now, changed: !sameValue(then, now) };
      }),
      compareHref:
        row.current_version !== null && row.current_version !== row.version_number
          ? `/projects/${row.project_code}/sheets/${row.number}/compare?base=${row.version_number}&target=${row.current_version}`
          : null,
    });
  }
  return out;
}

type StaleRow = {
  key: string;
  sheet_number: number;
  project_code: string;
  code: string;
  status: RevisionStatus;
  current_code: string | null;
};

function groupStale(rows: StaleRow[]): Map<string, StaleCitation[]> {
  const out = new Map<string, StaleCitation[]>();
  for (const r of rows) {
    const list = out.get(r.key) ?? [];
    const sheet = formatSheetNumber(r.project_code, r.sheet_number);
    if (!list.some((x) => x.sheet === sheet && x.revision === r.code)) {
      list.push({
        sheet,
        sheetNumber: r.sheet_number,
        revision: r.code,
        status: r.status as StaleCitation['status'],
        currentRevision: r.current_code,
      });
    }
    out.set(r.key, list);
  }
  return out;
}

/**
 * For the document register: per revision of the project (by id), the revisions its own version
 * cites that are no longer current. Revisions without such a citation are absent.
 */
export async function revisionInputFlags(
  db: Kysely<Database>,
  projectId: string,
): Promise<Map<string, StaleCitation[]>> {
  const rows = await db
    .selectFrom('revisions as d')
    .innerJoin('versions as v', (j) =>
      j.onRef('v.sheet_id', '=', 'd.sheet_id').onRef('v.number', '=', 'd.version_number'),
    )
    .innerJoin('version_references as vr', 'vr.version_id', 'v.id')
    .innerJoin('revisions as r', 'r.id', 'vr.revision_id')
    .innerJoin('sheets as s', 's.id', 'r.sheet_id')
    .innerJoin('projects as p', 'p.id', 's.project_id')
    .leftJoin('revisions as c', (j) => j.onRef('c.sheet_id', '=', 'r.sheet_id').on('c.status', '=', 'current'))
    .select([
      'd.id as key',
      's.number as sheet_number',
      'p.code as project_code',
      'r.code',
      'r.status',
      'c.code as current_code',
    ])
    .where('d.project_id', '=', projectId)
    .where('r.status', '<>', 'current')
    .orderBy('s.number')
    .orderBy('r.sequence')
    .execute();
  return groupStale(rows);
}

/** For the sheet list: per sheet of the project (by id), what its latest version cites that is no longer current. */
export async function sheetInputFlags(db: Kysely<Database>, projectId: string): Promise<Map<string, StaleCitation[]>> {
  const rows = await db
    .selectFrom('versions as v')
    .innerJoin('sheets as d', 'd.id', 'v.sheet_id')
    .innerJoin('version_references as vr', 'vr.version_id', 'v.id')
    .innerJoin('revisions as r', 'r.id', 'vr.revision_id')
    .innerJoin('sheets as s', 's.id', 'r.sheet_id')
    .innerJoin('projects as p', 'p.id', 's.project_id')
    .leftJoin('revisions as c', (j) => j.onRef('c.sheet_id', '=', 'r.sheet_id').on('c.status', '=', 'current'))
    .select([
      'd.id as key',
      's.number as sheet_number',
      'p.code as project_code',
      'r.code',
      'r.status',
      'c.code as current_code',
    ])
    .where('d.project_id', '=', projectId)
    .where('v.number', '=', (eb) =>
      eb
        .selectFrom('versions as l')
        .select(sql<number>`max(l.number)`.as('n'))
        .whereRef('l.sheet_id', '=', 'v.sheet_id'),
    )
    .where('r.status', '<>', 'current')
    .orderBy('s.number')
    .orderBy('r.sequence')
    .execute();
  return groupStale(rows);
}

/** Per project (by id): how many current revisions cite a revision that is no longer current. */
export async function staleRevisionCounts(db: Kysely<Database>, projectIds: string[]): Promise<Map<string, number>> {
  if (projectIds.length === 0) return new Map();
  const rows = await db
    .selectFrom('revisions as d')
    .innerJoin('versions as v', (j) =>
      j.onRef('v.sheet_id', '=', 'd.sheet_id').onRef('v.number', '=', 'd.version_number'),
    )
    .innerJoin('version_references as vr', 'vr.version_id', 'v.id')
    .innerJoin('revisions as r', 'r.id', 'vr.revision_id')
    .select(['d.project_id', sql<string>`count(distinct d.id)`.as('n')])
    .where('d.project_id', 'in', projectIds)
    .where('d.status', '=', 'current')
    .where('r.status', '<>', 'current')
    .groupBy('d.project_id')
    .execute();
  return new Map(rows.map((r) => [r.project_id, Number(r.n)]));
}

// ── Impact ────────────────────────────────────────────────────────────────────────────────────

/** A sheet that cites a revision, directly (depth 1) or through a revision that depends on it. */
export interface ImpactDependent {
  /** 1 when the sheet cites the revision itself; 2 when it cites a revision that does; and so on. */
  depth: number;
  /** The revision this sheet cites on the way: the root revision at depth 1. */
  via: { sheetId: string; sheet: string; sheetNumber: number; revision: string; status: RevisionStatus };
  sheetId: string;
  sheet: string;
  sheetNumber: number;
  title: string;
  /** The dependent's versions that cite `via`, and the names they cite. */
  versions: number[];
  names: string[];
  /** Revisions issued from those versions (what in turn carries the dependency further). */
  issuedAs: Array<{ id: string; revision: string; status: RevisionStatus; versionNumber: number }>;
  latestVersion: number;
  /** Whether the dependent's latest version still cites `via`. */
  latestCitesVia: boolean;
  /** Whether the dependent's latest version cites any revision that is no longer current. */
  latestCitesSuperseded: boolean;
}

export interface RevisionImpact {
  id: string;
  revision: string;
  status: RevisionStatus;
  versionNumber: number;
  issuedAt: string;
  dependents: ImpactDependent[];
}

/** Dependencies deeper than this are not followed (they cannot cycle: each step goes to a later revision). */
const MAX_IMPACT_DEPTH = 25;

/**
 * Everything that depends on each revision of a sheet: the sheets whose versions cite it, then the
 * sheets citing the revisions issued from those versions, and so on, each marked with its depth.
 */
export async function sheetImpact(db: Kysely<Database>, sheetId: string): Promise<RevisionImpact[]> {
  const roots = await db
    .selectFrom('revisions')
    .select(['id', 'code', 'status', 'version_number', 'issued_at'])
    .where('sheet_id', '=', sheetId)
    .orderBy('sequence', 'desc')
    .execute();
  const out: RevisionImpact[] = [];
  for (const root of roots) {
    out.push({
      id: root.id,
      revision: root.code,
      status: root.status,
      versionNumber: root.version_number,
      issuedAt: new Date(root.issued_at).toISOString(),
      dependents: await dependentsOf(db, root.id),
    });
  }
  return out;
}

async function dependentsOf(db: Kysely<Database>, rootRevisionId: string): Promise<ImpactDependent[]> {
  const seen = new Set<string>([rootRevisionId]);
  let frontier = [rootRevisionId];
  const found: Array<
    Omit<ImpactDependent, 'latestVersion' | 'latestCitesVia' | 'latestCitesSuperseded'> & { viaId: string }
  > = [];
  for (let depth = 1; frontier.length > 0 && depth <= MAX_IMPACT_DEPTH; depth++) {
    const rows = await db
      .selectFrom('version_references as vr')
      .innerJoin('versions as v', 'v.id', 'vr.version_id')
      .innerJoin('sheets as d', 'd.id', 'v.sheet_id')
      .innerJoin('revisions as r', 'r.id', 'vr.revision_id')
      .innerJoin('sheets as s', 's.id', 'r.sheet_id')
      .innerJoin('projects as p', 'p.id', 's.project_id')
      .innerJoin('projects as dp', 'dp.id', 'd.project_id')
      .select([
        'vr.name',
        'vr.revision_id',
        'r.code',
        'r.status',
        's.id as via_sheet_id',
        's.number as via_number',
        'p.code as via_project',
        'd.id as sheet_id',
        'd.number',
        'd.title',
        'dp.code as project_code',
        'v.number as version',
      ])
      .where('vr.revision_id', 'in', frontier)
      .orderBy('d.number')
      .orderBy('v.number')
      .execute();
    const groups = new Map<string, (typeof found)[number]>();
    for (const row of rows) {
      const key = `${row.revision_id}:${row.sheet_id}`;
      let g = groups.get(key);
      if (!g) {
        g = {
          depth,
          viaId: row.revision_id,
          via: {
            sheetId: row.via_sheet_id,
            sheet: formatSheetNumber(row.via_project, row.via_number),
            sheetNumber: row.via_number,
            revision: row.code,
            status: row.status,
          },
          sheetId: row.sheet_id,
          sheet: formatSheetNumber(row.project_code, row.number),
          sheetNumber: row.number,
          title: row.title,
          versions: [],
          names: [],
          issuedAs: [],
        };
        groups.set(key, g);
      }
      if (!g.versions.includes(row.version)) g.versions.push(row.version);
      if (!g.names.includes(row.name)) g.names.push(row.name);
    }
    const next: string[] = [];
    for (const g of groups.values()) {
      const issued = await db
        .selectFrom('revisions')
        .select(['id', 'code', 'status', 'version_number'])
        .where('sheet_id', '=', g.sheetId)
        .where('version_number', 'in', g.versions)
        .orderBy('sequence')
        .execute();
      g.issuedAs = issued.map((r) => ({
        id: r.id,
        revision: r.code,
        status: r.status,
        versionNumber: r.version_number,
      }));
      for (const r of issued) {
        if (!seen.has(r.id)) {
          seen.add(r.id);
          next.push(r.id);
        }
      }
      found.push(g);
    }
    frontier = next;
  }
  if (found.length === 0) return [];
  const latest = await latestCitations(db, [...new Set(found.map((f) => f.sheetId))]);
  return found.map(({ viaId, ...f }) => {
    const l = latest.get(f.sheetId);
    return {
      ...f,
      latestVersion: l?.version ?? 0,
      latestCitesVia: l?.cited.some((c) => c.revisionId === viaId) ?? false,
      latestCitesSuperseded: l?.cited.some((c) => c.status !== 'current') ?? false,
    };
  });
}

/** Each sheet's latest version number and the revisions it cites, with their status now. */
async function latestCitations(
  db: Kysely<Database>,
  sheetIds: string[],
): Promise<Map<string, { version: number; cited: Array<{ revisionId: string; status: RevisionStatus }> }>> {
  const rows = await db
    .selectFrom('versions as v')
    .leftJoin('version_references as vr', 'vr.version_id', 'v.id')
    .leftJoin('revisions as r', 'r.id', 'vr.revision_id')
    .select(['v.sheet_id', 'v.number', 'r.id as revision_id', 'r.status'])
    .where('v.sheet_id', 'in', sheetIds)
    .where('v.number', '=', (eb) =>
      eb
        .selectFrom('versions as l')
        .select(sql<number>`max(l.number)`.as('n'))
        .whereRef('l.sheet_id', '=', 'v.sheet_id'),
    )
    .execute();
  const out = new Map<string, { version: number; cited: Array<{ revisionId: string; status: RevisionStatus }> }>();
  for (const r of rows) {
    const e = out.get(r.sheet_id) ?? { version: r.number, cited: [] };
    if (r.revision_id && r.status && !e.cited.some((c) => c.revisionId === r.revision_id))
      e.cited.push({ revisionId: r.revision_id, status: r.status });
    out.set(r.sheet_id, e);
  }
  return out;
}
