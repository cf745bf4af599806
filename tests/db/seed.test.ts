import { verify } from '@node-rs/argon2';
import { expect, it } from 'vitest';
import { DEMO_ACCOUNTS, DEMO_PASSWORD, demoSheets, demoStudySheets, seedDemo } from '../../db/seed';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import { versionContentSchema } from '../../lib/sheets/content';
import { contentHash } from '../../lib/sheets/content-hash';
import { demoStarterSheets } from '../../db/starters';
import type { SheetResult } from '../../lib/calc/types';
import { submissionFindings } from '../../lib/checks/submission-findings';
import type { VersionContent } from '../../lib/sheets/content';
import { testDb } from '../support/database';

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
  expect(after1).toMatchObject({ users: 6, projects: 1, members: 5, sheets: 3, versions: 3 });

  const second = await seedDemo(testDb());
  expect(second).toEqual({ usersCreated: 0, projectCreated: false, membershipsCreated: 0, sheetsCreated: 0 });
  expect(await counts()).toEqual(after1);
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
    .select(['results', 'engine_version', 'constants_edition'])
    .execute();
  expect(versions).toHaveLength(3);
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
  const versions = await testDb().selectFrom('versions').select(['results']).execute();
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
  expect(report.sheetsCreated).toBe(3 + demoStarterSheets().length);
  const rows = await testDb()
    .selectFrom('sheets as s')
    .innerJoin('versions as v', 'v.sheet_id', 's.id')
    .select(['s.number', 's.starter', 'v.results', 'v.content'])
    .where('s.starter', '=', true)
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
  ).toEqual([1, 2, 3]);
});
