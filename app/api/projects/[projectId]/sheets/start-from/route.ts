import { getDb } from '@/db';
import { requireProjectRole } from '@/lib/auth/current-actor';
import { routeParams } from '@/lib/http/params';
import { handle, parseJson } from '@/lib/http/route';
import { startCandidates, startFromSchema, startSheetFrom } from '@/lib/sheets/start-from';

export const dynamic = 'force-dynamic';

type Context = { params: Promise<{ projectId: string }> };

/** What an originator of the project may start a new sheet from: starters and approved versions of sheets in their projects. */
export function GET(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const { actor } = await requireProjectRole((await routeParams(params)).projectId, ['originator']);
    return Response.json({ candidates: await startCandidates(getDb(), actor) });
  });
}

/** A new sheet of the project started from an approved version or a starter (lib/sheets/start-from.ts): originators. */
export function POST(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const { actor, project } = await requireProjectRole((await routeParams(params)).projectId, ['originator']);
    const input = await parseJson(request, startFromSchema);
    return Response.json(await startSheetFrom(getDb(), actor, project, input), { status: 201 });
  });
}
