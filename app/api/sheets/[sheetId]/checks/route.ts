import { getDb } from '@/db';
import { eligibleCheckers, submitForCheck } from '@/lib/checks/submit';
import { sheetWorkflow } from '@/lib/checks/queries';
import { submitSchema } from '@/lib/checks/workflow';
import { routeParams } from '@/lib/http/params';
import { handle, parseJson } from '@/lib/http/route';
import { requireSheetAccess } from '@/lib/sheets/access';

export const dynamic = 'force-dynamic';

type Context = { params: Promise<{ sheetId: string }> };

/** Where the sheet stands: its checks, signatures, and the checkers who may check its latest version. */
export function GET(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const { actor, sheet } = await requireSheetAccess((await routeParams(params)).sheetId);
    const workflow = await sheetWorkflow(getDb(), sheet.id);
    // Eligibility as if the caller submitted it: the submitter cannot also check it.
    return Response.json({
      ...workflow,
      checkers: await eligibleCheckers(getDb(), sheet, workflow.latestVersion, actor.userId),
    });
  });
}

/** Submits one exact version for check by a named checker; signs it "prepared" (password asked again). */
export function POST(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const { actor, sheet } = await requireSheetAccess((await routeParams(params)).sheetId, ['originator']);
    const input = await parseJson(request, submitSchema);
    return Response.json(await submitForCheck(getDb(), actor, sheet, input), { status: 201 });
  });
}
