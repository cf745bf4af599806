// Software problem reporting against the real database: the versions (and revisions) evaluated with
// an engine version or constants edition are found, optionally only those calling a function, and
// only in the projects the caller belongs to (administrators: all).
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { beforeEach, describe, expect, it } from 'vitest';
import type { Actor } from '../../lib/auth/actor';
import { ENGINE_VERSION } from '../../lib/calc/version';
import { decide } from '../../lib/checks/decide';
import { saveCheckWork } from '../../lib/checks/work';
import { submitForCheck } from '../../lib/checks/submit';
import { requestIssue } from '../../lib/issue/request';
import { processIssueJob } from '../../lib/issue/job';
import { versionContentSchema } from '../../lib/sheets/content';
import { contentHash } from '../../lib/sheets/content-hash';
import { createSheet, getVersion, saveVersion } from '../../lib/sheets/sheets';
import { softwareImpact, softwareImpactCsv, softwareImpactQuerySchema } from '../../lib/sheets/software-impact';
import { storageConfig } from '../../lib/storage/config';
import { createObjectStore } from '../../lib/storage/object-store';
import { testDb } from '../support/database';
import { makeProject, makeUser, PASSWORD } from '../support/people';

process.env.WORLDSHEET_KEY_FOLDER ??= path.join(mkdtempSync(path.join(tmpdir(), 'ws-swi-')), 'keys');

const OLD_ENGINE = 'worldsheet-engine 0.9.0';
const OLD_EDITION = 'CODATA 2018';

let admin: Actor;
let alpha: { author: Actor; checker: Actor; approver: Actor; controller: Actor };
let outsider: Actor;
let alphaSheet: { id: string; project_id: string; number: number; title: string };

/** A version written directly, as an older engine would have recorded it. */
async function oldVersion(
  sheetId: string,
  author: Actor,
  number: number,
  cells: Array<{ kind: 'calc' | 'text'; source: string }>,
  engine = OLD_ENGINE,
  edition = OLD_EDITION,
) {
  const content = versionContentSchema.parse({
    schema: 1,
    title: 'Older sheet',
    safetyRelated: false,
    significantFigures: 6,
    record: { objective: '', inputs: [], assumptions: [], method: '', references: [], conclusions: '' },
    cells: cells.map((c, i) => ({ id: `c${i + 1}`, ...c })),
    attachments: [],
  });
  await testDb()
    .insertInto('versions')
    .values({
      sheet_id: sheetId,
      number,
      parent_number: number - 1,
      content: JSON.stringify(content),
      content_hash: contentHash(content),
      results: null,
      engine_version: engine,
      constants_edition: edition,
      author_id: author.userId,
      message: `version ${number}`,
    })
    .execute();
}

beforeEach(async () => {
  const db = testDb();
  const [author, checker, approver, controller] = await Promise.all(
    ['author', 'checker', 'approver', 'controller'].map((n) => makeUser(db, `${n}@example.test`)),
  );
  alpha = { author, checker, approver, controller };
  outsider = await makeUser(db, 'outsider@example.test');
  admin = await makeUser(db, 'admin@example.test', { admin: true });
  const alphaId = await makeProject(db, 'ALPHA', [
    [author, 'originator'],
    [checker, 'checker'],
    [approver, 'approver'],
    [controller, 'controller'],
  ]);
  const betaId = await makeProject(db, 'BETA', [[outsider, 'originator']]);
  const a = await createSheet(
    db,
    author,
    { id: alphaId, code: 'ALPHA' },
    { title: 'Beam transport', safetyRelated: true, objective: '' },
  );
  alphaSheet = { id: a.id, project_id: alphaId, number: a.number, title: 'Beam transport' };
  await oldVersion(a.id, author, 2, [
    { kind: 'calc', source: 'g = lorentzFactor(0.5)' },
    { kind: 'text', source: 'Uses gammaMinusOne( for small speeds.' },
  ]);
  await oldVersion(a.id, author, 3, [{ kind: 'calc', source: 'g1 = gammaMinusOne (0.1)\ny = mylorentzFactor(0.2)' }]);
  const b = await createSheet(
    db,
    outsider,
    { id: betaId, code: 'BETA' },
    { title: 'Timing budget', safetyRelated: false, objective: '' },
  );
  await oldVersion(b.id, outsider, 2, [{ kind: 'calc', source: 'g = lorentzFactor (0.9)' }]);
});

const query = (q: Record<string, string>) => softwareImpactQuerySchema.parse(q);

// Issuing renders and signs a PDF, which takes seconds on a busy machine: more time than the default.
const ISSUING = { timeout: 120_000 };

