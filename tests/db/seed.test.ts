import { verify } from '@node-rs/argon2';
import { sql } from 'kysely';
import { expect, it } from 'vitest';
import {
  DEMO_ACCOUNTS,
  DEMO_PASSWORD,
  DEMO_VERSION_MESSAGE,
  demoSheets,
  demoStudySheets,
  seedDemo,
} from '../../db/seed';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import { versionContentSchema } from '../../lib/sheets/content';
import { contentHash } from '../../lib/sheets/content-hash';
import { createSheet, saveVersion } from '../../lib/sheets/sheets';
import { demoStarterSheets } from '../../db/starters';
import type { SheetResult } from '../../lib/calc/types';
import { submissionFindings } from '../../lib/checks/submission-findings';
import type { VersionContent } from '../../lib/sheets/content';
import { testDb } from '../support/database';
import { actorByEmail } from '../support/people';

async function counts() {
  const db = testDb();
  const count = async (table: 'users' | 'projects' | 'project_members' | 'sheets' | 'versions' | 'audit_events') =>
    Number(
      (
        await db
          .selectFrom(table)
          .select((eb) => eb.fn.countAll<string>().as('n'))
          .executeTakeFirstOrThrow()
      ).n,
    );
  return {
    users: await count('users'),
    projects: await count('projects'),
    members: await count('project_members'),
    sheets: await count('sheets'),
    versions: await count('versions'),
    audit: await count('audit_events'),
  };
}

it('creates the demo world once and changes nothing when run again', async () => {
  const first = await seedDemo(testDb());
  expect(first).toEqual({ usersCreated: 6, projectCreated: true, membershipsCreated: 5, sheetsCreated: 3 });
  const after1 = await counts();
  // Each sheet as the app creates one: version 1 the new sheet, version 2 the demo content.
  expect(after1).toMatchObject({ users: 6, projects: 1, members: 5, sheets: 3, versions: 6 });

  const second = await seedDemo(testDb());
  expect(second).toEqual({ usersCreated: 0, projectCreated: false, membershipsCreated: 0, sheetsCreated: 0 });
  expect(await counts()).toEqual(after1);
  const breaks = await sql`select * from audit_chain_breaks()`.execute(testDb());
  expect(breaks.rows).toEqual([]);
});

it('records what the app records for each step: accounts, the project, the roles, the sheets and their versions', async () => {
  await seedDemo(testDb());
  const events = await testDb()
    .selectFrom('audit_events as e')
    .leftJoin('users as u', 'u.id', 'e.actor_id')
    .select(['e.action', 'u.email as actor'])
    .orderBy('e.occurred_at')
    .orderBy('e.id')
    .execute();
  const others = DEMO_ACCOUNTS.filter((a) => !a.admin);
  expect(events.map((e) => `${e.action} by ${e.actor ?? 'no one'}`)).toEqual([
    'user.create by no one',
    'user.password-reset by no one',
    ...others.flatMap(() => ['user.invite by admin@demo.test', 'user.password-reset by no one']),
    'project.create by admin@demo.test',
    ...others.flatMap((a) => a.roles.map(() => 'membership.grant by admin@demo.test')),
    ...demoSheets().flatMap(() => ['sheet.create by originator@demo.test', 'version.save by originator@demo.test']),
  ]);
});

