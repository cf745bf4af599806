// The one way the server evaluates cells in the context of a sheet: POST /api/evaluate (the editor
// and the scratch pad), a save of a version (and the sheet-file import, a start from another sheet),
// and the checker's alternate cells. Each assembles the same context here, so they cannot drift:
//   - the refusal of a calculation source holding a bidirectional control character (400), whatever
//     schema the caller did or did not parse first;
//   - the sheet's settings (significant figures, display units): those the caller's content carries
//     (a save, the editor's draft), or those of a stored version of the sheet (the alternate cells
//     are shown as the checked version shows its results);
//   - the input tables of the sheet's CSV attachments, and citations of issued revisions resolved
//     within the sheet's project (never of the sheet itself; outside a project, an error each);
//   - the sandboxed evaluator's budget (interactive or save) and cache scope (the project, or the
//     person outside any sheet).
import { sql, type Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import { resolveAttachments, type AttachmentRef } from '@/lib/attachments/attachments';
import { bidiControlsInCalcCells } from '@/lib/calc/bidi-controls';
import { findReferences } from '@/lib/calc/references';
import type { CellInput, EvaluateOptions, InputTable, ResolvedReference, SheetResult } from '@/lib/calc/types';
import { AppError } from '@/lib/errors/app-error';
import { evaluateSandboxed, evaluationScope } from './evaluate-sandboxed';
import { resolveCitations, unresolvedReferences, type ResolvedCitation } from './references';

/** The settings of a sheet that shape how results are shown (the values are the same either way). */
type EvaluationSettings = Pick<EvaluateOptions, 'significantFigures' | 'displayUnits'>;

export interface EvaluationInContext {
  cells: CellInput[];
  /** The settings given (a save's content, the editor's draft), or those of version `ofVersion` of the sheet. */
  settings: EvaluationSettings | { ofVersion: number };
  /**
   * The sheet the cells belong to: its project resolves citations and scopes the cache. `id` is null
   * for a sheet being created (nothing of its own to attach or exclude). Null outside any sheet.
   */
  sheet: { id: string | null; projectId: string } | null;
  /**
   * Input tables: the sheet's attachments cited by name and SHA-256 (refused with 400 unless uploaded
   * to it), or tables already read (a sheet being created brings its files). None when absent.
   */
  attachments?: ReadonlyArray<Pick<AttachmentRef, 'name' | 'sha256'>> | { tables: InputTable[] };
  /** Who is asking and how: an interactive evaluation counts against their share of the workers, a save does not. */
  run: { kind: 'interactive' | 'save'; userId: string; affinity?: string };
}

export interface EvaluationOutcome {
  results: SheetResult;
  /** The citations resolved within the sheet's project (a save records those that resolved). */
  citations: ResolvedCitation[];
}

export async function evaluateInContext(db: Kysely<Database>, input: EvaluationInContext): Promise<EvaluationOutcome> {
  const { cells, sheet, run } = input;
  // A calculation that reads differently from what is evaluated is never evaluated, let alone stored.
  const bidi = bidiControlsInCalcCells(cells);
  if (bidi.length > 0) throw new AppError('bad_request', bidi[0].message, bidi);
  const settings =
    'ofVersion' in input.settings ? await versionSettings(db, sheet, input.settings.ofVersion) : input.settings;
  const tables = await inputTables(db, sheet, input.attachments);
  const cited = findReferences(cells);
  const citations = sheet
    ? await resolveCitations(db, sheet.projectId, cited, sheet.id ? { excludeSheetId: sheet.id } : {})
    : [];
  const references: ResolvedReference[] = sheet ? citations.map((c) => c.reference) : unresolvedReferences(cited);
  const results = await evaluateSandboxed(
    cells,
    { significantFigures: settings.significantFigures, displayUnits: settings.displayUnits, tables, references },
    {
      kind: run.kind,
      userId: run.userId,
      scope: evaluationScope(sheet ? { projectId: sheet.projectId } : { userId: run.userId }),
      affinity: run.affinity,
    },
  );
  return { results, citations };
}

async function versionSettings(
  db: Kysely<Database>,
  sheet: EvaluationInContext['sheet'],
  number: number,
): Promise<EvaluationSettings> {
  if (!sheet?.id) throw new Error('evaluateInContext: the settings of a version need its sheet');
  const row = await db
    .selectFrom('versions')
    .select([
      sql<number>`(content->>'significantFigures')::int`.as('significantFigures'),
      sql<string | null>`content->>'displayUnits'`.as('displayUnits'),
    ])
    .where('sheet_id', '=', sheet.id)
    .where('number', '=', number)
    .executeTakeFirst();
  if (!row) throw new AppError('not_found', `The sheet has no version ${number}.`);
  return {
    significantFigures: Number(row.significantFigures),
    displayUnits: row.displayUnits === 'trade' || row.displayUnits === 'si' ? row.displayUnits : undefined,
  };
}

async function inputTables(
  db: Kysely<Database>,
  sheet: EvaluationInContext['sheet'],
  attachments: EvaluationInContext['attachments'],
): Promise<InputTable[]> {
  if (!attachments) return [];
  if ('tables' in attachments) return attachments.tables;
  if (attachments.length === 0) return [];
  if (!sheet?.id) throw new AppError('bad_request', 'sheetId: say which sheet the attachments belong to');
  return resolveAttachments(db, sheet.id, attachments);
}
