// Sheets and their versions. A sheet is numbered by the server within its project; every save is
// a new immutable version that names the version it was based on, and a save based on anything but
// the latest version is refused (409) so that no one's work is silently overwritten.
import { sql, type Kysely, type Transaction } from 'kysely';
import { z } from 'zod';
import { INT4_MAX } from '@/lib/http/params';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { auditRow, recordAudit } from '@/lib/audit/record';
import type { InputTable, SheetResult } from '@/lib/calc/types';
import {
  copyAttachments,
  insertAttachment,
  resolveAttachments,
  storeAttachmentBytes,
  tablesOfFiles,
  type CheckedAttachment,
} from '@/lib/attachments/attachments';
import type { ObjectStore } from '@/lib/storage/object-store';
import { evaluateInContext } from './evaluate-in-context';
import { sheetStatuses } from '@/lib/checks/status';
import { AppError } from '@/lib/errors/app-error';
import { emptyRecord, versionContentSchema, type VersionContent } from './content';
import { NEW_SHEET_DISPLAY_UNITS } from '@/lib/calc/display-units';
import { contentHash } from './content-hash';
import type { ResolvedCitation } from './references';
import { formatSheetNumber } from './sheet-number';
import { resultRows, storeResults } from './result-storage';

export const createSheetSchema = z.object({
  title: z.string().trim().min(1, 'give the sheet a title').max(300),
  safetyRelated: z.boolean(),
  objective: z.string().trim().max(100_000).default(''),
});

export const saveVersionSchema = z.object({
  parentNumber: z.number().int().positive().max(INT4_MAX),
  message: z.string().trim().min(1, 'say what changed').max(2000),
  content: versionContentSchema,
});

export async function listSheets(db: Kysely<Database>, projectId: string, projectCode: string) {
  const rows = await db
    .selectFrom('sheets as s')
    .innerJoin('users as o', 'o.id', 's.created_by')
    .leftJoin(
      (eb) =>
        eb
          .selectFrom('versions')
          .select(['sheet_id', sql<number>`max(number)`.as('latest'), sql<Date>`max(created_at)`.as('updated')])
          .groupBy('sheet_id')
          .as('v'),
      (j) => j.onRef('v.sheet_id', '=', 's.id'),
    )
    .select([
      's.id',
      's.number',
      's.title',
      's.safety_related',
      's.voided_at',
      's.starter',
      'o.display_name as originator',
      'v.latest',
      'v.updated',
      's.created_at',
    ])
    .where('s.project_id', '=', projectId)
    .orderBy('s.number')
    .execute();
  const statuses = await sheetStatuses(
    db,
    rows.map((r) => ({ id: r.id, latestVersion: r.latest === null ? null : Number(r.latest) })),
  );
  const current = new Map(
    (
      await db
        .selectFrom('revisions')
        .select(['sheet_id', 'code'])
        .where('project_id', '=', projectId)
        .where('status', '=', 'current')
        .execute()
    ).map((r) => [r.sheet_id, r.code]),
  );
  return rows.map((r) => ({
    id: r.id,
    number: r.number,
    code: formatSheetNumber(projectCode, r.number),
    title: r.title,
    safetyRelated: r.safety_related,
    starter: r.starter,
    // A void sheet stays in the register, shown as void whatever its checks were.
    status: r.voided_at ? ('void' as const) : (statuses.get(r.id) ?? ('draft' as const)),
    currentRevision: current.get(r.id) ?? null,
    latestVersion: r.latest === null ? null : Number(r.latest),
    originator: r.originator,
    updatedAt: (r.updated ?? r.created_at) as Date,
  }));
}

/**
 * Evaluates content for storing with a version (lib/sheets/evaluate-in-context.ts): as a save, which
 * the author's own editor evaluations in flight never make wait or refuse (lib/calc/sandbox/evaluator.ts),
 * in the project's cache scope, with the content's own settings.
 */
function evaluateContent(
  db: Kysely<Database>,
  content: VersionContent,
  target: { sheetId: string | null; sheetKey: string; projectId: string; userId: string },
  attachments: { tables: InputTable[] } | VersionContent['attachments'] = { tables: [] },
) {
  return evaluateInContext(db, {
    cells: content.cells,
    settings: content,
    sheet: { id: target.sheetId, projectId: target.projectId },
    attachments,
    run: { kind: 'save', userId: target.userId, affinity: target.sheetKey },
  });
}

