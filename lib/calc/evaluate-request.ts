// The body of POST /api/evaluate, validated with zod.
import { z } from 'zod';
import { bidiControlsInCalcCells } from './bidi-controls';
import { LIMITS } from './limits';

export const EVALUATE_MAX_BYTES = 2 * 1024 * 1024;

export const evaluateRequestSchema = z.object({
  /** Sends the same sheet to the same worker, whose cache makes re-evaluation incremental. */
  sheetKey: z.string().max(100).optional(),
  significantFigures: z.number().int().min(2).max(15).default(6),
  /** The units results are shown in (lib/calc/display-units.ts); SI when absent. */
  displayUnits: z.enum(['si', 'trade']).optional(),
  /**
   * The sheet being edited: the one whose attachments `attachments` names, and whose project's issued
   * revisions `fromRevision(…)` cites (without it, a citation evaluates to an error).
   */
  sheetId: z.string().uuid().optional(),
  /** CSV attachments of that sheet to use as input tables, by name and SHA-256. */
  attachments: z
    .array(z.object({ name: z.string().min(1).max(255), sha256: z.string().regex(/^[0-9a-f]{64}$/) }))
    .max(200)
    .default([]),
  cells: z
    .array(
      z.object({
        id: z.string().regex(/^[a-z0-9][a-z0-9-]{0,39}$/, 'cell ids are short lowercase tokens'),
        kind: z.enum(['calc', 'text']),
        source: z.string().max(LIMITS.maxCellSourceChars),
      }),
    )
    .max(LIMITS.maxCells)
    .refine((cells) => new Set(cells.map((c) => c.id)).size === cells.length, 'cell ids must be unique')
    // A calculation source with a bidirectional control character can read differently from what is evaluated.
    .superRefine((cells, ctx) => {
      for (const { index, message } of bidiControlsInCalcCells(cells))
        ctx.addIssue({ code: 'custom', path: [index, 'source'], message });
    }),
});
