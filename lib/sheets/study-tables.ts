// A sweep's table as recorded in a version's results, for the CSV download
// (GET /api/sheets/<id>/versions/<n>/studies/<cellIndex>/<line>). Only the one cell's results are
// read from the stored JSON, not the whole version.
import { sql, type Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import type { CellResult, StudyTable } from '@/lib/calc/types';

/**
 * The table of the sweep on line `line` (from 1) of the cell whose result has index `cellIndex`
 * (from 0, as `CellResult.index`) in version `number` of the sheet; undefined when the version,
 * the cell or the statement does not exist or the statement has no table.
 */
export async function getStudyTable(
  db: Kysely<Database>,
  { sheetId, number, cellIndex, line }: { sheetId: string; number: number; cellIndex: number; line: number },
): Promise<StudyTable | undefined> {
  const row = await db
    .selectFrom('versions as v')
    .select(
      sql<CellResult | null>`jsonb_path_query_first(version_results(v), '$.cells[*] ? (@.index == $i)', jsonb_build_object('i', ${cellIndex}::int))`.as(
        'cell',
      ),
    )
    .where('v.sheet_id', '=', sheetId)
    .where('v.number', '=', number)
    .executeTakeFirst();
  const statement = row?.cell?.statements?.find((s) => s.line === line);
  return statement?.table ?? undefined;
}
