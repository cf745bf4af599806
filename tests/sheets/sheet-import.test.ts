// Importing a sheet file makes the sheet and its imported version in one transaction: a failure
// while saving the version leaves no sheet, no version and no audit event behind.
import { sql } from 'kysely';
import { expect, it } from 'vitest';
import { importSheetFile } from '../../lib/sheets/sheet-files';
import { testDb } from '../support/database';
import { makeProject, makeUser } from '../support/people';

const FILE = JSON.stringify({
  title: 'Imported rigidity',
  cells: [
    { kind: 'calc', source: 'T_i = 250 MeV\nBrho_i = magneticRigidity(momentumFromKinetic(T_i, m_p), q_e) to T*m' },
  ],
});

async function world() {
  const db = testDb();
  const author = await makeUser(db, 'author@example.test');
  const projectId = await makeProject(db, 'TPT2', [[author, 'originator']]);
  return { db, author, project: { id: projectId, code: 'TPT2' } };
}

it('imports a file as version 2 of a new sheet, evaluated', async () => {
  const { db, author, project } = await world();
  const sheet = await importSheetFile(db, author, project, FILE);
  expect(sheet).toMatchObject({ number: 1, code: 'TPT2-CALC-0001', version: 2 });
  const versions = await db
    .selectFrom('versions')
    .select(['number', 'message', sql<unknown>`version_results(versions)`.as('results')])
    .where('sheet_id', '=', sheet.id)
    .orderBy('number')
    .execute();
  expect(versions.map((v) => [v.number, v.message])).toEqual([
    [1, 'Sheet created'],
    [2, 'Imported from a sheet file'],
  ]);
  expect((versions[1].results as { ok: boolean }).ok).toBe(true);
});

it('leaves nothing behind when saving the imported version fails', async () => {
  const { db, author, project } = await world();
  // A database failure on the second insert only (the imported version).
  await sql`create function refuse_second_version() returns trigger language plpgsql as $$ begin if new.number = 2 then raise exception 'simulated failure'; end if; return new; end $$`.execute(
    db,
  );
  await sql`create trigger refuse_second_version before insert on versions for each row execute function refuse_second_version()`.execute(
    db,
  );
  try {
    await expect(importSheetFile(db, author, project, FILE)).rejects.toThrow(/simulated failure/);
  } finally {
    await sql`drop trigger refuse_second_version on versions`.execute(db);
    await sql`drop function refuse_second_version()`.execute(db);
  }
  expect(await db.selectFrom('sheets').select('id').execute()).toEqual([]);
  expect(await db.selectFrom('versions').select('id').execute()).toEqual([]);
  expect(
    await db
      .selectFrom('audit_events')
      .select('action')
      .where('action', 'in', ['sheet.create', 'version.save'])
      .execute(),
  ).toEqual([]);
  // And the next import takes number 1: nothing was used up.
  expect((await importSheetFile(db, author, project, FILE)).code).toBe('TPT2-CALC-0001');
});

it('records the units shown: a new sheet writes the trade setting, a file keeps its own, a file without one reads as SI', async () => {
  const { db, author, project } = await world();
  const momentum = { title: 'Momentum', cells: [{ kind: 'calc', source: 'p_i = momentumFromKinetic(250 MeV, m_p)' }] };
  const plain = await importSheetFile(db, author, project, JSON.stringify(momentum));
  const trade = await importSheetFile(db, author, project, JSON.stringify({ ...momentum, displayUnits: 'trade' }));
  const read = async (sheetId: string) =>
    db
      .selectFrom('versions')
      .select(['number', 'content', sql<unknown>`version_results(versions)`.as('results')])
      .where('sheet_id', '=', sheetId)
      .orderBy('number')
      .execute();
  const [created, imported] = await read(plain.id);
  // Version 1, as created: the setting written explicitly.
  expect((created.content as { displayUnits?: string }).displayUnits).toBe('trade');
  // A file without the setting was written before it existed: SI units, as it showed then.
  expect((imported.content as { displayUnits?: string }).displayUnits).toBe('si');
  const unitOf = (results: unknown) =>
    (results as { cells: Array<{ statements: Array<{ value: { unit: string } }> }> }).cells[0].statements[0].value.unit;
  expect(unitOf(imported.results)).toBe('(kg m) / s');
  const [, tradeVersion] = await read(trade.id);
  expect((tradeVersion.content as { displayUnits?: string }).displayUnits).toBe('trade');
  // PDG RPP, kinematics: pc = √(T² + 2T·mc²) = 729.134 MeV for 250 MeV protons.
  expect(unitOf(tradeVersion.results)).toBe('MeV / c');
});
