// Attachments of a sheet: upload (limits, content sniffing, sanitised names, SHA-256, object
// storage), listing, download with the hash checked, and the input tables that CSV attachments
// give to the calculation engine. A version cites attachments by name and SHA-256 in its content,
// so the version's own hash covers them.
import { createHash } from 'node:crypto';
import type { Kysely, Transaction } from 'kysely';
import type { z } from 'zod';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { recordAudit } from '@/lib/audit/record';
import { LIBRARY } from '@/lib/calc/functions';
import { createEngineMath, type EngineMath } from '@/lib/calc/math-instance';
import { checkDefinitionName } from '@/lib/calc/names';
import type { InputTable } from '@/lib/calc/types';
import { AppError } from '@/lib/errors/app-error';
import type { ObjectStore } from '@/lib/storage/object-store';
import type { attachmentRefSchema } from '@/lib/sheets/content';
import { parseInputTable, tableNameFor, TableError } from './csv-table';
import { sanitizeFileName } from './file-name';
import { checkProjectStorageQuota } from './quota';
import { attachmentSchema, type AttachmentInfo } from './attachment-schema';
import {
  ACCEPTED_DESCRIPTION,
  ATTACHMENT_KINDS,
  kindOfMediaType,
  kindOfName,
  MAX_ATTACHMENT_BYTES,
  sniffKind,
} from './kinds';

export type AttachmentRef = z.infer<typeof attachmentRefSchema>;

// The response schemas live in a module without server imports (lib/attachments/attachment-schema.ts), so
// client components can parse with them.
export { attachmentSchema, type AttachmentInfo };

interface StoredTable {
  rows: number;
  columns: InputTable['columns'];
}

let unitMath: EngineMath | null = null;
/** What is wrong with a unit written in a table header, or null when the engine knows it. */
function checkUnit(unit: string): string | null {
  unitMath ??= createEngineMath([]);
  try {
    unitMath.math.unit(1, unit);
    return null;
  } catch {
    return `"${unit}" is not a unit the calculation engine knows (write units as in cells: MeV, T, m/s, mm^2)`;
  }
}

/** Why a table name cannot be used in cells (it is a built-in name), or null. */
function tableNameProblem(name: string, fileName: string): string | null {
  unitMath ??= createEngineMath([]);
  // A sheet's own definition may take a built-in function's name (lib/calc/names.ts), but a table is
  // named by its file, not written by the author: it never hides a function.
  const problem =
    LIBRARY.some((f) => f.name === name) || unitMath.isFunctionName(name)
      ? `\`${name}\` is a built-in function`
      : checkDefinitionName(name, unitMath);
  return problem
    ? `${fileName} would be called \`${name}\` in cells, but ${problem.replace(/^`[^`]*`:? ?/, '')}; rename the file (for example ${name}_data.csv) and upload it again`
    : null;
}

const storageKey = (sha256: string) => `attachments/sha256/${sha256}`;

export interface UploadedFile {
  name: string;
  type: string;
  bytes: Uint8Array;
}

/** An attachment file that passed every check, ready to be stored: what upload and import share. */
export interface CheckedAttachment {
  name: string;
  mediaType: string;
  size: number;
  sha256: string;
  table: StoredTable | null;
  bytes: Uint8Array;
}

/**
 * Checks a file offered as an attachment: 413 when too large for its kind, 415 when its content is
 * not an accepted kind or does not match its name or declared type, 400 for an unreadable data
 * table or a table name cells could not use. Stores nothing.
 */
export function checkAttachmentFile(file: UploadedFile): CheckedAttachment {
  if (file.bytes.length === 0) throw new AppError('bad_request', 'The file is empty.');
  if (file.bytes.length > MAX_ATTACHMENT_BYTES)
    throw new AppError('too_large', `The file is larger than any accepted attachment: ${ACCEPTED_DESCRIPTION}.`);
  const kind = sniffKind(file.bytes);
  if (!kind)
    throw new AppError(
      'unsupported_type',
      `This file's content is not an accepted kind. Accepted: ${ACCEPTED_DESCRIPTION}.`,
    );
  const spec = ATTACHMENT_KINDS[kind];
  const byName = kindOfName(file.name);
  if (byName && byName !== kind) {
    throw new AppError(
      'unsupported_type',
      `The file is named as ${ATTACHMENT_KINDS[byName].label} but its content is ${spec.label}; rename it or upload the right file.`,
    );
  }
  const byType = kindOfMediaType(file.type);
  if (byType && byType !== kind) {
    throw new AppError(
      'unsupported_type',
      `The file was sent as ${ATTACHMENT_KINDS[byType].label} (${file.type}) but its content is ${spec.label}.`,
    );
  }
  if (!byName && kind === 'csv') {
    // Plain text without a .csv name is not taken for a data table by guesswork.
    throw new AppError(
      'unsupported_type',
      `Text files are accepted as CSV data tables only when their name ends in .csv. Accepted: ${ACCEPTED_DESCRIPTION}.`,
    );
  }
  if (file.bytes.length > spec.maxBytes) {
    throw new AppError(
      'too_large',
      `${spec.label[0].toUpperCase()}${spec.label.slice(1)} may be at most ${spec.maxBytes / (1024 * 1024)} MiB; this file is ${(file.bytes.length / (1024 * 1024)).toFixed(1)} MiB.`,
    );
  }
  const name = sanitizeFileName(file.name, kind);
  let table: StoredTable | null = null;
  if (kind === 'csv') {
    try {
      table = parseInputTable(new TextDecoder('utf-8').decode(file.bytes), checkUnit);
    } catch (error) {
      if (error instanceof TableError) throw new AppError('bad_request', `${name}: ${error.message}`);
      throw error;
    }
    const problem = tableNameProblem(tableNameFor(name), name);
    if (problem) throw new AppError('bad_request', problem);
  }
  const sha256 = createHash('sha256').update(file.bytes).digest('hex');
  return { name, mediaType: spec.mediaType, size: file.bytes.length, sha256, table, bytes: file.bytes };
}