it('saves each demo version as the app saves one: the same audit events, references and sheet', async () => {
  await seedDemo(testDb());
  const db = testDb();
  const project = await db.selectFrom('projects').select(['id', 'code']).executeTakeFirstOrThrow();
  const demo = demoSheets()[0].content;
  // The same content through the app's path: POST /api/projects/{id}/sheets, then POST /api/sheets/{id}/versions.
  const originator = await actorByEmail(db, 'originator@demo.test');
  const created = await createSheet(db, originator, project, {
    title: demo.title,
    safetyRelated: demo.safetyRelated,
    objective: demo.record.objective,
  });
  const saved = await saveVersion(
    db,
    originator,
    { id: created.id, project_id: project.id },
    { parentNumber: 1, message: DEMO_VERSION_MESSAGE, content: demo },
  );
  expect(saved.number).toBe(2);

  const sheetOf = async (number: number) => {
    const sheet = await db
      .selectFrom('sheets')
      .select(['id', 'title', 'safety_related', 'created_by', 'starter', 'started_from_version_id', 'voided_at'])
      .where('project_id', '=', project.id)
      .where('number', '=', number)
      .executeTakeFirstOrThrow();
    const versions = await db
      .selectFrom('versions')
      .select([
        'id',
        'number',
        'parent_number',
        'content_hash',
        sql<unknown>`version_results(versions)`.as('results'),
        'engine_version',
        'constants_edition',
        'author_id',
        'message',
        'created_at',
      ])
      .where('sheet_id', '=', sheet.id)
      .orderBy('number')
      .execute();
    const references = await db
      .selectFrom('version_references')
      .select(['version_id', 'revision_id', 'name'])
      .where(
        'version_id',
        'in',
        versions.map((v) => v.id),
      )
      .execute();
    const events = await db
      .selectFrom('audit_events')
      .select([
        'action',
        'object_type',
        'actor_id',
        'project_id',
        'session_id',
        'token_id',
        'old_value',
        'new_value',
        'reason',
        'occurred_at',
      ])
      .where('object_id', '=', sheet.id)
      .orderBy('occurred_at')
      .orderBy('id')
      .execute();
    const { id, ...row } = sheet;
    return { id, row, versions, references, events };
  };
  const seeded = await sheetOf(1);
  const app = await sheetOf(created.number);

  expect(seeded.row).toEqual(app.row);
  expect(seeded.references).toEqual(app.references);
  const version = ({ id, created_at, results, ...v }: (typeof seeded.versions)[number]) => {
    void id;
    expect(created_at).toBeInstanceOf(Date);
    // How many cells were computed afresh rather than taken from the engine's cache: not the sheet's results.
    const { evaluatedCells, ...sheetResults } = results as SheetResult;
    expect(evaluatedCells).toBeGreaterThanOrEqual(0);
    return { ...v, results: sheetResults };
  };
  expect(seeded.versions.map(version)).toEqual(app.versions.map(version));
  expect(seeded.versions.map((v) => [v.number, v.parent_number, v.message])).toEqual([
    [1, null, 'Sheet created'],
    [2, 1, DEMO_VERSION_MESSAGE],
  ]);
  // The events differ only in the sheet's number and their time.
  const event = ({ occurred_at, new_value, ...e }: (typeof seeded.events)[number], code: string) => {
    expect(occurred_at).toBeInstanceOf(Date);
    const { number, ...value } = new_value as { number?: string };
    expect(number ?? code).toBe(code);
    return { ...e, new_value: value };
  };
  expect(seeded.events.map((e) => event(e, 'TPT2-CALC-0001'))).toEqual(app.events.map((e) => event(e, created.code)));
  expect(seeded.events.map((e) => [e.action, e.new_value])).toEqual([
    [
      'sheet.create',
      {
        number: 'TPT2-CALC-0001',
        title: demo.title,
        safetyRelated: demo.safetyRelated,
        version: 1,
        sha256: seeded.versions[0].content_hash,
      },
    ],
    ['version.save', { version: 2, parent: 1, sha256: contentHash(demo) }],
  ]);
  // Each version was stored in the transaction its event was recorded in, at the database's time.
  for (const path of [seeded, app])
    for (const [i, v] of path.versions.entries())
      expect(v.created_at.getTime()).toBeLessThanOrEqual(path.events[i].occurred_at.getTime());
});

it('gives every demo account the documented password, hashed with argon2id', async () => {
  await seedDemo(testDb());
  const users = await testDb().selectFrom('users').select(['email', 'password_hash', 'is_admin']).execute();
  expect(users.map((u) => u.email).sort()).toEqual(DEMO_ACCOUNTS.map((a) => a.email).sort());
  for (const u of users) {
    expect(u.password_hash).toMatch(/^\$argon2id\$/);
    expect(await verify(u.password_hash!, DEMO_PASSWORD)).toBe(true);
    expect(await verify(u.password_hash!, 'wrong password')).toBe(false);
  }
  expect(users.filter((u) => u.is_admin).map((u) => u.email)).toEqual(['admin@demo.test']);
});

it('stores each seeded version with the SHA-256 of its canonical content', async () => {
  await seedDemo(testDb());
  const versions = await testDb().selectFrom('versions').select(['content', 'content_hash']).execute();
  for (const v of versions) {
    const content = versionContentSchema.parse(v.content);
    expect(contentHash(content)).toBe(v.content_hash);
  }
});

it('stores each demo version evaluated, every cell without error, with the engine version and constants edition', async () => {
  await seedDemo(testDb());
  const versions = await testDb()
    .selectFrom('versions')
    .select([
      sql<unknown>`version_results(versions)`.as('results'),
      'engine_version',
      'constants_edition',
      'content_hash',
    ])
    .execute();
  // Versions 2 hold the demo content.
  expect(versions.filter((v) => demoSheets().some((d) => contentHash(d.content) === v.content_hash))).toHaveLength(3);
  expect(versions).toHaveLength(6);
  for (const v of versions) {
    const results = v.results as { ok: boolean; cells: Array<{ ok: boolean; error: string | null }> };
    expect(results.cells.filter((c) => !c.ok).map((c) => c.error)).toEqual([]);
    expect(results.ok).toBe(true);
    expect(v.engine_version).toMatch(/^worldsheet-calc /);
    expect(v.constants_edition).toBe('CODATA 2022; SI 2019 exact; PDG 2024; AME 2020; IERS 2010');
  }
});

