import { getDb } from '@/db';
import { requireProjectRole } from '@/lib/auth/current-actor';
import { readBodyText } from '@/lib/http/body';
import { routeParams } from '@/lib/http/params';
import { handle } from '@/lib/http/route';
import { importSheetFile, SHEET_FILE_MAX_BYTES } from '@/lib/sheets/sheet-files';

export const dynamic = 'force-dynamic';

/** Imports a sheet file (the JSON body) as a new sheet: originators. */
export function POST(request: Request, { params }: { params: Promise<{ projectId: string }> }): Promise<Response> {
  return handle(request, async () => {
    const { actor, project } = await requireProjectRole((await routeParams(params)).projectId, ['originator']);
    const text = await readBodyText(request, SHEET_FILE_MAX_BYTES, `A sheet file is at most ${SHEET_FILE_MAX_BYTES} bytes.`);
    return Response.json(await importSheetFile(getDb(), actor, project, text), { status: 201 });
  });
}
