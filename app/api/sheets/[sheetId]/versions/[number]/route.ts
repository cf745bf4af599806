import { getDb } from '@/db';
import { AppError } from '@/lib/errors/app-error';
import { handle } from '@/lib/http/route';
import { requireSheetAccess } from '@/lib/sheets/access';
import { getVersion } from '@/lib/sheets/sheets';

export const dynamic = 'force-dynamic';

/** One version, read-only, with the results recorded when it was saved. */
export function GET(_request: Request, { params }: { params: Promise<{ sheetId: string; number: string }> }): Promise<Response> {
  return handle(async () => {
    const { sheetId, number } = await params;
    const { sheet } = await requireSheetAccess(sheetId);
    const n = Number(number);
    const version = Number.isInteger(n) && n > 0 ? await getVersion(getDb(), sheet.id, n) : undefined;
    if (!version) throw new AppError('not_found', 'No such version.');
    return Response.json({ version });
  });
}
