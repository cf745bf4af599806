import { getDb } from '@/db';
import { routeParams } from '@/lib/http/params';
import { handle } from '@/lib/http/route';
import { requireSheetAccess } from '@/lib/sheets/access';
import { sheetImpact, supersededInputs } from '@/lib/sheets/impact';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';

export const dynamic = 'force-dynamic';

/** What depends on each revision of the sheet (directly and transitively), and the sheet's own superseded inputs. */
export function GET(request: Request, { params }: { params: Promise<{ sheetId: string }> }): Promise<Response> {
  return handle(request, async () => {
    const { sheet, project } = await requireSheetAccess((await routeParams(params)).sheetId);
    const [revisions, inputs] = await Promise.all([
      sheetImpact(getDb(), sheet.id),
      supersededInputs(getDb(), sheet.id),
    ]);
    return Response.json({
      sheet: { id: sheet.id, code: formatSheetNumber(project.code, sheet.number), title: sheet.title },
      supersededInputs: inputs,
      revisions,
    });
  });
}