/**
 * Sends checked files' bytes to object storage, after a first check of the project's storage quota
 * (so that a file plainly over it is not stored at all). Write-once: bytes already there stay.
 */
export async function storeAttachmentBytes(
  db: Kysely<Database>,
  store: ObjectStore,
  projectId: string,
  files: readonly CheckedAttachment[],
): Promise<void> {
  for (const file of files) {
    await checkProjectStorageQuota(db, projectId, { sha256: file.sha256, size: file.size });
    await store.putOnce(storageKey(file.sha256), file.bytes, file.mediaType);
  }
}

/**
 * Records a stored attachment of a sheet inside `trx`, after the deciding quota check under the
 * project's row lock; audited as `action`. False when the sheet already had these bytes under this name.
 */
export async function insertAttachment(
  trx: Transaction<Database>,
  actor: Actor,
  sheet: { id: string; project_id: string },
  file: Omit<CheckedAttachment, 'bytes'>,
  action: 'attachment.upload' | 'attachment.import' | 'attachment.copy' = 'attachment.upload',
  auditDetails: Record<string, string> = {},
): Promise<boolean> {
  // The deciding check: concurrent uploads to one project pass it one at a time, each counting the
  // ones before it. (One that loses leaves its bytes in storage with no row: write-once storage
  // is never deleted from, and unreferenced bytes count against no project.)
  await checkProjectStorageQuota(trx, sheet.project_id, { sha256: file.sha256, size: file.size }, { lock: true });
  const row = await trx
    .insertInto('attachments')
    .values({
      sheet_id: sheet.id,
      project_id: sheet.project_id,
      name: file.name,
      media_type: file.mediaType,
      size: file.size,
      sha256: file.sha256,
      storage_key: storageKey(file.sha256),
      table_data: file.table ? JSON.stringify(file.table) : null,
      uploaded_by: actor.userId,
    })
    .onConflict((oc) => oc.constraint('attachments_sheet_name_sha256_key').doNothing())
    .returning('id')
    .executeTakeFirst();
  if (row) {
    await recordAudit(trx, actor, {
      action,
      objectType: 'sheet',
      objectId: sheet.id,
      projectId: sheet.project_id,
      newValue: { name: file.name, mediaType: file.mediaType, size: file.size, sha256: file.sha256, ...auditDetails },
    });
  }
  return row !== undefined;
}

