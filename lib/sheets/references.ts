// Citations between sheets: a calculation cell reads a named result of an issued revision of
// another sheet of the same project, `fromRevision("TPT2-CALC-0003", "B", "Brho")`. The engine never
// reads the database, so the server resolves each citation here, before evaluating, to the value as
// issued (the result stored with the revision's version), or to the reason it cannot be used.
import { sql, type Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import { createEngineMath, type EngineMath } from '@/lib/calc/math-instance';
import type { ResolvedReference, SheetReference, StatementResult } from '@/lib/calc/types';
import { formatSheetNumber } from './sheet-number';

/** Why citations cannot resolve when the cells are evaluated outside a saved sheet. */
export const NO_PROJECT_FOR_REFERENCES = 'save the sheet in a project to cite issued revisions';

/** A resolved citation and the revision row it resolved to (null when it did not resolve). */
export interface ResolvedCitation {
  reference: ResolvedReference;
  revisionId: string | null;
}

const SHEET_NUMBER = /^([A-Z][A-Z0-9]{1,9})-CALC-(\d{1,9})$/;

function failed(
  ref: SheetReference,
  error: string,
  status: ResolvedReference['status'] = null,
  extra: Partial<ResolvedReference> = {},
): ResolvedCitation {
  return {
    reference: { ...ref, value: null, error, status, supersededBy: null, title: null, versionSha256: null, ...extra },
    revisionId: null,
  };
}

/** Every citation answered with the same error (cells evaluated without a sheet of a project). */
export function unresolvedReferences(
  refs: readonly SheetReference[],
  error = NO_PROJECT_FOR_REFERENCES,
): ResolvedReference[] {
  return refs.map((ref) => failed(ref, error).reference);
}

let unitMath: EngineMath | null = null;
/** `u` expressed in `to`; null when the two units do not convert. */
function convertUncertainty(u: number, from: string | null, to: string | null): number | null {
  if ((from ?? '') === (to ?? '')) return u;
  if (from === null || to === null) return null;
  unitMath ??= createEngineMath([]);
  try {
    return unitMath.math.unit(u, from).toNumber(to);
  } catch {
    return null;
  }
}

/**
 * Resolves each citation to the value of the named result as issued: the sheet by its number in the
 * same project, the revision by its code (issued, not withdrawn), the result by its name among the
 * definitions of that revision's version. A value comes with the status of the revision (current, or
 * superseded with the code of the current revision); anything else comes back as an error, which the
 * engine shows on the statement that cites it. Each answer (`reference`) comes with the rows it
 * resolved to; `saveVersion` records the revisions of the citations that resolved.
 */
export async function resolveCitations(
  db: Kysely<Database>,
  projectId: string,
  refs: readonly SheetReference[],
  opts: { excludeSheetId?: string } = {},
): Promise<ResolvedCitation[]> {
  if (refs.length === 0) return [];
  const project = await db
    .selectFrom('projects')
    .select(['code'])
    .where('id', '=', projectId)
    .executeTakeFirstOrThrow();
  const out: ResolvedCitation[] = [];
  for (const ref of refs) out.push(await resolveOne(db, projectId, project.code, ref, opts.excludeSheetId));
  return out;
}

async function resolveOne(
  db: Kysely<Database>,
  projectId: string,
  projectCode: string,
  ref: SheetReference,
  excludeSheetId: string | undefined,
): Promise<ResolvedCitation> {
  const m = SHEET_NUMBER.exec(ref.sheet);
  if (!m || m[1] !== projectCode)
    return failed(
      ref,
      `${ref.sheet} is not a sheet of this project (${projectCode}); only sheets of the same project can be cited`,
    );
  const sheet = await db
    .selectFrom('sheets')
    .select(['id', 'number', 'title'])
    .where('project_id', '=', projectId)
    .where('number', '=', Number(m[2]))
    .executeTakeFirst();
  if (!sheet)
    return failed(
      ref,
      `${ref.sheet} is not a sheet of this project: there is no sheet with that number in ${projectCode}`,
    );
  const code = formatSheetNumber(projectCode, sheet.number);
  if (sheet.id === excludeSheetId)
    return failed(ref, `a sheet cannot cite its own revisions (${code})`, null, { title: sheet.title });

  const revision = await db
    .selectFrom('revisions as r')
    .leftJoin('revisions as c', (j) => j.onRef('c.sheet_id', '=', 'r.sheet_id').on('c.status', '=', 'current'))
    .leftJoin('revisions as n', 'n.id', 'r.superseded_by')
    .select([
      'r.id',
      'r.status',
      'r.version_number',
      'r.version_sha256',
      'r.withdrawn_reason',
      'c.code as current_code',
      'n.code as next_code',
    ])
    .where('r.sheet_id', '=', sheet.id)
    .where('r.code', '=', ref.revision)
    .executeTakeFirst();
  if (!revision) {
    const pending = await db
      .selectFrom('issue_jobs')
      .select('id')
      .where('sheet_id', '=', sheet.id)
      .where('revision_code', '=', ref.revision)
      .where('state', '=', 'pending')
      .executeTakeFirst();
    return failed(
      ref,
      pending
        ? `revision ${ref.revision} of ${code} is being issued; cite it once it is issued`
        : `revision ${ref.revision} of ${code} is not issued`,
      null,
      { title: sheet.title },
    );
  }
  const about = { title: sheet.title, versionSha256: revision.version_sha256 };
  if (revision.status === 'withdrawn') {
    return failed(
      ref,
      `revision ${ref.revision} of ${code} was withdrawn: ${revision.withdrawn_reason ?? 'no reason recorded'}`,
      'withdrawn',
      about,
    );
  }

  // The first definition of the name in document order: a later one is a redefinition, an error.
  const found = await db
    .selectFrom('versions')
    .select(
      sql<StatementResult | null>`jsonb_path_query_first(version_results(versions), '$.cells[*].statements[*] ? (@.name == $name && @.kind == "definition")', jsonb_build_object('name', ${ref.name}::text))`.as(
        'statement',
      ),
    )
    .where('sheet_id', '=', sheet.id)
    .where('number', '=', revision.version_number)
    .executeTakeFirstOrThrow();
  const statement = found.statement;
  const status = revision.status;
  const supersededBy = status === 'superseded' ? (revision.current_code ?? revision.next_code) : null;
  const where = `${ref.name} in revision ${ref.revision} of ${code}`;
  if (!statement)
    return failed(ref, `revision ${ref.revision} of ${code} has no result named ${ref.name}`, status, {
      ...about,
      supersededBy,
    });
  if (statement.error)
    return failed(ref, `${where} has an error: ${statement.error}`, status, { ...about, supersededBy });
  const value = statement.value;
  if (!value || typeof value.number !== 'number' || !Number.isFinite(value.number))
    return failed(ref, `${where} is not a number`, status, { ...about, supersededBy });
  let uncertainty: number | null = null;
  const u = statement.uncertainty;
  if (u && typeof u.u === 'number') {
    uncertainty = convertUncertainty(u.u, u.unit ?? null, value.unit ?? null);
    if (uncertainty === null)
      return failed(
        ref,
        `${where}: its uncertainty (${u.unit ?? 'no unit'}) does not convert to its unit (${value.unit ?? 'no unit'})`,
        status,
        { ...about, supersededBy },
      );
  }
  return {
    reference: {
      ...ref,
      value: { number: value.number, unit: value.unit ?? null, uncertainty },
      error: null,
      status,
      supersededBy,
      ...about,
    },
    revisionId: revision.id,
  };
}