describe('software impact', ISSUING, () => {
  it("lists the versions evaluated with an engine version, only in the caller's projects, with counts to pick from", async () => {
    const db = testDb();
    const mine = await softwareImpact(db, alpha.author, query({ engineVersion: OLD_ENGINE }));
    expect(
      mine.rows!.map((r) => [
        r.sheet,
        r.versionNumber,
        r.engineVersion,
        r.constantsEdition,
        r.safetyRelated,
        r.revision,
      ]),
    ).toEqual([
      ['ALPHA-CALC-0001', 2, OLD_ENGINE, OLD_EDITION, true, null],
      ['ALPHA-CALC-0001', 3, OLD_ENGINE, OLD_EDITION, true, null],
    ]);
    expect(mine.summary).toEqual({ versions: 2, sheets: 1, revisions: 0, currentRevisions: 0, safetyRelatedSheets: 1 });
    // The facets count only what the caller may see: version 1 (created now) and the two older ones.
    expect(mine.engineVersions).toEqual(
      expect.arrayContaining([
        { value: OLD_ENGINE, versions: 2, revisions: 0 },
        { value: ENGINE_VERSION, versions: 1, revisions: 0 },
      ]),
    );
    expect(mine.engineVersions).toHaveLength(2);
    expect(mine.constantsEditions.find((f) => f.value === OLD_EDITION)).toEqual({
      value: OLD_EDITION,
      versions: 2,
      revisions: 0,
    });

    const theirs = await softwareImpact(db, outsider, query({ engineVersion: OLD_ENGINE }));
    expect(theirs.rows!.map((r) => [r.sheet, r.versionNumber])).toEqual([['BETA-CALC-0001', 2]]);
    const everyone = await softwareImpact(db, admin, query({ constantsEdition: OLD_EDITION }));
    expect(everyone.rows!.map((r) => [r.sheet, r.versionNumber])).toEqual([
      ['ALPHA-CALC-0001', 2],
      ['ALPHA-CALC-0001', 3],
      ['BETA-CALC-0001', 2],
    ]);
    // A user in no project sees nothing, not even the editions in use.
    const nobody = await makeUser(db, 'nobody@example.test');
    expect(await softwareImpact(db, nobody, query({ engineVersion: OLD_ENGINE }))).toMatchObject({
      rows: [],
      engineVersions: [],
      constantsEditions: [],
    });
    // Without a filter: the counts only.
    expect((await softwareImpact(db, alpha.author, query({}))).rows).toBeNull();
    expect((await softwareImpact(db, alpha.author, query({ engineVersion: '', function: '' }))).rows).toBeNull();
  });

  it('narrows to versions whose calculation cells call a function (a whole name followed by "(")', async () => {
    const db = testDb();
    const lorentz = await softwareImpact(db, admin, query({ engineVersion: OLD_ENGINE, function: 'lorentzFactor' }));
    expect(lorentz.rows!.map((r) => [r.sheet, r.versionNumber])).toEqual([
      ['ALPHA-CALC-0001', 2],
      ['BETA-CALC-0001', 2],
    ]);
    // Only calculation cells count: version 2 names gammaMinusOne( in a text cell.
    const gm1 = await softwareImpact(db, alpha.author, query({ function: 'gammaMinusOne' }));
    expect(gm1.rows!.map((r) => r.versionNumber)).toEqual([3]);
    expect(softwareImpactQuerySchema.safeParse({ function: 'a.b(' }).success).toBe(false);
    expect(softwareImpactQuerySchema.safeParse({ function: "x') or true --" }).success).toBe(false);
    expect(softwareImpactQuerySchema.safeParse({ format: 'xml' }).success).toBe(false);
  });

  it('shows the revision issued from a version and exports the list as CSV', async () => {
    const db = testDb();
    const latest = (await getVersion(db, alphaSheet.id))!;
    const saved = await saveVersion(db, alpha.author, alphaSheet, {
      parentNumber: latest.number,
      message: '=cmd|calc',
      content: {
        ...latest.content,
        title: '=HYPERLINK("x")',
        cells: [{ id: 'c1', kind: 'calc', source: 'g = lorentzFactor(0.5)' }],
      },
    });
    const { id } = await submitForCheck(db, alpha.author, alphaSheet, {
      versionNumber: saved.number,
      checkerId: alpha.checker.userId,
      password: PASSWORD,
    });
    await saveCheckWork(db, alpha.checker, id, { verificationMethod: 'design_review' });
    await decide(db, alpha.checker, id, { action: 'sign', password: PASSWORD });
    await decide(db, alpha.approver, id, { action: 'approve', password: PASSWORD });
    const { jobId } = await requestIssue(db, alpha.controller, alphaSheet, {
      versionNumber: saved.number,
      password: PASSWORD,
    });
    await processIssueJob(db, createObjectStore(storageConfig()), jobId);

    const answer = await softwareImpact(
      db,
      alpha.author,
      query({ engineVersion: ENGINE_VERSION, function: 'lorentzFactor' }),
    );
    expect(answer.rows!.map((r) => [r.versionNumber, r.revision, r.revisionStatus])).toEqual([
      [saved.number, 'A', 'current'],
    ]);
    expect(answer.summary).toMatchObject({ versions: 1, revisions: 1, currentRevisions: 1 });
    expect(answer.engineVersions.find((f) => f.value === ENGINE_VERSION)).toEqual({
      value: ENGINE_VERSION,
      versions: 2,
      revisions: 1,
    });

    const csv = softwareImpactCsv(
      (await softwareImpact(db, alpha.author, query({ engineVersion: ENGINE_VERSION, format: 'csv' }))).rows!,
    );
    const lines = csv.trimEnd().split('\r\n');
    expect(lines[0]).toBe(
      'project,sheet,title,safety_related,version,version_sha256,engine_version,constants_edition,saved_at_utc,author,revision,revision_status',
    );
    expect(lines).toHaveLength(3);
    // A title that a spreadsheet would read as a formula is neutralised (OWASP CSV injection).
    // (The version saved on top of version 3 is not safety-related, and saving it says so for the sheet.)
    expect(lines[2]).toContain(
      `ALPHA,ALPHA-CALC-0001,"'=HYPERLINK(""x"")",no,${saved.number},${saved.sha256},${ENGINE_VERSION},`,
    );
    expect(lines[2]).toMatch(/,A,current$/);
  });
});
