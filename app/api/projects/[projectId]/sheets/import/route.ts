import { getDb } from '@/db';
import { requireProjectRole } from '@/lib/auth/current-actor';
import { readBodyText } from '@/lib/http/body';
import { routeParams } from '@/lib/http/params';
import { handle, parseValue, searchParams } from '@/lib/http/route';
import { importQuerySchema, importSheetFile, SHEET_FILE_MAX_BYTES } from '@/lib/sheets/sheet-files';
import { getObjectStore } from '@/lib/storage/object-store';

export const dynamic = 'force-dynamic';

/**
 * Imports a sheet file (the JSON body) as a new sheet, with the attachments it carries, each checked
 * against its SHA-256: originators. `?title=` replaces the file's title. The screen asks for
 * confirmation first, with …/import/preview.
 */
export function POST(request: Request, { params }: { params: Promise<{ projectId: string }> }): Promise<Response> {
  return handle(request, async () => {
    const { actor, project } = await requireProjectRole((await routeParams(params)).projectId, ['originator']);
    const query = parseValue(searchParams(request), importQuerySchema);
    const text = await readBodyText(
      request,
      SHEET_FILE_MAX_BYTES,
      `A sheet file is at most ${SHEET_FILE_MAX_BYTES / (1024 * 1024)} MiB.`,
    );
    return Response.json(
      await importSheetFile(getDb(), actor, project, text, { title: query.title, store: getObjectStore() }),
      { status: 201 },
    );
  });
}
