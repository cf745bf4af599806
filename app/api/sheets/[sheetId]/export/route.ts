import { getDb } from '@/db';
import { AppError } from '@/lib/errors/app-error';
import { routeParams } from '@/lib/http/params';
import { handle, parseValue, searchParams } from '@/lib/http/route';
import { requireSheetAccess } from '@/lib/sheets/access';
import { exportQuerySchema, sheetFileOf } from '@/lib/sheets/sheet-files';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { getVersion } from '@/lib/sheets/sheets';

export const dynamic = 'force-dynamic';

/** The sheet file of the latest version, or of `?version=n`. */
export function GET(request: Request, { params }: { params: Promise<{ sheetId: string }> }): Promise<Response> {
  return handle(request, async () => {
    const { sheet, project } = await requireSheetAccess((await routeParams(params)).sheetId);
    const query = parseValue(searchParams(request), exportQuerySchema);
    const version = await getVersion(getDb(), sheet.id, query.version);
    if (!version) throw new AppError('not_found', 'No such version.');
    const number = formatSheetNumber(project.code, sheet.number);
    return new Response(`${JSON.stringify(sheetFileOf(version.content, { number, version: version.number, sha256: version.sha256 }), null, 2)}\n`, {
      headers: { 'content-type': 'application/json; charset=utf-8', 'content-disposition': `attachment; filename="${number}-v${version.number}.json"` },
    });
  });
}
