import { getDb } from '@/db';
import { AppError } from '@/lib/errors/app-error';
import { routeParams } from '@/lib/http/params';
import { handle } from '@/lib/http/route';
import { requireSheetAccess } from '@/lib/sheets/access';
import { getVersion } from '@/lib/sheets/sheets';

export const dynamic = 'force-dynamic';

/** One version, read-only, with the results recorded when it was saved. */
export function GET(
  request: Request,
  { params }: { params: Promise<{ sheetId: string; number: string }> },
): Promise<Response> {
  return handle(request, async () => {
    const { sheetId, number } = await routeParams(params);
    const { sheet } = await requireSheetAccess(sheetId);
    const version = await getVersion(getDb(), sheet.id, number);
    if (!version) throw new AppError('not_found', 'No such version.');
    return Response.json({ version });
  });
}