it('evaluates the demo dipole sheet to the expected rigidity and criterion', () => {
  const engine = createSheetEngine();
  const dipole = demoSheets()[0].content;
  const r = engine.evaluate(dipole.cells, { significantFigures: 6 });
  const statements = r.cells.flatMap((c) => c.statements);
  // 250 MeV protons: pc = √(T(T + 2 m_p c²)) = 729.133 MeV with CODATA 2022 m_p c² = 938.272 089 43 MeV,
  // Bρ = p/e = 2.432 13 T m (PDG kinematics: p [GeV/c] = 0.299 792 458 Bρ [T m] for unit charge).
  expect(statements.find((s) => s.name === 'Brho_max')?.value?.number).toBeCloseTo(2.43213, 4);
  expect(statements.find((s) => s.kind === 'criterion')?.criterion?.pass).toBe(true);
});

it('seeds the study sheets of the demo installation when asked, each evaluating without error', async () => {
  const report = await seedDemo(testDb(), { studies: true });
  expect(report.sheetsCreated).toBe(5);
  const versions = await testDb()
    .selectFrom('versions')
    .select(sql<unknown>`version_results(versions)`.as('results'))
    .where('number', '=', 2)
    .execute();
  expect(versions).toHaveLength(5);
  for (const v of versions) expect((v.results as { ok: boolean }).ok).toBe(true);
  const engine = createSheetEngine();
  const [study, worldline] = demoStudySheets().map((d) =>
    engine.evaluate(d.content.cells, { significantFigures: 6 }).cells.flatMap((c) => c.statements),
  );
  expect(study.find((s) => s.kind === 'sweep')?.table?.rows).toHaveLength(10);
  expect(study.find((s) => s.name === 'B_dip')?.uncertainty?.budget.map((b) => b.name)).toEqual(['T_kin', 'rho']);
  // Sheet 5, an electron from rest across a 60 mm gap at 60 kV (Rindler 2006, ch. 3, hyperbolic motion):
  // the horizon c²/a0 = m_e c²/(eE) = 0.510 998 950 69 m at E = 1 MV/m (CODATA 2022: m_e c² = 0.510 998 950 69 MeV),
  // drawn in metres; γ = 1 + eU/(m_e c²) at the anode, t = (c/a0)√(γ² − 1) = 0.849 90 ns.
  expect(worldline.find((s) => s.kind === 'plot')?.plot?.horizons?.[0].distance).toBeCloseTo(0.51099895069, 9);
  const gammaExit = 1 + 60 / 510.99895069;
  const a0 = (1.602176634e-19 * 1e6) / 9.1093837139e-31; // SI 2019 e exact; CODATA 2022 m_e
  expect(worldline.find((s) => s.name === 't_gap')?.value?.number).toBeCloseTo(
    (299_792_458 / a0) * Math.sqrt(gammaExit * gammaExit - 1) * 1e9,
    9,
  );
  const criteria = worldline.filter((s) => s.kind === 'criterion');
  expect(criteria).toHaveLength(2);
  expect(criteria.every((s) => s.criterion?.pass)).toBe(true);
});

it('seeds the starter sheets when asked: marked as starters, every cell without error, every design criterion met', async () => {
  const report = await seedDemo(testDb(), { starters: true });
  // Numbered after the demo and study sheets (1–5), which come with them: the app numbers sheets in order.
  expect(report.sheetsCreated).toBe(5 + demoStarterSheets().length);
  const rows = await testDb()
    .selectFrom('sheets as s')
    .innerJoin('versions as v', 'v.sheet_id', 's.id')
    .select(['s.number', 's.starter', sql<unknown>`version_results(v)`.as('results'), 'v.content'])
    .where('s.starter', '=', true)
    .where('v.number', '=', 2)
    .orderBy('s.number')
    .execute();
  expect(rows.map((r) => r.number)).toEqual([6, 7, 8, 9, 10]);
  for (const r of rows) {
    const results = r.results as {
      ok: boolean;
      cells: Array<{ error: string | null; statements: Array<{ kind: string; criterion: { pass: boolean } | null }> }>;
    };
    expect(results.cells.map((c) => c.error).filter(Boolean), `starter ${r.number}`).toEqual([]);
    expect(results.ok, `starter ${r.number}`).toBe(true);
    const criteria = results.cells.flatMap((c) => c.statements).filter((s) => s.kind === 'criterion');
    expect(criteria.length, `starter ${r.number} has a design criterion`).toBeGreaterThan(0);
    expect(
      criteria.every((s) => s.criterion?.pass),
      `starter ${r.number}`,
    ).toBe(true);
    // Nothing to acknowledge at submission: no error, failed criterion, engine warning or mismatched design input.
    expect(submissionFindings(r.content as VersionContent, r.results as SheetResult), `starter ${r.number}`).toEqual(
      [],
    );
  }
  // The demo sheets are not starters.
  expect(
    (await testDb().selectFrom('sheets').select('number').where('starter', '=', false).orderBy('number').execute()).map(
      (r) => r.number,
    ),
  ).toEqual([1, 2, 3, 4, 5]);
});
