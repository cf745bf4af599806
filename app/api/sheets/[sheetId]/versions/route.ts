import { getDb } from '@/db';
import { routeParams } from '@/lib/http/params';
import { handle, parseJson } from '@/lib/http/route';
import { requireSheetAccess } from '@/lib/sheets/access';
import { listVersions, saveVersion, saveVersionSchema } from '@/lib/sheets/sheets';

export const dynamic = 'force-dynamic';

type Context = { params: Promise<{ sheetId: string }> };

export function GET(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const { sheet } = await requireSheetAccess((await routeParams(params)).sheetId);
    return Response.json({ versions: await listVersions(getDb(), sheet.id) });
  });
}

/** Saves a version based on `parentNumber`; 409 with the latest version when that is stale. */
export function POST(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const { actor, sheet } = await requireSheetAccess((await routeParams(params)).sheetId, ['originator']);
    const input = await parseJson(request, saveVersionSchema, 4 * 1024 * 1024);
    return Response.json(await saveVersion(getDb(), actor, sheet, input), { status: 201 });
  });
}
