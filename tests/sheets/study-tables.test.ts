// A sweep's table read back from a stored version (lib/sheets/study-tables.ts), as the CSV route
// serves it: only the cell asked for is read from the results, and anything that is not a sweep
// of that version is not found.
import { describe, expect, it } from 'vitest';
import { seedDemo } from '../../db/seed';
import { studyTableCsv } from '../../lib/calc/study-csv';
import { getStudyTable } from '../../lib/sheets/study-tables';
import { testDb } from '../support/database';

async function studySheet() {
  await seedDemo(testDb(), { studies: true });
  const project = await testDb()
    .selectFrom('projects')
    .select('id')
    .where('code', '=', 'TPT2')
    .executeTakeFirstOrThrow();
  // Demo sheet 4, version 2 (the demo content): cell 3 (index 2) holds a sweep on line 1 and a plot on line 2 (db/seed.ts).
  return testDb()
    .selectFrom('sheets')
    .select('id')
    .where('project_id', '=', project.id)
    .where('number', '=', 4)
    .executeTakeFirstOrThrow();
}

describe('getStudyTable', () => {
  it('finds the sweep of one cell and line of a version, with the numbers as evaluated', async () => {
    const sheet = await studySheet();
    const table = await getStudyTable(testDb(), { sheetId: sheet.id, number: 2, cellIndex: 2, line: 1 });
    expect(table).toBeDefined();
    expect(table!.columns.map((c) => [c.name, c.unit])).toEqual([
      ['T_kin', 'MeV'],
      ['beta', null],
      ['gamma_L', null],
      ['Brho', 'T m'],
      ['B_dip', 'T'],
    ]);
    // steps(70 MeV, 250 MeV, 20 MeV): 70, 90, …, 250 (db/seed.ts).
    // (Each step may differ from the decimal value in its last bit: the engine works in SI units.)
    const steps = [70, 90, 110, 130, 150, 170, 190, 210, 230, 250];
    expect(table!.rows).toHaveLength(steps.length);
    table!.rows.forEach((r, i) => expect(r[0]).toBeCloseTo(steps[i], 10));
    // Kinematics (PDG, "Kinematics"): γ = 1 + T/(m_p c²), m_p c² = 938.272 089 43 MeV (CODATA 2022).
    table!.rows.forEach((r) => expect(r[2]).toBeCloseTo(1 + (r[0] as number) / 938.27208943, 12));
    const csv = studyTableCsv(table!);
    expect(csv.split('\r\n')[0]).toBe('T_kin [MeV],beta,gamma_L,Brho [T m],B_dip [T]');
  });

  it('finds nothing for a plot, another line, another cell or version, or another sheet', async () => {
    const sheet = await studySheet();
    const other = await testDb().selectFrom('sheets').select('id').where('number', '=', 1).executeTakeFirstOrThrow();
    expect(await getStudyTable(testDb(), { sheetId: sheet.id, number: 2, cellIndex: 2, line: 2 })).toBeUndefined();
    expect(await getStudyTable(testDb(), { sheetId: sheet.id, number: 2, cellIndex: 2, line: 3 })).toBeUndefined();
    expect(await getStudyTable(testDb(), { sheetId: sheet.id, number: 2, cellIndex: 1, line: 1 })).toBeUndefined();
    expect(await getStudyTable(testDb(), { sheetId: sheet.id, number: 2, cellIndex: 99, line: 1 })).toBeUndefined();
    expect(await getStudyTable(testDb(), { sheetId: sheet.id, number: 3, cellIndex: 2, line: 1 })).toBeUndefined();
    expect(await getStudyTable(testDb(), { sheetId: sheet.id, number: 1, cellIndex: 2, line: 1 })).toBeUndefined();
    expect(await getStudyTable(testDb(), { sheetId: other.id, number: 2, cellIndex: 2, line: 1 })).toBeUndefined();
  });
});
