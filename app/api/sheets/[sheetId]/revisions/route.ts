import { getDb } from '@/db';
import { routeParams } from '@/lib/http/params';
import { handle, parseJson } from '@/lib/http/route';
import { issueRequestSchema, requestIssue } from '@/lib/issue/request';
import { listRevisions } from '@/lib/issue/register';
import { requireSheetAccess } from '@/lib/sheets/access';

export const dynamic = 'force-dynamic';

type Context = { params: Promise<{ sheetId: string }> };

/** The sheet's issued revisions, newest first. */
export function GET(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const { sheet } = await requireSheetAccess((await routeParams(params)).sheetId);
    return Response.json({ revisions: await listRevisions(getDb(), { sheetId: sheet.id }) });
  });
}

/** Issues an approved version as the next revision (document control; password asked again). 202: follow the job. */
export function POST(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const { actor, sheet } = await requireSheetAccess((await routeParams(params)).sheetId, ['controller']);
    const input = await parseJson(request, issueRequestSchema);
    return Response.json(await requestIssue(getDb(), actor, sheet, input), { status: 202 });
  });
}
