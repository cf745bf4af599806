// Sheet files (product brief, "Sheet files and the command-line evaluator"): export a version as
// JSON that the command-line evaluator reads, and import such a file as a new sheet.
import { createHash } from 'node:crypto';
import type { Kysely } from 'kysely';
import { z } from 'zod';
import { INT4_MAX } from '@/lib/http/params';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { cellsOf, DEFAULT_SIGNIFICANT_FIGURES, parseSheetFile, SheetFileError } from '@/lib/calc/sheet-file';
import { AppError, unstorableTextPath } from '@/lib/errors/app-error';
import { DISPLAY_UNITS_DEFAULT } from '@/lib/calc/display-units';
import { checkAttachmentFile, type CheckedAttachment } from '@/lib/attachments/attachments';
import type { ObjectStore } from '@/lib/storage/object-store';
import {
  type attachmentRefSchema,
  calculationRecordSchema,
  emptyRecord,
  versionContentSchema,
  type VersionContent,
} from './content';
import { contentHash } from './content-hash';
import { createSheetWithContent } from './sheets';
import { sheetFileAttachmentSchema } from './sheet-file-attachment';

/**
 * The largest sheet file the import reads. A file can carry its attachments (base64, a third larger
 * than the bytes), so this leaves room for a 20 MiB PDF; the export refuses to write a larger one.
 */
export const SHEET_FILE_MAX_BYTES = 32 * 1024 * 1024;

/** The query of GET /api/sheets/{sheetId}/export: `?version=n`, or nothing for the latest version. */
export const exportQuerySchema = z.object({
  version: z.coerce.number().int().positive().max(INT4_MAX).optional(),
  attachments: z.enum(['include']).optional().meta({
    description:
      '`include`: carry the bytes of each attachment the version cites (base64), so that an import brings them back.',
  }),
});

/** The query of the import: a title that replaces the file's. */
export const importQuerySchema = z.object({ title: z.string().trim().min(1).max(300).optional() });

/** The file for one version: the smallest valid form plus what Worldsheet records with it. */
export function sheetFileOf(
  content: VersionContent,
  meta: { number: string; version: number; sha256: string },
  carried?: ReadonlyMap<string, Uint8Array>,
) {
  return {
    title: content.title,
    cells: content.cells.map((c) => ({ id: c.id, kind: c.kind, source: c.source })),
    significantFigures: content.significantFigures,
    ...(content.displayUnits ? { displayUnits: content.displayUnits } : {}),
    safetyRelated: content.safetyRelated,
    record: content.record,
    attachments: content.attachments.map((a) => {
      const bytes = carried?.get(a.sha256);
      return bytes ? { ...a, contentBase64: Buffer.from(bytes).toString('base64') } : { ...a };
    }),
    exportedFrom: { sheet: meta.number, version: meta.version, sha256: meta.sha256 },
  };
}

/** The bytes a sheet file of this version would carry; 413 when the file would be larger than an import reads. */
export function checkCarriedSize(attachments: ReadonlyArray<{ size: number }>): void {
  const carried = attachments.reduce((sum, a) => sum + Math.ceil(a.size / 3) * 4, 0);
  if (carried > SHEET_FILE_MAX_BYTES - 1024 * 1024) {
    throw new AppError(
      'too_large',
      `The attachments of this version would make a sheet file of more than ${SHEET_FILE_MAX_BYTES / (1024 * 1024)} MiB, larger than an import reads; download the sheet file without them and the attachments one by one.`,
    );
  }
}

/** What an import of a sheet file would create, and what it verified: the confirmation shows this. */
export interface SheetFileReading {
  content: VersionContent;
  /** The attachments the file carries, each checked: bytes matching its size and SHA-256, an accepted kind. */
  carried: CheckedAttachment[];
  /** The attachments the file lists without their bytes: not imported (the cells reading them show errors until they are uploaded). */
  notCarried: Array<z.infer<typeof attachmentRefSchema>>;
  exportedFrom: { sheet: string; version: number; sha256: string } | null;
  /** Whether the file's content still hashes to the SHA-256 of the version it was exported from (null when it names none). */
  unchangedSinceExport: boolean | null;
}

