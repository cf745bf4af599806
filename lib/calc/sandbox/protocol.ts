import type { CellInput, EvaluateOptions } from '../types';
import type { PackedResult } from './cell-transfer';

export interface EvaluateRequest {
  id: number;
  cells: CellInput[];
  options: EvaluateOptions;
  /** [cell id, reason] pairs of cells not to evaluate. */
  skip: Array<[string, string]>;
  /** Partition of the worker's cell cache (the project); see EvaluateHooks.cacheScope. */
  scope: string;
  /** The most the result may weigh, serialized as JSON, in bytes; beyond, the reply is `too-large`. */
  maxResultBytes: number;
  /** Send every cell in full, none by its number (cell-transfer.ts: the server no longer keeps one). */
  full?: boolean;
}

export type WorkerReply =
  | { type: 'ready' }
  | {
      type: 'done';
      id: number;
      result: PackedResult;
      /** The whole result's size as JSON (jsonSizeAtMost). */ bytes: number;
    }
  | { type: 'too-large'; id: number; bytes: number }
  | { type: 'failed'; id: number; error: string };

/** Index 0 of the shared progress array: the cell being evaluated, or -1. */
export const PROGRESS_CELL = 0;
/** Index 1: how many cells this thread has run (not cache hits, not skipped cells), for tests and benchmarks. */
export const PROGRESS_STARTED = 1;
/** Length of the shared progress array. */
export const PROGRESS_SLOTS = 2;

/**
 * The length `value` would have as JSON, in UTF-16 code units, counted without building the text
 * and given up as soon as it passes `limit` (which it then returns exceeded).
 */
export function jsonSizeAtMost(value: unknown, limit: number): number {
  let size = 0;
  const stack: unknown[] = [value];
  while (stack.length > 0 && size <= limit) {
    const v = stack.pop();
    if (v === null || v === undefined) size += 4;
    else if (typeof v === 'string') size += v.length + 2;
    else if (typeof v === 'number') size += 24;
    else if (typeof v === 'boolean') size += 5;
    else if (Array.isArray(v)) {
      size += 2 + v.length;
      for (let i = v.length - 1; i >= 0; i--) stack.push(v[i]);
    } else if (typeof v === 'object') {
      for (const [k, x] of Object.entries(v as Record<string, unknown>)) {
        if (x === undefined) continue;
        size += k.length + 4;
        stack.push(x);
      }
      size += 2;
    }
  }
  return size;
}
