// The server's way into the sandboxed evaluator (lib/calc/sandbox/evaluator.ts), for the evaluate
// route and for saves: the evaluator's refusals become the app's errors (413 with what to reduce,
// 429 with Retry-After), so that lib/calc stays free of the web. It owns the server's shared
// evaluator, with the limits of lib/config.ts.
import {
  defaultWorkerCount,
  EvaluationRefused,
  SandboxedEvaluator,
  type EvaluationContext,
} from '@/lib/calc/sandbox/evaluator';
import type { CellInput, EvaluateOptions, SheetResult } from '@/lib/calc/types';
import { AppError } from '@/lib/errors/app-error';
import { config } from '@/lib/config';

const globalForEvaluator = globalThis as unknown as { worldsheetEvaluator?: SandboxedEvaluator };

/** The server's shared evaluator, made on first use with WORLDSHEET_CALC_TIMEOUT_MS, _MEMORY_MB and _WORKERS. */
export function getEvaluator(): SandboxedEvaluator {
  if (!globalForEvaluator.worldsheetEvaluator) {
    const settings = config();
    globalForEvaluator.worldsheetEvaluator = new SandboxedEvaluator({
      timeoutMs: settings.WORLDSHEET_CALC_TIMEOUT_MS,
      memoryMb: settings.WORLDSHEET_CALC_MEMORY_MB,
      workers: settings.WORLDSHEET_CALC_WORKERS ?? defaultWorkerCount({}),
    });
  }
  return globalForEvaluator.worldsheetEvaluator;
}

/**
 * The cache scope of an evaluation: the project of the sheet it belongs to, or, outside any sheet
 * (the scratch pad, a script), the person. Results are shared only within a scope.
 */
export function evaluationScope(input: { projectId: string } | { userId: string }): string {
  return 'projectId' in input ? `project:${input.projectId}` : `user:${input.userId}`;
}

export async function evaluateSandboxed(
  cells: CellInput[],
  options: EvaluateOptions,
  context: EvaluationContext,
): Promise<SheetResult> {
  try {
    return await getEvaluator().evaluate(cells, options, context);
  } catch (error) {
    if (error instanceof EvaluationRefused) {
      throw error.reason === 'too-large'
        ? new AppError('too_large', error.message)
        : new AppError('too_many_requests', error.message, null, error.retryAfterSeconds);
    }
    throw error;
  }
}