/** A new sheet's version 1: its title, safety flag and objective, no cells. */
function firstContent(input: z.infer<typeof createSheetSchema>): VersionContent {
  return versionContentSchema.parse({
    schema: 1,
    title: input.title,
    safetyRelated: input.safetyRelated,
    significantFigures: 6,
    // Written explicitly (a version without it shows SI units, as versions did before the setting).
    displayUnits: NEW_SHEET_DISPLAY_UNITS,
    record: { ...emptyRecord(), objective: input.objective },
    cells: [],
    attachments: [],
  });
}

/** Numbers and inserts a sheet with its version 1 (already evaluated), inside `trx`. */
/** Where a new sheet was started from: the exact version copied (lib/sheets/start-from.ts). */
export interface SheetOrigin {
  versionId: string;
  sheet: string;
  version: number;
  sha256: string;
}

async function insertSheet(
  trx: Transaction<Database>,
  actor: Actor,
  project: { id: string; code: string },
  input: z.infer<typeof createSheetSchema>,
  content: VersionContent,
  results: SheetResult,
  origin: SheetOrigin | null = null,
) {
  await sql`select pg_advisory_xact_lock(hashtext(${`sheets:${project.id}`}))`.execute(trx);
  const next = await trx
    .selectFrom('sheets')
    .select(sql<number>`coalesce(max(number), 0) + 1`.as('n'))
    .where('project_id', '=', project.id)
    .executeTakeFirstOrThrow();
  const sheet = await trx
    .insertInto('sheets')
    .values({
      project_id: project.id,
      number: Number(next.n),
      title: input.title,
      safety_related: input.safetyRelated,
      created_by: actor.userId,
      started_from_version_id: origin?.versionId ?? null,
    })
    .returning(['id', 'number'])
    .executeTakeFirstOrThrow();
  const hash = contentHash(content);
  const stored = await storeResults(trx, results, null);
  await trx
    .insertInto('versions')
    .values({
      sheet_id: sheet.id,
      number: 1,
      parent_number: null,
      content: JSON.stringify(content),
      content_hash: hash,
      ...stored,
      engine_version: results.engineVersion,
      constants_edition: results.constantsEdition,
      author_id: actor.userId,
      message: 'Sheet created',
    })
    .execute();
  const code = formatSheetNumber(project.code, sheet.number);
  await recordAudit(trx, actor, {
    action: 'sheet.create',
    objectType: 'sheet',
    objectId: sheet.id,
    projectId: project.id,
    newValue: {
      number: code,
      title: input.title,
      safetyRelated: input.safetyRelated,
      version: 1,
      sha256: hash,
      ...(origin ? { startedFrom: { sheet: origin.sheet, version: origin.version, sha256: origin.sha256 } } : {}),
    },
  });
  return { id: sheet.id, number: sheet.number, code };
}

export async function createSheet(
  db: Kysely<Database>,
  actor: Actor,
  project: { id: string; code: string },
  input: z.infer<typeof createSheetSchema>,
) {
  const content = firstContent(input);
  const { results } = await evaluateContent(db, content, {
    sheetId: null,
    sheetKey: `new:${project.id}`,
    projectId: project.id,
    userId: actor.userId,
  });
  return db.transaction().execute((trx) => insertSheet(trx, actor, project, input, content, results));
}

/**
 * Creates a sheet and saves `content` as its version 2 in one transaction: both are evaluated first,
 * so that a sheet never exists without the content it was created for (an import, or a start from
 * another sheet). The attachments `content` cites come either as checked files (an import: their
 * bytes are stored first) or from the sheet it was started from (the rows are copied; the bytes are
 * already stored).
 */
