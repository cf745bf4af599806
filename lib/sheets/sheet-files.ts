// Sheet files (product brief, "Sheet files and the command-line evaluator"): export a version as
// JSON that the command-line evaluator reads, and import such a file as a new sheet.
import type { Kysely } from 'kysely';
import { z } from 'zod';
import { INT4_MAX } from '@/lib/http/params';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { cellsOf, DEFAULT_SIGNIFICANT_FIGURES, parseSheetFile, SheetFileError } from '@/lib/calc/sheet-file';
import { AppError, unstorableTextPath } from '@/lib/errors/app-error';
import { DISPLAY_UNITS_DEFAULT } from '@/lib/calc/display-units';
import { calculationRecordSchema, emptyRecord, versionContentSchema, type VersionContent } from './content';
import { createSheetWithContent } from './sheets';

export const SHEET_FILE_MAX_BYTES = 4 * 1024 * 1024;

/** The query of GET /api/sheets/{sheetId}/export: `?version=n`, or nothing for the latest version. */
export const exportQuerySchema = z.object({ version: z.coerce.number().int().positive().max(INT4_MAX).optional() });

/** The file for one version: the smallest valid form plus what Worldsheet records with it. */
export function sheetFileOf(content: VersionContent, meta: { number: string; version: number; sha256: string }) {
  return {
    title: content.title,
    cells: content.cells.map((c) => ({ id: c.id, kind: c.kind, source: c.source })),
    significantFigures: content.significantFigures,
    ...(content.displayUnits ? { displayUnits: content.displayUnits } : {}),
    safetyRelated: content.safetyRelated,
    record: content.record,
    exportedFrom: { sheet: meta.number, version: meta.version, sha256: meta.sha256 },
  };
}

/** Creates a sheet from a sheet file's text: version 1 as created, version 2 holding the file. */
export async function importSheetFile(db: Kysely<Database>, actor: Actor, project: { id: string; code: string }, text: string) {
  let file;
  try {
    file = parseSheetFile(text);
  } catch (error) {
    if (error instanceof SheetFileError) throw new AppError('bad_request', error.message);
    throw error;
  }
  if (!file.title.trim()) throw new AppError('bad_request', 'not a sheet file: title: the title is empty');
  const record = calculationRecordSchema.safeParse(file.record);
  const content = versionContentSchema.safeParse({
    schema: 1,
    title: file.title.trim(),
    safetyRelated: file.safetyRelated === true,
    significantFigures: file.significantFigures ?? DEFAULT_SIGNIFICANT_FIGURES,
    // A file without the setting was written before it existed (or by hand): it showed SI units.
    displayUnits: file.displayUnits ?? DISPLAY_UNITS_DEFAULT,
    record: record.success ? record.data : emptyRecord(),
    cells: cellsOf(file),
    attachments: [],
  });
  if (!content.success) throw new AppError('bad_request', `not a sheet file: ${content.error.issues[0].path.join('.')}: ${content.error.issues[0].message}`);
  // Text PostgreSQL would refuse is refused here with a message naming where it is.
  const unstorable = unstorableTextPath(content.data, 'file');
  if (unstorable !== null) throw new AppError('bad_request', `not a sheet file: ${unstorable}: holds a character that cannot be stored (U+0000, or half of a surrogate pair)`);
  // The sheet and its imported version are made in one transaction: never a sheet without its file.
  return createSheetWithContent(db, actor, project, content.data, 'Imported from a sheet file');
}
