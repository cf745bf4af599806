// The content of a version: what a save records and what its SHA-256 covers. The calculation record
// fields follow ASME NQA-1 Requirement 3 §400 (objective, design inputs with their sources,
// assumptions, method, references, conclusions).
import { z } from 'zod';
import { bidiControlsInCalcCells } from '../calc/bidi-controls';

const CONTENT_SCHEMA_VERSION = 1;

const shortText = z.string().max(2000);
const longText = z.string().max(100_000);

export const cellSchema = z.object({
  id: z.string().regex(/^[a-z0-9][a-z0-9-]{0,39}$/, 'cell ids are short lowercase tokens'),
  kind: z.enum(['calc', 'text']),
  source: longText,
});

const designInputSchema = z.object({
  name: shortText,
  value: shortText,
  source: shortText,
  sourceRevision: shortText,
  /**
   * The cell quantity this input feeds ("T" for `T = 150 MeV`): the record's value is checked
   * against the value the engine used (lib/checks/submission-findings.ts). Optional so that
   * versions saved before the link existed parse, and hash, exactly as stored.
   */
  cell: z.string().trim().max(100).optional(),
});

const assumptionSchema = z.object({
  text: shortText,
  // Chosen by the originator for each assumption (the editor presets neither answer).
  needsVerification: z.boolean({
    error: 'say for each assumption whether it is verified or still to be verified',
  }),
});

export const attachmentRefSchema = z.object({
  name: z.string().min(1).max(255),
  mediaType: z.string().max(255),
  size: z.number().int().nonnegative(),
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
});

export const calculationRecordSchema = z.object({
  objective: longText,
  inputs: z.array(designInputSchema).max(500),
  assumptions: z.array(assumptionSchema).max(500),
  method: longText,
  references: z.array(shortText).max(500),
  conclusions: longText,
});

export const versionContentSchema = z
  .object({
    schema: z.literal(CONTENT_SCHEMA_VERSION),
    title: z.string().trim().min(1).max(300),
    safetyRelated: z.boolean(),
    significantFigures: z.number().int().min(2).max(15),
    /**
     * The units results are shown in: 'si' or 'trade' (lib/calc/display-units.ts). Optional so that
     * versions saved before the setting existed parse, and hash, exactly as stored: absent means
     * 'si' (DISPLAY_UNITS_DEFAULT), what they showed. New sheets write it explicitly.
     */
    displayUnits: z.enum(['si', 'trade']).optional(),
    record: calculationRecordSchema,
    cells: z.array(cellSchema).max(2000),
    attachments: z.array(attachmentRefSchema).max(200),
  })
  .superRefine((content, ctx) => {
    const seen = new Set<string>();
    content.cells.forEach((cell, index) => {
      if (seen.has(cell.id))
        ctx.addIssue({ code: 'custom', path: ['cells', index, 'id'], message: `duplicate cell id ${cell.id}` });
      seen.add(cell.id);
    });
    refuseBidiControls(content.cells, ctx);
  });

/**
 * Adds an issue for every calculation cell whose source holds a bidirectional control character
 * (lib/calc/bidi-controls.ts): such a source can read differently from what is evaluated.
 */
export function refuseBidiControls(
  cells: ReadonlyArray<{ kind: string; source: string }>,
  ctx: z.RefinementCtx,
  path: Array<string | number> = ['cells'],
): void {
  for (const { index, message } of bidiControlsInCalcCells(cells))
    ctx.addIssue({ code: 'custom', path: [...path, index, 'source'], message });
}

export type Cell = z.infer<typeof cellSchema>;
export type CalculationRecord = z.infer<typeof calculationRecordSchema>;
export type VersionContent = z.infer<typeof versionContentSchema>;

export function emptyRecord(): CalculationRecord {
  return { objective: '', inputs: [], assumptions: [], method: '', references: [], conclusions: '' };
}
