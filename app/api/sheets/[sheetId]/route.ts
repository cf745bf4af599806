import { getDb } from '@/db';
import { AppError } from '@/lib/errors/app-error';
import { routeParams } from '@/lib/http/params';
import { handle } from '@/lib/http/route';
import { requireSheetAccess } from '@/lib/sheets/access';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { getVersion } from '@/lib/sheets/sheets';

export const dynamic = 'force-dynamic';

/** The sheet with its latest version (content, results, hash). */
export function GET(request: Request, { params }: { params: Promise<{ sheetId: string }> }): Promise<Response> {
  return handle(request, async () => {
    const { sheet, project } = await requireSheetAccess((await routeParams(params)).sheetId);
    const version = await getVersion(getDb(), sheet.id);
    if (!version) throw new AppError('not_found', 'The sheet has no version.');
    return Response.json({ sheet: { ...sheet, code: formatSheetNumber(project.code, sheet.number) }, version });
  });
}