export async function createSheetWithContent(
  db: Kysely<Database>,
  actor: Actor,
  project: { id: string; code: string },
  content: VersionContent,
  message: string,
  source: {
    files?: { checked: CheckedAttachment[]; store: ObjectStore };
    copyFrom?: { sheetId: string; origin: SheetOrigin };
  } = {},
) {
  const input = { title: content.title, safetyRelated: content.safetyRelated, objective: content.record.objective };
  const first = firstContent(input);
  const { results: firstResults } = await evaluateContent(db, first, {
    sheetId: null,
    sheetKey: `new:${project.id}`,
    projectId: project.id,
    userId: actor.userId,
  });
  // A new sheet has no attachments but those it brings, and no revision of its own that a cell could cite.
  const checked = source.files?.checked ?? [];
  let tables: InputTable[];
  if (source.copyFrom) {
    // Every cited attachment must be one of the sheet it was started from (refused with 400 otherwise).
    tables = await resolveAttachments(db, source.copyFrom.sheetId, content.attachments);
  } else {
    const cited = new Set(checked.map((f) => `${f.name}\u0000${f.sha256}`));
    const stray = content.attachments.find((a) => !cited.has(`${a.name}\u0000${a.sha256}`));
    if (stray) throw new AppError('bad_request', `The attachment ${stray.name} is cited but its file is not carried.`);
    tables = tablesOfFiles(checked);
  }
  const prepared = await prepareVersion(db, { id: null, project_id: project.id }, content, actor.userId, tables);
  // The bytes first (write-once storage): an attachment row is only ever written for stored bytes.
  if (source.files && checked.length > 0) await storeAttachmentBytes(db, source.files.store, project.id, checked);
  return db.transaction().execute(async (trx) => {
    const sheet = await insertSheet(trx, actor, project, input, first, firstResults, source.copyFrom?.origin ?? null);
    const target = { id: sheet.id, project_id: project.id };
    for (const file of checked) await insertAttachment(trx, actor, target, file, 'attachment.import');
    if (source.copyFrom) await copyAttachments(trx, actor, source.copyFrom.sheetId, target, content.attachments);
    const saved = await insertVersion(trx, actor, target, { parentNumber: 1, message, content }, prepared);
    return { ...sheet, version: saved.number, sha256: saved.sha256 };
  });
}

export async function getSheet(db: Kysely<Database>, sheetId: string) {
  if (!/^[0-9a-f-]{36}$/.test(sheetId)) return undefined;
  return db
    .selectFrom('sheets')
    .select([
      'id',
      'project_id',
      'number',
      'title',
      'safety_related',
      'created_by',
      'created_at',
      'voided_at',
      'void_reason',
    ])
    .where('id', '=', sheetId)
    .executeTakeFirst();
}

export async function getSheetByNumber(db: Kysely<Database>, projectId: string, number: number) {
  return db
    .selectFrom('sheets')
    .select([
      'id',
      'project_id',
      'number',
      'title',
      'safety_related',
      'created_by',
      'created_at',
      'voided_at',
      'void_reason',
    ])
    .where('project_id', '=', projectId)
    .where('number', '=', number)
    .executeTakeFirst();
}

export async function listVersions(db: Kysely<Database>, sheetId: string) {
  return db
    .selectFrom('versions as v')
    .innerJoin('users as u', 'u.id', 'v.author_id')
    .select([
      'v.number',
      'v.parent_number as parentNumber',
      'v.content_hash as sha256',
      'v.message',
      'v.created_at as createdAt',
      'v.engine_version as engineVersion',
      'v.constants_edition as constantsEdition',
      'u.display_name as author',
    ])
    .where('v.sheet_id', '=', sheetId)
    .orderBy('v.number', 'desc')
    .execute();
}

export async function getVersion(db: Kysely<Database>, sheetId: string, number?: number) {
  let q = db
    .selectFrom('versions as v')
    .innerJoin('users as u', 'u.id', 'v.author_id')
    .select([
      'v.number',
      'v.parent_number as parentNumber',
      'v.content',
      'v.content_hash as sha256',
      sql<unknown>`version_results(v)`.as('results'),
      'v.message',
      'v.created_at as createdAt',
      'v.engine_version as engineVersion',
      'v.constants_edition as constantsEdition',
      'u.display_name as author',
    ])
    .where('v.sheet_id', '=', sheetId);
  q = number === undefined ? q.orderBy('v.number', 'desc').limit(1) : q.where('v.number', '=', number);
  const row = await q.executeTakeFirst();
  return row
    ? { ...row, content: row.content as VersionContent, results: row.results as SheetResult | null }
    : undefined;
}

