// Saving a version is one statement, after a read of the sheet's latest version unless this process
// saved or read the parent itself (lib/sheets/sheets.ts, insertVersion): two saves based on the same
// version that both pass the read are decided by the database, and exactly one becomes the next
// version, with exactly one audit event; the other is refused with 409 naming the version that won. A
// sheet voided between the read and the statement takes no version. Without the read, the statement
// itself refuses a parent that is no longer the latest version, or a void sheet.
import { sql, type Transaction } from 'kysely';
import type { Database } from '../../db/schema';
import { beforeEach, describe, expect, it } from 'vitest';
import { getVersion, listVersions, saveVersion } from '../../lib/sheets/sheets';
import { makeSheet, makeTeam, type SheetRef, type Team } from '../support/approved-sheet';
import { testDb } from '../support/database';
import { refusal } from '../support/refusal';

type World = Team & { sheet: SheetRef; projectId: string };
let w: World;
beforeEach(async () => {
  const team = await makeTeam(testDb(), { code: 'RACE' });
  const sheet = await makeSheet(testDb(), team.author, { id: team.projectId, code: 'RACE' }, { title: 'Raced' });
  w = { ...team, sheet };
});

async function edit(source: string, message: string) {
  const latest = (await getVersion(testDb(), w.sheet.id))!;
  return saveVersion(testDb(), w.author, w.sheet, {
    parentNumber: latest.number,
    message,
    content: { ...latest.content, cells: [{ id: 'c1', kind: 'calc', source }] },
  });
}

/**
 * Holds the sheet's row in another transaction (which runs `inHold` before it commits) until
 * `waiters` statements wait for it, then lets them go: every save started has passed its read by then.
 */
async function holdingTheSheet<T>(
  waiters: number,
  start: () => Promise<T>,
  inHold: (trx: Transaction<Database>) => Promise<unknown> = async () => undefined,
): Promise<T> {
  const db = testDb();
  let release!: () => void;
  const released = new Promise<void>((resolve) => (release = resolve));
  let locked!: () => void;
  const isLocked = new Promise<void>((resolve) => (locked = resolve));
  const holder = db.transaction().execute(async (trx) => {
    await sql`select id from sheets where id = ${w.sheet.id} for update`.execute(trx);
    locked();
    await released;
    await inHold(trx);
  });
  await isLocked;
  const started = start();
  for (let tries = 0; ; tries++) {
    const { rows } = await sql<{ n: number }>`
      select count(*)::int as n from pg_stat_activity
      where datname = current_database() and wait_event_type = 'Lock' and query like '%update sheets%'`.execute(db);
    if (rows[0].n >= waiters) break;
    if (tries > 400) throw new Error(`only ${rows[0].n} of ${waiters} saves reached the sheet's lock`);
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
  release();
  await holder;
  return started;
}

describe('two saves based on the same version', () => {
  it('both pass the read; exactly one becomes version 2, the other is refused with 409 naming it', async () => {
    const outcomes = await holdingTheSheet(2, async () =>
      Promise.allSettled([edit('x = 1 m', 'first writer'), edit('x = 2 m', 'second writer')]),
    );
    const won = outcomes.filter((o) => o.status === 'fulfilled');
    expect(won).toHaveLength(1);
    const lost = (outcomes.find((o) => o.status === 'rejected') as PromiseRejectedResult).reason;
    const versions = await listVersions(testDb(), w.sheet.id);
    expect(versions.map((v) => v.number)).toEqual([2, 1]);
    const v2 = (await getVersion(testDb(), w.sheet.id, 2))!;
    expect(lost).toMatchObject({
      status: 409,
      code: 'conflict',
      message: 'Version 2 was saved since version 1, which your edits are based on.',
      details: { latestNumber: 2, latestSha256: v2.sha256 },
    });
    const events = await testDb()
      .selectFrom('audit_events')
      .select(['new_value', 'reason'])
      .where('action', '=', 'version.save')
      .where('object_id', '=', w.sheet.id)
      .execute();
    expect(events).toHaveLength(1);
    expect(events[0].new_value).toEqual({ version: 2, parent: 1, sha256: v2.sha256 });
    expect(events[0].reason).toBe(v2.message);
    const breaks = await sql`select * from audit_chain_breaks()`.execute(testDb());
    expect(breaks.rows).toEqual([]);
  });

  it('a sheet voided after the read takes no version; the save is refused as void', async () => {
    const outcome = await holdingTheSheet(
      1,
      async () => refusal(edit('x = 3 m', 'late')),
      (trx) =>
        sql`update sheets set voided_at = now(), voided_by = ${w.controller.userId}, void_reason = 'raced'
            where id = ${w.sheet.id}`.execute(trx),
    );
    expect(outcome).toMatchObject({ code: 'conflict', details: { voided: true } });
    expect((await listVersions(testDb(), w.sheet.id)).map((v) => v.number)).toEqual([1]);
    const saves = await testDb()
      .selectFrom('audit_events')
      .select('id')
      .where('action', '=', 'version.save')
      .where('object_id', '=', w.sheet.id)
      .execute();
    expect(saves).toEqual([]);
  });
});

describe('a save based on a version this process saved (no read before the statement)', () => {
  /** A save of `source` based on version `parent`, with the content of version 1 otherwise. */
  async function saveOn(parent: number, source: string) {
    const first = (await getVersion(testDb(), w.sheet.id, 1))!;
    return saveVersion(testDb(), w.author, w.sheet, {
      parentNumber: parent,
      message: `on ${parent}`,
      content: { ...first.content, cells: [{ id: 'c1', kind: 'calc', source }] },
    });
  }

  it('is refused with 409 naming the latest version when another instance saved since', async () => {
    expect((await saveOn(1, 'x = 1 m')).number).toBe(2);
    // Another instance's version 3 (a copy of version 2, written as that instance's statement would).
    await sql`
      insert into versions (sheet_id, number, parent_number, content, content_hash, result_head, result_cells,
                            engine_version, constants_edition, author_id, message)
      select sheet_id, 3, 2, content, content_hash, result_head, result_cells, engine_version, constants_edition,
             author_id, 'elsewhere'
      from versions where sheet_id = ${w.sheet.id} and number = 2`.execute(testDb());
    const v3 = (await getVersion(testDb(), w.sheet.id, 3))!;
    const outcome = await refusal(saveOn(2, 'x = 2 m'));
    expect(outcome).toMatchObject({
      status: 409,
      message: 'Version 3 was saved since version 2, which your edits are based on.',
      details: { latestNumber: 3, latestSha256: v3.sha256 },
    });
    expect((await listVersions(testDb(), w.sheet.id)).map((v) => v.number)).toEqual([3, 2, 1]);
    // Based on version 3 (never saved here: read first), it is version 4.
    expect((await saveOn(3, 'x = 3 m')).number).toBe(4);
  });

  it('is refused as void once the sheet is void, and takes no version', async () => {
    expect((await saveOn(1, 'x = 1 m')).number).toBe(2);
    await sql`update sheets set voided_at = now(), voided_by = ${w.controller.userId}, void_reason = 'replaced'
              where id = ${w.sheet.id}`.execute(testDb());
    const outcome = await refusal(saveOn(2, 'x = 2 m'));
    expect(outcome).toMatchObject({ code: 'conflict', details: { voided: true } });
    expect((await listVersions(testDb(), w.sheet.id)).map((v) => v.number)).toEqual([2, 1]);
  });
});
