import { requireProjectRole } from '@/lib/auth/current-actor';
import { readBodyText } from '@/lib/http/body';
import { routeParams } from '@/lib/http/params';
import { handle } from '@/lib/http/route';
import { importPreview, readSheetFile, SHEET_FILE_MAX_BYTES } from '@/lib/sheets/sheet-files';

export const dynamic = 'force-dynamic';

/**
 * What importing this sheet file would create, checked as the import checks it (attachments against
 * their SHA-256), creating nothing: the confirmation before an import. Originators.
 */
export function POST(request: Request, { params }: { params: Promise<{ projectId: string }> }): Promise<Response> {
  return handle(request, async () => {
    await requireProjectRole((await routeParams(params)).projectId, ['originator']);
    const text = await readBodyText(
      request,
      SHEET_FILE_MAX_BYTES,
      `A sheet file is at most ${SHEET_FILE_MAX_BYTES / (1024 * 1024)} MiB.`,
    );
    return Response.json(importPreview(readSheetFile(text)));
  });
}