/** What a save computes before its transaction: the evaluation, the citations and the hash. */
interface PreparedVersion {
  results: SheetResult;
  citations: ResolvedCitation[];
  hash: string;
}

async function prepareVersion(
  db: Kysely<Database>,
  sheet: { id: string | null; project_id: string },
  content: VersionContent,
  userId: string,
  newTables?: InputTable[],
): Promise<PreparedVersion> {
  // Every attachment the content cites must be one uploaded to this sheet; CSV tables feed the cells.
  // (A sheet being created has none yet: its caller gives the tables of the files it brings.)
  // Citations of other sheets' issued revisions are resolved to the values as issued before evaluating;
  // a calculation source holding a bidirectional control character is refused, whoever built the content.
  const { results, citations } = await evaluateContent(
    db,
    content,
    { sheetId: sheet.id, sheetKey: sheet.id ?? `new:${sheet.project_id}`, projectId: sheet.project_id, userId },
    sheet.id ? content.attachments : { tables: newTables ?? [] },
  );
  return { results, citations, hash: contentHash(content) };
}

/** The sheet's void mark and its latest version, read in one query. */
async function readLatest(db: Kysely<Database> | Transaction<Database>, sheetId: string) {
  const { rows } = await sql<{
    voided_at: Date | null;
    number: number;
    content_hash: string;
    result_cells: Buffer | null;
  }>`
    select s.voided_at, v.number, v.content_hash, v.result_cells
    from sheets s
    cross join lateral (
      select number, content_hash, result_cells from versions where sheet_id = s.id order by number desc limit 1
    ) v
    where s.id = ${sheetId}`.execute(db);
  if (rows.length === 0) throw new AppError('not_found', 'No such sheet.');
  return rows[0];
}

const voidSheet = () =>
  new AppError('conflict', 'This sheet is void: it keeps its versions but takes no new ones.', { voided: true });

const movedOn = (latest: { number: number; content_hash: string }, parentNumber: number) =>
  new AppError(
    'conflict',
    `Version ${latest.number} was saved since version ${parentNumber}, which your edits are based on.`,
    {
      latestNumber: latest.number,
      latestSha256: latest.content_hash,
    },
  );

/**
 * Inserts a prepared version on top of `parentNumber`; 409 when the sheet moved on or is void.
 *
 * One read (skipped when this process saved or read the parent: storedCellsOf), then one statement:
 * the sheet's row (locked by its update, which finds nothing once the sheet is void or when the
 * parent is not its latest version), the cells the version before does not hold, the version, the
 * revisions it cites and its audit event. Run on its own the statement is its own transaction, so a save holds the
 * sheet's row and the audit chain's lock only while the database executes it, never across a round
 * trip to this process. A save that raced another based on the same parent collides on the
 * version's number (versions_sheet_number_key) and is refused as the read would have refused it.
 */
