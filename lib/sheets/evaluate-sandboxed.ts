// The server's way into the sandboxed evaluator (lib/calc/sandbox/evaluator.ts), for the evaluate
// route and for saves: the evaluator's refusals become the app's errors (413 with what to reduce,
// 429 with Retry-After), so that lib/calc stays free of the web.
import { EvaluationRefused, getEvaluator, type EvaluationContext } from '@/lib/calc/sandbox/evaluator';
import type { CellInput, EvaluateOptions, SheetResult } from '@/lib/calc/types';
import { AppError } from '@/lib/errors/app-error';

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
