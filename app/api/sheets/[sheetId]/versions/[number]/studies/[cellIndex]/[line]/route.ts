import { getDb } from '@/db';
import { studyCsvFileName, studyTableCsv } from '@/lib/calc/study-csv';
import { AppError } from '@/lib/errors/app-error';
import { routeParams } from '@/lib/http/params';
import { handle } from '@/lib/http/route';
import { requireSheetAccess } from '@/lib/sheets/access';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { getStudyTable } from '@/lib/sheets/study-tables';

export const dynamic = 'force-dynamic';

/** The table of a sweep recorded in a version, as a CSV download at full precision. */
export function GET(
  request: Request,
  { params }: { params: Promise<{ sheetId: string; number: string; cellIndex: string; line: string }> },
): Promise<Response> {
  return handle(request, async () => {
    const { sheetId, number, cellIndex, line } = await routeParams(params);
    const { sheet, project } = await requireSheetAccess(sheetId);
    const table = await getStudyTable(getDb(), { sheetId: sheet.id, number, cellIndex, line });
    if (!table) throw new AppError('not_found', 'No sweep table at that cell and line of this version.');
    const fileName = studyCsvFileName({
      sheet: formatSheetNumber(project.code, sheet.number),
      version: number,
      cellNumber: cellIndex + 1,
      line,
    });
    return new Response(studyTableCsv(table), {
      headers: {
        'content-type': 'text/csv; charset=utf-8',
        'content-disposition': `attachment; filename="${fileName}"`,
      },
    });
  });
}
