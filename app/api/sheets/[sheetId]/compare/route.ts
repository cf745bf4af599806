import { getDb } from '@/db';
import { AppError } from '@/lib/errors/app-error';
import { routeParams } from '@/lib/http/params';
import { handle, parseValue, searchParams } from '@/lib/http/route';
import { requireSheetAccess } from '@/lib/sheets/access';
import { compareQuerySchema } from '@/lib/sheets/compare';
import { compareStoredVersions } from '@/lib/sheets/comparison';
import { getVersion } from '@/lib/sheets/sheets';

export const dynamic = 'force-dynamic';

/**
 * Compares two versions (`?base=1&target=2`; without base, the whole target as a first check): cells,
 * results, the calculation record and the attachments (with a row/column diff of CSV tables).
 */
export function GET(request: Request, { params }: { params: Promise<{ sheetId: string }> }): Promise<Response> {
  return handle(request, async () => {
    const { sheet } = await requireSheetAccess((await routeParams(params)).sheetId);
    const q = parseValue(searchParams(request), compareQuerySchema);
    const [base, target] = await Promise.all([
      q.base ? getVersion(getDb(), sheet.id, q.base) : Promise.resolve(null),
      getVersion(getDb(), sheet.id, q.target),
    ]);
    if (!target || base === undefined) throw new AppError('not_found', 'No such version.');
    return Response.json({
      base: base ? { number: base.number, sha256: base.sha256 } : null,
      target: { number: target.number, sha256: target.sha256 },
      comparison: await compareStoredVersions(getDb(), sheet.id, base, target),
    });
  });
}