async function insertVersion(
  db: Kysely<Database> | Transaction<Database>,
  actor: Actor,
  sheet: { id: string; project_id: string },
  input: z.infer<typeof saveVersionSchema>,
  prepared: PreparedVersion,
) {
  const { results, citations, hash } = prepared;
  // The digests of the parent's stored cells, kept from when this process saved or read it (a version
  // never changes); else read with the sheet's void mark and latest version, which refuse early.
  const parentKey = `${sheet.id}:${input.parentNumber}`;
  let known = storedCellsOf.get(parentKey);
  if (!known) {
    const latest = await readLatest(db, sheet.id);
    if (latest.voided_at) throw voidSheet();
    if (latest.number !== input.parentNumber) throw movedOn(latest, input.parentNumber);
    if (latest.result_cells && !db.isTransaction) remember(parentKey, latest.result_cells);
    known = latest.result_cells ?? undefined;
  }
  const number = input.parentNumber + 1;
  // Only the cells whose results the version before does not hold are stored anew.
  const rows = resultRows(results, known ?? null);
  // The revisions this version depends on, for the superseded-input flags and the impact page.
  const cited = citations.flatMap((c) => (c.revisionId ? [{ revisionId: c.revisionId, name: c.reference.name }] : []));
  const audit = auditRow(actor, {
    action: 'version.save',
    objectType: 'sheet',
    objectId: sheet.id,
    projectId: sheet.project_id,
    newValue: { version: number, parent: input.parentNumber, sha256: hash },
    reason: input.message,
  });
  let inserted: { id: string }[];
  try {
    ({ rows: inserted } = await sql<{ id: string }>`
      with sheet as (
        update sheets
        set title = ${input.content.title}::text, safety_related = ${input.content.safetyRelated}::boolean, updated_at = now()
        where id = ${sheet.id}::uuid and voided_at is null
          and ${input.parentNumber}::integer = (select max(v.number) from versions v where v.sheet_id = ${sheet.id}::uuid)
        returning id
      ), cells as (
        insert into result_cells (hash, result)
        select decode(t.h, 'hex'), t.r::json
        from unnest(${rows.newHashes}::text[], ${rows.newTexts}::text[]) as t(h, r)
        where exists (select 1 from sheet)
        on conflict (hash) do nothing
      ), version as (
        insert into versions (sheet_id, number, parent_number, content, content_hash, result_head, result_cells,
                              engine_version, constants_edition, author_id, message)
        select sheet.id, ${number}::integer, ${input.parentNumber}::integer, ${JSON.stringify(input.content)}::jsonb,
               ${hash}::text, ${rows.result_head}::jsonb, ${rows.result_cells}::bytea, ${results.engineVersion}::text,
               ${results.constantsEdition}::text, ${actor.userId}::uuid, ${input.message}::text
        from sheet
        returning id
      ), refs as (
        insert into version_references (version_id, revision_id, name)
        select version.id, t.r, t.n
        from version, unnest(${cited.map((c) => c.revisionId)}::uuid[], ${cited.map((c) => c.name)}::text[]) as t(r, n)
        on conflict do nothing
      ), audit as (
        insert into audit_events (actor_id, session_id, token_id, project_id, action, object_type, object_id,
                                  old_value, new_value, reason)
        select ${audit.actor_id}::uuid, ${audit.session_id}::uuid, ${audit.token_id}::uuid, ${audit.project_id}::uuid,
               ${audit.action}::text, ${audit.object_type}::text, ${audit.object_id}::text, ${audit.old_value}::jsonb,
               ${audit.new_value}::jsonb, ${audit.reason}::text
        from version
      )
      select id from version`.execute(db));
  } catch (error) {
    const pgError = error as { code?: string; constraint?: string };
    if (pgError.code === '23505' && pgError.constraint === 'versions_sheet_number_key')
      throw movedOn(await readLatest(db, sheet.id), input.parentNumber);
    throw error;
  }
  // No row: the sheet is void, or its latest version is not the parent (voided or saved since the
  // read, or since the parent's cells were kept here): the read says which.
  if (inserted.length === 0) {
    const latest = await readLatest(db, sheet.id);
    if (latest.voided_at || latest.number === input.parentNumber) throw voidSheet();
    throw movedOn(latest, input.parentNumber);
  }
  // Kept once committed: inside a caller's transaction (a new sheet's versions) it may yet roll back.
  if (!db.isTransaction) remember(`${sheet.id}:${number}`, rows.result_cells);
  return { number, sha256: hash, ok: results.ok };
}

/**
 * The digests of a version's stored cells (its `result_cells`), by sheet id and version number, for
 * the versions this process saved or read last: the next save based on one of them need not read it
 * again (one round trip to the database instead of two). A version never changes, so an entry is
 * never wrong; whether the parent is still the sheet's latest version, and the sheet not void, the
 * save's statement itself checks.
 */
const storedCellsOf = new Map<string, Buffer>();
const STORED_CELLS_KEPT = 256;

function remember(key: string, cells: Buffer): void {
  storedCellsOf.delete(key);
  if (storedCellsOf.size >= STORED_CELLS_KEPT) storedCellsOf.delete(storedCellsOf.keys().next().value as string);
  storedCellsOf.set(key, cells);
}

/**
 * Saves a new version based on `parentNumber`. Refused with 409 (and the latest version's number
 * and hash) when the sheet has moved on since the parent, so the editor can show what changed.
 */
export async function saveVersion(
  db: Kysely<Database>,
  actor: Actor,
  sheet: { id: string; project_id: string },
  input: z.infer<typeof saveVersionSchema>,
) {
  const prepared = await prepareVersion(db, sheet, input.content, actor.userId);
  return insertVersion(db, actor, sheet, input, prepared);
}
