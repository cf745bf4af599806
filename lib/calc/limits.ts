// Limits on what one sheet may ask of the server. The sandbox adds a time and a memory limit.
import type { MathJsInstance } from 'mathjs';

export const LIMITS = {
  maxCells: 5000,
  maxCellSourceChars: 20_000,
  maxLineChars: 2_000,
  maxStatementsPerCell: 500,
  /** Elements in one matrix or array a sheet creates. */
  maxMatrixElements: 1_000_000,
  /**
   * Each evaluation worker keeps parsed cells and cell results for incremental re-evaluation; a
   * cached cell weighs about 5 KiB of heap (parse and result; tests/bench/README.md, Load), so twice
   * maxCells (the largest sheet and its re-evaluation after an edit, evicted oldest first) bounds
   * each worker's caches near 50 MiB rather than 100 MiB at 20,000.
   */
  parseCacheEntries: 10_000,
  cellCacheEntries: 10_000,
} as const;

function sizeOf(args: unknown[]): number {
  let n = 1;
  for (const a of args) {
    if (typeof a === 'number') n *= Math.max(0, Math.floor(Math.abs(a)));
    else if (Array.isArray(a)) n *= a.reduce((p: number, x) => p * (typeof x === 'number' ? Math.abs(x) : 1), 1);
    else if (a && typeof a === 'object' && 'valueOf' in a) {
      const v = (a as { valueOf(): unknown }).valueOf();
      if (Array.isArray(v)) n *= v.reduce((p: number, x) => p * (typeof x === 'number' ? Math.abs(x) : 1), 1);
    }
  }
  return n;
}

/**
 * Refuses, before allocating, matrices larger than the limit from the functions that create them
 * from a size; everything else is bounded by the worker's memory limit.
 */
export function installSizeGuards(math: MathJsInstance): void {
  const record = math as unknown as Record<string, (...args: unknown[]) => unknown>;
  const guarded: Record<string, unknown> = {};
  const bySize = ['zeros', 'ones', 'identity', 'random', 'randomInt', 'resize', 'reshape'];
  for (const name of bySize) {
    const original = record[name];
    guarded[name] = (...args: unknown[]) => {
      const sizeArgs =
        name === 'resize' || name === 'reshape' ? args.slice(1, 2) : args.filter((a) => typeof a !== 'string');
      if (sizeOf(sizeArgs) > LIMITS.maxMatrixElements) {
        throw new Error(
          `${name}: more than ${LIMITS.maxMatrixElements.toLocaleString('en')} elements is beyond the sheet limit`,
        );
      }
      return original(...args);
    };
  }
  const range = record.range;
  guarded.range = (...args: unknown[]) => {
    const [start, end, step] = args.map((a) => (typeof a === 'number' ? a : Number.NaN));
    if (Number.isFinite(start) && Number.isFinite(end)) {
      const n = Math.abs((end - start) / (Number.isFinite(step) && step !== 0 ? step : 1));
      if (n > LIMITS.maxMatrixElements)
        throw new Error(
          `range: more than ${LIMITS.maxMatrixElements.toLocaleString('en')} elements is beyond the sheet limit`,
        );
    }
    return range(...args);
  };
  math.import(guarded, { override: true });
}
