import type { CellInput, EvaluateOptions, SheetResult } from '../types';

export interface EvaluateRequest {
  id: number;
  cells: CellInput[];
  options: EvaluateOptions;
  /** [cell id, reason] pairs of cells not to evaluate. */
  skip: Array<[string, string]>;
}

export type WorkerReply =
  | { type: 'ready' }
  | { type: 'done'; id: number; result: SheetResult }
  | { type: 'failed'; id: number; error: string };

/** Index 0 of the shared progress array: the cell being evaluated, or -1. */
export const PROGRESS_CELL = 0;
