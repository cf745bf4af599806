import { getDb } from '@/db';
import { requireProjectRole } from '@/lib/auth/current-actor';
import { routeParams } from '@/lib/http/params';
import { handle, parseJson } from '@/lib/http/route';
import { createSheet, createSheetSchema, listSheets } from '@/lib/sheets/sheets';

export const dynamic = 'force-dynamic';

type Context = { params: Promise<{ projectId: string }> };

/** The project's register of sheets: any member. */
export function GET(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const { project } = await requireProjectRole((await routeParams(params)).projectId);
    return Response.json({ sheets: await listSheets(getDb(), project.id, project.code) });
  });
}

/** A new sheet, numbered by the server: originators. */
export function POST(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const { actor, project } = await requireProjectRole((await routeParams(params)).projectId, ['originator']);
    return Response.json(await createSheet(getDb(), actor, project, await parseJson(request, createSheetSchema)), {
      status: 201,
    });
  });
}