const exportedFromSchema = z.object({
  sheet: z.string().max(100),
  version: z.number().int().positive(),
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
});
const BASE64 = /^(?:[A-Za-z0-9+/]{4})*(?:[A-Za-z0-9+/]{2}==|[A-Za-z0-9+/]{3}=)?$/;

/**
 * Reads and checks a sheet file as an import would, creating nothing: 400 naming what is wrong (an
 * unreadable record, an attachment whose carried bytes do not match its size or SHA-256, or whose
 * name or kind would not be accepted as an upload). `title` replaces the file's title.
 */
export function readSheetFile(text: string, title?: string): SheetFileReading {
  let file;
  try {
    file = parseSheetFile(text);
  } catch (error) {
    if (error instanceof SheetFileError) throw new AppError('bad_request', error.message);
    throw error;
  }
  const chosenTitle = (title ?? file.title).trim();
  if (!chosenTitle) throw new AppError('bad_request', 'not a sheet file: title: the title is empty');
  // A record that is there but unreadable is refused, never dropped: an empty record is only for a
  // file that has none (one written by hand).
  let record = emptyRecord();
  if (file.record !== undefined) {
    const parsed = calculationRecordSchema.safeParse(file.record);
    if (!parsed.success)
      throw new AppError(
        'bad_request',
        `not a sheet file: record.${parsed.error.issues[0].path.join('.')}: ${parsed.error.issues[0].message}`,
      );
    record = parsed.data;
  }
  const listed = z
    .array(sheetFileAttachmentSchema)
    .max(200)
    .safeParse(file.attachments ?? []);
  if (!listed.success)
    throw new AppError(
      'bad_request',
      `not a sheet file: attachments.${listed.error.issues[0].path.join('.')}: ${listed.error.issues[0].message}`,
    );
  const carried: CheckedAttachment[] = [];
  const notCarried: SheetFileReading['notCarried'] = [];
  const seen = new Set<string>();
  for (const entry of listed.data) {
    const { contentBase64, ...ref } = entry;
    const key = `${ref.name}\u0000${ref.sha256}`;
    if (seen.has(key)) continue;
    seen.add(key);
    if (contentBase64 === undefined) {
      notCarried.push(ref);
      continue;
    }
    if (!BASE64.test(contentBase64))
      throw new AppError(
        'bad_request',
        `The attachment ${ref.name} in the file is not valid base64; nothing was imported.`,
      );
    const bytes = new Uint8Array(Buffer.from(contentBase64, 'base64'));
    const sha256 = createHash('sha256').update(bytes).digest('hex');
    if (bytes.length !== ref.size || sha256 !== ref.sha256) {
      throw new AppError(
        'bad_request',
        `The attachment ${ref.name} in the file does not match its record: the file says ${ref.size} bytes with SHA-256 ${ref.sha256}, the bytes carried are ${bytes.length} bytes with SHA-256 ${sha256}. The file was altered or damaged; nothing was imported.`,
        { attachment: ref.name, recordedSha256: ref.sha256, actualSha256: sha256 },
      );
    }
    let checked: CheckedAttachment;
    try {
      checked = checkAttachmentFile({ name: ref.name, type: ref.mediaType, bytes });
    } catch (error) {
      if (error instanceof AppError)
        throw new AppError('bad_request', `The attachment ${ref.name} in the file is not accepted: ${error.message}`);
      throw error;
    }
    if (checked.name !== ref.name || checked.mediaType !== ref.mediaType) {
      throw new AppError(
        'bad_request',
        `The attachment ${ref.name} (${ref.mediaType}) in the file would be stored as ${checked.name} (${checked.mediaType}); rename it in the file, or import without it.`,
      );
    }
    carried.push(checked);
  }
  const build = (withTitle: string, attachments: Array<z.infer<typeof attachmentRefSchema>>) =>
    versionContentSchema.safeParse({
      schema: 1,
      title: withTitle,
      safetyRelated: file.safetyRelated === true,
      significantFigures: file.significantFigures ?? DEFAULT_SIGNIFICANT_FIGURES,
      // A file without the setting was written before it existed (or by hand): it showed SI units.
      displayUnits: file.displayUnits ?? DISPLAY_UNITS_DEFAULT,
      record,
      cells: cellsOf(file),
      attachments,
    });
  const content = build(
    chosenTitle,
    carried.map((c) => ({ name: c.name, mediaType: c.mediaType, size: c.size, sha256: c.sha256 })),
  );
  if (!content.success)
    throw new AppError(
      'bad_request',
      `not a sheet file: ${content.error.issues[0].path.join('.')}: ${content.error.issues[0].message}`,
    );
  // Text PostgreSQL would refuse is refused here with a message naming where it is.
  const unstorable = unstorableTextPath(content.data, 'file');
  if (unstorable !== null)
    throw new AppError(
      'bad_request',
      `not a sheet file: ${unstorable}: holds a character that cannot be stored (U+0000, or half of a surrogate pair)`,
    );
  const from = exportedFromSchema.safeParse(file.exportedFrom);
  let unchangedSinceExport: boolean | null = null;
  if (from.success) {
    // The file as written (its own title, every attachment it lists) against the exported version's hash.
    const original = build(
      file.title.trim(),
      listed.data.map(({ contentBase64: _bytes, ...ref }) => ref),
    );
    unchangedSinceExport = original.success && contentHash(original.data) === from.data.sha256;
  }
  return {
    content: content.data,
    carried,
    notCarried,
    exportedFrom: from.success ? from.data : null,
    unchangedSinceExport,
  };
}

