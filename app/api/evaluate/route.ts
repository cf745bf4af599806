import { AppError } from '@/lib/errors/app-error';
import { readJsonBody } from '@/lib/http/body';
import { handle } from '@/lib/http/route';
import { EVALUATE_MAX_BYTES, evaluateRequestSchema } from '@/lib/calc/evaluate-request';
import { requireActor } from '@/lib/auth/current-actor';
import { getDb } from '@/db';
import { requireSheetAccess } from '@/lib/sheets/access';
import { evaluateInContext } from '@/lib/sheets/evaluate-in-context';

export const dynamic = 'force-dynamic';

export function POST(request: Request): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireActor();
    const body = await readJsonBody(request, EVALUATE_MAX_BYTES);
    const parsed = evaluateRequestSchema.safeParse(body);
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      throw new AppError(
        'bad_request',
        `${issue.path.join('.') || 'body'}: ${issue.message}`,
        parsed.error.issues.slice(0, 10),
      );
    }
    const { cells, significantFigures, displayUnits, sheetKey, sheetId, attachments } = parsed.data;
    if (attachments.length > 0 && !sheetId)
      throw new AppError('bad_request', 'sheetId: say which sheet the attachments belong to');
    // The sheet, and the caller's membership of its project: its attachments and citations, and the
    // cache scope (results are shared within a project only, never across). Citations of issued
    // revisions resolve within the sheet's project; without a sheet, to an error.
    const sheet = sheetId ? (await requireSheetAccess(sheetId)).sheet : null;
    // Interactive: counts against the caller's share of the workers (429 with Retry-After beyond it).
    const { results: result } = await evaluateInContext(getDb(), {
      cells,
      settings: { significantFigures, displayUnits },
      sheet: sheet ? { id: sheet.id, projectId: sheet.project_id } : null,
      attachments,
      run: { kind: 'interactive', userId: actor.userId, affinity: sheetKey },
    });
    return Response.json(result);
  });
}
