// The sheet file: the JSON form of a sheet for export, import and the command-line evaluator.
// The smallest valid file is {"title": "…", "cells": [{"kind": "calc", "source": "…"}]}.
import { z } from 'zod';
import { LIMITS } from './limits';
import type { CellInput } from './types';

export const sheetFileSchema = z.looseObject({
  title: z.string().max(300),
  significantFigures: z.number().int().min(2).max(15).optional(),
  /** 'si' or 'trade' (lib/calc/display-units.ts); SI when absent. */
  displayUnits: z.enum(['si', 'trade']).optional(),
  cells: z
    .array(
      z.looseObject({
        id: z
          .string()
          .regex(/^[a-z0-9][a-z0-9-]{0,39}$/)
          .optional(),
        kind: z.enum(['calc', 'text']),
        source: z.string().max(LIMITS.maxCellSourceChars),
      }),
    )
    .max(LIMITS.maxCells),
});

export type SheetFile = z.infer<typeof sheetFileSchema>;

export const DEFAULT_SIGNIFICANT_FIGURES = 6;

/** Cells with ids: the file's own, or c1, c2, … where it has none. */
export function cellsOf(file: SheetFile): CellInput[] {
  const seen = new Set<string>();
  return file.cells.map((c, i) => {
    let id = c.id ?? `c${i + 1}`;
    while (seen.has(id)) id = `${id}-${i + 1}`;
    seen.add(id);
    return { id, kind: c.kind, source: c.source };
  });
}

export class SheetFileError extends Error {}

export function parseSheetFile(text: string): SheetFile {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    throw new SheetFileError(`not JSON: ${(error as Error).message}`);
  }
  const parsed = sheetFileSchema.safeParse(json);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new SheetFileError(`not a sheet file: ${issue.path.join('.') || 'file'}: ${issue.message}`);
  }
  return parsed.data;
}