/** What the confirmation shows before an import creates anything (POST …/sheets/import/preview). */
export function importPreview(reading: SheetFileReading) {
  const { content } = reading;
  return {
    title: content.title,
    safetyRelated: content.safetyRelated,
    calcCells: content.cells.filter((c) => c.kind === 'calc').length,
    textCells: content.cells.filter((c) => c.kind === 'text').length,
    significantFigures: content.significantFigures,
    displayUnits: content.displayUnits ?? DISPLAY_UNITS_DEFAULT,
    exportedFrom: reading.exportedFrom,
    unchangedSinceExport: reading.unchangedSinceExport,
    attachments: [
      ...reading.carried.map((a) => ({
        name: a.name,
        mediaType: a.mediaType,
        size: a.size,
        sha256: a.sha256,
        carried: true,
      })),
      ...reading.notCarried.map((a) => ({
        name: a.name,
        mediaType: a.mediaType,
        size: a.size,
        sha256: a.sha256,
        carried: false,
      })),
    ],
  };
}

/** The message of the imported version: where the file came from, and what it did not bring. */
function importMessage(reading: SheetFileReading): string {
  const parts = ['Imported from a sheet file'];
  if (reading.exportedFrom) {
    const { sheet, version, sha256 } = reading.exportedFrom;
    parts.push(
      ` exported from ${sheet} version ${version} (SHA-256 ${sha256.slice(0, 12)}…; ${reading.unchangedSinceExport ? 'content unchanged since export' : 'content differs from that version'})`,
    );
  }
  if (reading.carried.length > 0)
    parts.push(
      `; ${reading.carried.length} attachment${reading.carried.length === 1 ? '' : 's'} carried, SHA-256 verified`,
    );
  if (reading.notCarried.length > 0)
    parts.push(`; not carried, to upload again: ${reading.notCarried.map((a) => a.name).join(', ')}`);
  return parts.join('');
}

/**
 * Creates a sheet from a sheet file's text: version 1 as created, version 2 holding the file with
 * the attachments it carries (each verified, stored and recorded on the new sheet).
 */
export async function importSheetFile(
  db: Kysely<Database>,
  actor: Actor,
  project: { id: string; code: string },
  text: string,
  options: { title?: string; store?: ObjectStore } = {},
) {
  const reading = readSheetFile(text, options.title);
  if (reading.carried.length > 0 && !options.store)
    throw new Error('importSheetFile: the file carries attachments but no object store was given');
  // The sheet, its attachments and its imported version are made in one transaction: never a sheet without its file.
  const sheet = await createSheetWithContent(
    db,
    actor,
    project,
    reading.content,
    importMessage(reading),
    options.store ? { files: { checked: reading.carried, store: options.store } } : {},
  );
  return {
    ...sheet,
    attachments: { carried: reading.carried.map((a) => a.name), notCarried: reading.notCarried.map((a) => a.name) },
  };
}
