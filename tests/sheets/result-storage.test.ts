// Results stored by cell (lib/sheets/result-storage.ts, migration 20261205T000100): a version reads
// back exactly the results it was saved with; a save stores only the cells whose results are new; a
// stored cell can be neither changed nor stored under a key that is not its text's SHA-256; and the
// installation's check finds a cell result that went missing behind the triggers' back.
import { createHash } from 'node:crypto';
import { sql } from 'kysely';
import { beforeEach, expect, it } from 'vitest';
import { verifyInstallation } from '../../lib/audit/integrity';
import { getVersion, saveVersion } from '../../lib/sheets/sheets';
import type { ObjectStore } from '../../lib/storage/object-store';
import { makeSheet, makeTeam, type SheetRef, type Team } from '../support/approved-sheet';
import { adminPool, testDb } from '../support/database';

let w: Team & { sheet: SheetRef };
beforeEach(async () => {
  const team = await makeTeam(testDb(), { code: 'RSTO' });
  w = {
    ...team,
    sheet: await makeSheet(testDb(), team.author, { id: team.projectId, code: 'RSTO' }, { title: 'Stored' }),
  };
});

const cells = (gap: string) => [
  { id: 'c1', kind: 'calc' as const, source: 'E_k = 250 MeV\nm_p = mass_proton' },
  { id: 'c2', kind: 'calc' as const, source: `g_1 = gamma_from_kinetic(E_k, m_p)\nL_0 = ${gap}` },
  { id: 'c3', kind: 'text' as const, source: 'The gap of the drift tube.' },
  { id: 'c4', kind: 'calc' as const, source: 'b_1 = beta_from_gamma(g_1)' },
];

async function save(gap: string, message: string) {
  const latest = (await getVersion(testDb(), w.sheet.id))!;
  return saveVersion(testDb(), w.author, w.sheet, {
    parentNumber: latest.number,
    message,
    content: { ...latest.content, cells: cells(gap) },
  });
}

const storedCells = async () =>
  Number((await sql<{ n: string }>`select count(*) as n from result_cells`.execute(testDb())).rows[0].n);

it('reads back the results as saved, and a one-cell edit stores one new cell result', async () => {
  await save('0.5 m', 'first gap');
  const first = (await getVersion(testDb(), w.sheet.id))!;
  const before = await storedCells();
  await save('0.75 m', 'longer gap');
  // Only the edited cell's result is new: the others are the same texts, already stored.
  expect(await storedCells()).toBe(before + 1);

  const second = (await getVersion(testDb(), w.sheet.id))!;
  expect(second.results!.cells).toHaveLength(4);
  expect(second.results!.cells.map((c) => c.id)).toEqual(['c1', 'c2', 'c3', 'c4']);
  expect(second.results!.cells[0]).toEqual(first.results!.cells[0]);
  const gap = second.results!.cells[1].statements.find((s) => s.name === 'L_0')!;
  expect(gap.value).toMatchObject({ number: 0.75, unit: 'm' });
  expect(second.results!.engineVersion).toMatch(/^worldsheet-calc /);
  // The earlier version still reads as it was saved.
  const again = (await getVersion(testDb(), w.sheet.id, first.number))!;
  expect(again.results).toEqual(first.results);

  // Each stored cell is the exact JSON text of a cell result, keyed by its SHA-256.
  const row = await sql<{ hash: Buffer; result: string }>`
    select hash, result::text as result from result_cells
    where hash = substring((select result_cells from versions where sheet_id = ${w.sheet.id} and number = ${second.number}) from 33 for 32)`.execute(
    testDb(),
  );
  expect(createHash('sha256').update(row.rows[0].result, 'utf8').digest()).toEqual(row.rows[0].hash);
  expect(JSON.parse(row.rows[0].result)).toEqual(second.results!.cells[1]);
});

it('refuses to change a stored cell result, or to store one under a key that is not its hash', async () => {
  await save('0.5 m', 'first gap');
  await expect(sql`update result_cells set result = '{}'::json`.execute(testDb())).rejects.toThrow();
  await expect(sql`delete from result_cells`.execute(testDb())).rejects.toThrow();
  await expect(
    sql`insert into result_cells (hash, result) values (sha256(convert_to('{"a":1}', 'UTF8')), '{"a":2}'::json)`.execute(
      testDb(),
    ),
  ).rejects.toThrow(/result_cells_hash/);
  // A version cannot hold both forms, nor a list of digests that is not whole digests.
  await expect(
    sql`insert into versions (sheet_id, number, parent_number, content, content_hash, author_id, result_head, result_cells)
        values (${w.sheet.id}, 99, 1, '{}'::jsonb, repeat('0', 64), ${w.author.userId}, '{}'::jsonb, '\\x0102'::bytea)`.execute(
      testDb(),
    ),
  ).rejects.toThrow(/versions_results_one_form/);
});

it('the installation check reports a cell result that went missing behind the triggers', async () => {
  await save('0.5 m', 'first gap');
  const noStore = { get: async () => null } as unknown as ObjectStore;
  const clean = await verifyInstallation(testDb(), noStore);
  expect(clean.problems.filter((p) => /cell result|result of its cell/.test(p))).toEqual([]);

  const latest = (await getVersion(testDb(), w.sheet.id))!;
  const client = await adminPool().connect();
  try {
    await client.query('begin');
    await client.query('set local session_replication_role = replica');
    await client.query(
      `delete from result_cells where hash = substring((select result_cells from versions where sheet_id = $1 and number = $2) from 65 for 32)`,
      [w.sheet.id, latest.number],
    );
    await client.query('commit');
  } finally {
    client.release();
  }
  const report = await verifyInstallation(testDb(), noStore);
  expect(report.problems).toContain(
    `version ${(await testDb().selectFrom('versions').select('id').where('sheet_id', '=', w.sheet.id).where('number', '=', latest.number).executeTakeFirstOrThrow()).id}: the result of its cell at position 3 is missing`,
  );
  // Read back, the missing cell shows as missing (null), never as a shorter list.
  const read = (await getVersion(testDb(), w.sheet.id))!;
  expect(read.results!.cells).toHaveLength(4);
  expect(read.results!.cells[2]).toBeNull();
});