/**
 * Gives a new sheet the attachments `refs` of the sheet it was started from, inside `trx`: the same
 * stored bytes (write-once, by SHA-256), a row of its own for each, counted against its project's
 * quota, audited as attachment.copy. 400 when a reference is not an attachment of that sheet.
 */
export async function copyAttachments(
  trx: Transaction<Database>,
  actor: Actor,
  fromSheetId: string,
  sheet: { id: string; project_id: string },
  refs: ReadonlyArray<Pick<AttachmentRef, 'name' | 'sha256'>>,
): Promise<void> {
  for (const ref of refs) {
    const row = await trx
      .selectFrom('attachments')
      .select(['name', 'media_type', 'size', 'sha256', 'table_data'])
      .where('sheet_id', '=', fromSheetId)
      .where('name', '=', ref.name)
      .where('sha256', '=', ref.sha256)
      .executeTakeFirst();
    if (!row)
      throw new AppError(
        'bad_request',
        `The attachment ${ref.name} (SHA-256 ${ref.sha256.slice(0, 12)}…) is not an attachment of the sheet started from.`,
      );
    // The same bytes under the same key (attachments/sha256/<hex>): a row of the new sheet's own.
    const file = {
      name: row.name,
      mediaType: row.media_type,
      size: Number(row.size),
      sha256: row.sha256,
      table: row.table_data as StoredTable | null,
    };
    await insertAttachment(trx, actor, sheet, file, 'attachment.copy', { fromSheet: fromSheetId });
  }
}

/**
 * Checks and stores an uploaded file for a sheet (checkAttachmentFile says what is refused; 413 also
 * for the project's storage quota, ./quota.ts). Uploading the same bytes under the same name again
 * is harmless.
 */
export async function uploadAttachment(
  db: Kysely<Database>,
  store: ObjectStore,
  actor: Actor,
  sheet: { id: string; project_id: string },
  file: UploadedFile,
): Promise<AttachmentInfo> {
  const checked = checkAttachmentFile(file);
  // The object first: a row is only ever written for bytes that are stored.
  await storeAttachmentBytes(db, store, sheet.project_id, [checked]);
  const inserted = await db.transaction().execute((trx) => insertAttachment(trx, actor, sheet, checked));
  const info = (await listAttachments(db, sheet.id)).find(
    (a) => a.name === checked.name && a.sha256 === checked.sha256,
  );
  if (!info) throw new Error(`attachment ${checked.name} not found after upload (inserted: ${inserted})`);
  return info;
}

/**
 * The input tables of checked files not yet stored (an import): the same names and clash rules as
 * resolveAttachments.
 */
export function tablesOfFiles(files: readonly CheckedAttachment[]): InputTable[] {
  const tables: InputTable[] = [];
  const names = new Map<string, string>();
  for (const file of files) {
    if (!file.table) continue;
    const name = tableNameFor(file.name);
    const clash = names.get(name);
    if (clash)
      throw new AppError(
        'bad_request',
        `The data tables ${clash} and ${file.name} would both be called \`${name}\` in cells; keep only one of them.`,
      );
    names.set(name, file.name);
    tables.push({ name, sha256: file.sha256, fileName: file.name, columns: file.table.columns });
  }
  return tables;
}

export async function listAttachments(db: Kysely<Database>, sheetId: string): Promise<AttachmentInfo[]> {
  const rows = await db
    .selectFrom('attachments as a')
    .innerJoin('users as u', 'u.id', 'a.uploaded_by')
    .select(['a.name', 'a.media_type', 'a.size', 'a.sha256', 'a.table_data', 'a.created_at', 'u.display_name'])
    .where('a.sheet_id', '=', sheetId)
    .orderBy('a.created_at', 'desc')
    .execute();
  return rows.map((r) => {
    const t = r.table_data as StoredTable | null;
    return {
      name: r.name,
      mediaType: r.media_type,
      size: Number(r.size),
      sha256: r.sha256,
      uploadedBy: r.display_name,
      uploadedAt: new Date(r.created_at).toISOString(),
      table: t
        ? { name: tableNameFor(r.name), rows: t.rows, columns: t.columns.map((c) => ({ name: c.name, unit: c.unit })) }
        : null,
    };
  });
}

