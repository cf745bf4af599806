import { AppError, errorResponse, readJsonBody } from '@/lib/errors/app-error';
import { EVALUATE_MAX_BYTES, evaluateRequestSchema } from '@/lib/calc/evaluate-request';
import { getEvaluator } from '@/lib/calc/sandbox/evaluator';
import { requireActor } from '@/lib/auth/current-actor';
import { getDb } from '@/db';
import { resolveAttachments } from '@/lib/attachments/attachments';
import type { InputTable } from '@/lib/calc/types';
import { requireSheetAccess } from '@/lib/sheets/access';

export const dynamic = 'force-dynamic';

export async function POST(request: Request): Promise<Response> {
  try {
    await requireActor();
    const body = await readJsonBody(request, EVALUATE_MAX_BYTES);
    const parsed = evaluateRequestSchema.safeParse(body);
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      throw new AppError('bad_request', `${issue.path.join('.') || 'body'}: ${issue.message}`, parsed.error.issues.slice(0, 10));
    }
    const { cells, significantFigures, sheetKey, sheetId, attachments } = parsed.data;
    let tables: InputTable[] = [];
    if (attachments.length > 0) {
      if (!sheetId) throw new AppError('bad_request', 'sheetId: say which sheet the attachments belong to');
      const { sheet } = await requireSheetAccess(sheetId);
      tables = await resolveAttachments(getDb(), sheet.id, attachments);
    }
    const result = await getEvaluator().evaluate(cells, { significantFigures, tables }, sheetKey);
    return Response.json(result);
  } catch (error) {
    return errorResponse(error);
  }
}