/** The stored bytes of an attachment of a sheet, checked against their recorded SHA-256. */
export async function readAttachment(db: Kysely<Database>, store: ObjectStore, sheetId: string, sha256: string) {
  if (!/^[0-9a-f]{64}$/.test(sha256)) throw new AppError('not_found', 'No such attachment on this sheet.');
  const row = await db
    .selectFrom('attachments')
    .select(['name', 'media_type', 'size', 'storage_key'])
    .where('sheet_id', '=', sheetId)
    .where('sha256', '=', sha256)
    .orderBy('created_at')
    .limit(1)
    .executeTakeFirst();
  if (!row) throw new AppError('not_found', 'No such attachment on this sheet.');
  const bytes = await store.get(row.storage_key);
  if (!bytes)
    throw new AppError(
      'unavailable',
      `The stored file of ${row.name} is missing from the file store; report this to your administrator.`,
    );
  const actual = createHash('sha256').update(bytes).digest('hex');
  if (actual !== sha256) {
    console.error(`attachment ${sheetId}/${sha256}: stored bytes hash to ${actual}`);
    throw new AppError(
      'unavailable',
      `The stored file of ${row.name} does not match its recorded SHA-256; it is not served. Report this to your administrator.`,
    );
  }
  return { name: row.name, mediaType: row.media_type, bytes };
}

/**
 * The input tables of the given attachment references (those that are CSV tables), after checking
 * that each reference is an attachment uploaded to this sheet with the same name, size, type and
 * hash. Refused with 400 naming the first reference that is not.
 */
export async function resolveAttachments(
  db: Kysely<Database>,
  sheetId: string,
  refs: ReadonlyArray<Pick<AttachmentRef, 'name' | 'sha256'> & Partial<AttachmentRef>>,
): Promise<InputTable[]> {
  if (refs.length === 0) return [];
  const rows = await db
    .selectFrom('attachments')
    .select(['name', 'sha256', 'size', 'media_type', 'table_data'])
    .where('sheet_id', '=', sheetId)
    .where('sha256', 'in', [...new Set(refs.map((r) => r.sha256))])
    .execute();
  const tables: InputTable[] = [];
  const names = new Map<string, string>();
  for (const ref of refs) {
    const row = rows.find((r) => r.name === ref.name && r.sha256 === ref.sha256);
    if (
      !row ||
      (ref.size !== undefined && Number(row.size) !== ref.size) ||
      (ref.mediaType !== undefined && row.media_type !== ref.mediaType)
    ) {
      throw new AppError(
        'bad_request',
        `The attachment ${ref.name} (SHA-256 ${ref.sha256.slice(0, 12)}…) is not an attachment uploaded to this sheet.`,
      );
    }
    if (!row.table_data) continue;
    const name = tableNameFor(row.name);
    const problem = tableNameProblem(name, row.name);
    if (problem) throw new AppError('bad_request', problem);
    const clash = names.get(name);
    if (clash)
      throw new AppError(
        'bad_request',
        `The data tables ${clash} and ${row.name} would both be called \`${name}\` in cells; keep only one of them, or rename one and upload it again.`,
      );
    names.set(name, row.name);
    const stored = row.table_data as StoredTable;
    tables.push({ name, sha256: row.sha256, fileName: row.name, columns: stored.columns });
  }
  return tables;
}

/**
 * The parsed CSV tables (columns with their values, as stored at upload) of the given SHA-256s among
 * a sheet's attachments, by SHA-256: what the version comparison diffs row by row. Hashes that are
 * not CSV tables of the sheet are absent.
 */
export async function attachmentTables(
  db: Kysely<Database>,
  sheetId: string,
  sha256s: Iterable<string>,
): Promise<Record<string, StoredTable>> {
  const wanted = [...new Set(sha256s)].filter((h) => /^[0-9a-f]{64}$/.test(h));
  if (wanted.length === 0) return {};
  const rows = await db
    .selectFrom('attachments')
    .select(['sha256', 'table_data'])
    .where('sheet_id', '=', sheetId)
    .where('sha256', 'in', wanted)
    .where('table_data', 'is not', null)
    .execute();
  const out: Record<string, StoredTable> = {};
  for (const row of rows) out[row.sha256] ??= row.table_data as StoredTable;
  return out;
}
