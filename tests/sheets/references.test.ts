// Citations between sheets against the real database: a citation resolves to the value as issued,
// is recorded with the version that makes it, flags the citing sheet (and its issued revision in the
// register) once the cited revision is superseded, clears when the sheet cites the current revision,
// and shows on the cited sheet's impact list, directly and through other sheets' revisions.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { sql } from 'kysely';
import { beforeEach, describe, expect, it } from 'vitest';
import type { Actor } from '../../lib/auth/actor';
import { findReferences } from '../../lib/calc/references';
import type { SheetResult, StatementResult } from '../../lib/calc/types';
import { submissionFindings } from '../../lib/checks/submission-findings';
import { decide } from '../../lib/checks/decide';
import { saveCheckWork } from '../../lib/checks/work';
import { submitForCheck } from '../../lib/checks/submit';
import { requestIssue } from '../../lib/issue/request';
import { processIssueJob } from '../../lib/issue/job';
import { listRevisions, registerCsv } from '../../lib/issue/register';
import { withdrawRevision } from '../../lib/issue/withdraw';
import {
  revisionInputFlags,
  sheetImpact,
  sheetInputFlags,
  staleRevisionCounts,
  supersededInputs,
} from '../../lib/sheets/impact';
import { NO_PROJECT_FOR_REFERENCES, resolveCitations, unresolvedReferences } from '../../lib/sheets/references';
import { createSheet, getVersion, saveVersion } from '../../lib/sheets/sheets';
import { storageConfig } from '../../lib/storage/config';
import { createObjectStore } from '../../lib/storage/object-store';
import { testDb } from '../support/database';
import { makeProject, makeUser, PASSWORD } from '../support/people';

/** The answers the engine gets for these citations (what resolveCitations resolves, without the rows). */
const resolveReferences = async (...args: Parameters<typeof resolveCitations>) =>
  (await resolveCitations(...args)).map((c) => c.reference);

process.env.WORLDSHEET_KEY_FOLDER ??= path.join(mkdtempSync(path.join(tmpdir(), 'ws-refs-')), 'keys');

interface People {
  author: Actor;
  checker: Actor;
  approver: Actor;
  controller: Actor;
}
type Sheet = { id: string; project_id: string; number: number; title: string };

let people: People;
let projectId: string;

async function newSheet(title: string, project = projectId, code = 'TPT2'): Promise<Sheet> {
  const created = await createSheet(
    testDb(),
    people.author,
    { id: project, code },
    { title, safetyRelated: false, objective: title },
  );
  return { id: created.id, project_id: project, number: created.number, title };
}

async function save(sheet: Sheet, source: string) {
  const db = testDb();
  const latest = (await getVersion(db, sheet.id))!;
  return saveVersion(db, people.author, sheet, {
    parentNumber: latest.number,
    message: 'edit',
    content: { ...latest.content, cells: [{ id: 'c1', kind: 'calc', source }] },
  });
}

/** Saves `source`, takes it through check and approval, and issues it: the revision's code and id. */
async function issue(sheet: Sheet, source: string) {
  const db = testDb();
  const saved = await save(sheet, source);
  // A sheet with an evaluation error can only be submitted with each error acknowledged in writing.
  const version = (await getVersion(db, sheet.id, saved.number))!;
  const acknowledgements = submissionFindings(version.content, version.results).map((f) => ({
    key: f.key,
    text: 'Deliberate: exercises a citation of a result that is not a number.',
  }));
  const { id } = await submitForCheck(db, people.author, sheet, {
    versionNumber: saved.number,
    checkerId: people.checker.userId,
    password: PASSWORD,
    acknowledgements,
  });
  await saveCheckWork(db, people.checker, id, { verificationMethod: 'design_review' });
  await decide(db, people.checker, id, { action: 'sign', password: PASSWORD });
  await decide(db, people.approver, id, { action: 'approve', password: PASSWORD });
  const { jobId, revision } = await requestIssue(db, people.controller, sheet, {
    versionNumber: saved.number,
    password: PASSWORD,
  });
  const revisionId = (await processIssueJob(db, createObjectStore(storageConfig()), jobId))!;
  return { revision, revisionId, versionNumber: saved.number };
}

function definition(results: SheetResult | null, name: string): StatementResult {
  const s = results?.cells.flatMap((c) => c.statements).find((x) => x.name === name && x.kind === 'definition');
  if (!s) throw new Error(`no definition of ${name}`);
  return s;
}

const RIGIDITY = (tKin: string) =>
  `T_kin = ${tKin}\nBrho = magneticRigidity(momentumFromKinetic(T_kin, m_p), q_e) to T*m`;
const cite = (sheet: string, revision: string, name = 'Brho', as = 'Brho_in') =>
  `${as} = fromRevision("${sheet}", "${revision}", "${name}")`;

beforeEach(async () => {
  const db = testDb();
  const [author, checker, approver, controller] = await Promise.all(
    ['author', 'checker', 'approver', 'controller'].map((n) => makeUser(db, `${n}@example.test`)),
  );
  people = { author, checker, approver, controller };
  projectId = await makeProject(db, 'TPT2', [
    [author, 'originator'],
    [checker, 'checker'],
    [approver, 'approver'],
    [controller, 'controller'],
  ]);
});

// Issuing renders and signs a PDF, which takes seconds on a busy machine: more time than the default.
const ISSUING = { timeout: 120_000 };

describe('resolving citations', ISSUING, () => {
  it('pins a citation to the value of the issued revision, with its status, title and version hash', async () => {
    const db = testDb();
    const a = await newSheet('Gantry dipole rigidity');
    const revA = await issue(a, RIGIDITY('250 MeV'));
    const issued = definition((await getVersion(db, a.id, revA.versionNumber))!.results, 'Brho');
    const [resolved] = await resolveReferences(
      db,
      projectId,
      findReferences([{ kind: 'calc', source: cite('tpt2-calc-0001', 'a') }]),
    );
    expect(resolved).toMatchObject({
      sheet: 'TPT2-CALC-0001',
      revision: 'A',
      name: 'Brho',
      error: null,
      status: 'current',
      supersededBy: null,
      title: 'Gantry dipole rigidity',
      versionSha256: (await getVersion(db, a.id, revA.versionNumber))!.sha256,
    });
    // Exactly the stored number, at full precision, in the stored unit.
    expect(resolved.value).toEqual({ number: issued.value!.number, unit: issued.value!.unit, uncertainty: null });

    // Once revision B is issued, revision A still resolves to its own value, marked superseded by B.
    await issue(a, RIGIDITY('230 MeV'));
    const [again] = await resolveReferences(db, projectId, [{ sheet: 'TPT2-CALC-0001', revision: 'A', name: 'Brho' }]);
    expect(again).toMatchObject({
      status: 'superseded',
      supersededBy: 'B',
      error: null,
      value: { number: issued.value!.number },
    });
  });

  it("refuses another project's sheet, an unissued or withdrawn revision, a missing name, a value that is not a number, and the sheet itself", async () => {
    const db = testDb();
    const a = await newSheet('Gantry dipole rigidity');
    const revA = await issue(a, `${RIGIDITY('250 MeV')}\nlabel = "dipole"\nbad = 2 m + 3 s`);
    const otherProject = await makeProject(db, 'OTH', [[people.author, 'originator']]);
    const other = await newSheet('Elsewhere', otherProject, 'OTH');
    expect(other.number).toBe(1);
    const answers = await resolveReferences(
      db,
      projectId,
      [
        { sheet: 'OTH-CALC-0001', revision: 'A', name: 'x' },
        { sheet: 'TPT2-CALC-0009', revision: 'A', name: 'x' },
        { sheet: 'TPT2-CALC-0001', revision: 'B', name: 'Brho' },
        { sheet: 'TPT2-CALC-0001', revision: 'A', name: 'Bfield' },
        { sheet: 'TPT2-CALC-0001', revision: 'A', name: 'label' },
        { sheet: 'TPT2-CALC-0001', revision: 'A', name: 'bad' },
        { sheet: 'TPT2-CALC-0001', revision: 'A', name: 'Brho' },
      ],
      { excludeSheetId: undefined },
    );
    const errors = answers.map((r) => r.error);
    expect(errors[0]).toMatch(/OTH-CALC-0001 is not a sheet of this project/);
    expect(errors[1]).toMatch(/TPT2-CALC-0009 is not a sheet of this project/);
    expect(errors[2]).toBe('revision B of TPT2-CALC-0001 is not issued');
    expect(errors[3]).toBe('revision A of TPT2-CALC-0001 has no result named Bfield');
    expect(errors[4]).toBe('label in revision A of TPT2-CALC-0001 is not a number');
    expect(errors[5]).toMatch(/^bad in revision A of TPT2-CALC-0001 has an error: /);
    expect(errors[6]).toBeNull();
    for (const r of answers.slice(0, 6)) expect(r.value).toBeNull();

    const [self] = await resolveReferences(db, projectId, [{ sheet: 'TPT2-CALC-0001', revision: 'A', name: 'Brho' }], {
      excludeSheetId: a.id,
    });
    expect(self.error).toBe('a sheet cannot cite its own revisions (TPT2-CALC-0001)');

    await withdrawRevision(db, people.controller, revA.revisionId, 'field map of the wrong magnet');
    const [withdrawn] = await resolveReferences(db, projectId, [
      { sheet: 'TPT2-CALC-0001', revision: 'A', name: 'Brho' },
    ]);
    expect(withdrawn).toMatchObject({
      value: null,
      status: 'withdrawn',
      error: 'revision A of TPT2-CALC-0001 was withdrawn: field map of the wrong magnet',
    });

    // Evaluated outside a saved sheet (the scratch pad), a citation cannot resolve.
    expect(unresolvedReferences([{ sheet: 'TPT2-CALC-0001', revision: 'A', name: 'Brho' }])[0]).toMatchObject({
      value: null,
      error: NO_PROJECT_FOR_REFERENCES,
    });
  });
});

describe('evaluating citations', ISSUING, () => {
  it('evaluates a citation to the issued value, and one that cannot be used to the error of its statement', async () => {
    const db = testDb();
    const a = await newSheet('Gantry dipole rigidity');
    const revA = await issue(a, RIGIDITY('250 MeV'));
    const issued = definition((await getVersion(db, a.id, revA.versionNumber))!.results, 'Brho');
    const otherProject = await makeProject(db, 'OTH', [[people.author, 'originator']]);
    await newSheet('Elsewhere', otherProject, 'OTH');
    const b = await newSheet('Dipole power supply');
    await save(
      b,
      [
        cite('TPT2-CALC-0001', 'A'),
        'I_ratio = Brho_in / (1 T*m)',
        cite('OTH-CALC-0001', 'A', 'x', 'x_other'),
        cite('TPT2-CALC-0001', 'B', 'Brho', 'Brho_next'),
        cite('TPT2-CALC-0001', 'A', 'Bfield', 'B_missing'),
      ].join('\n'),
    );
    const results = (await getVersion(db, b.id))!.results;
    const cited = definition(results, 'Brho_in');
    // Pinned: the number as issued, at full precision, in its unit; the statement names the revision.
    expect(cited.error).toBeNull();
    expect(cited.value!.number).toBe(issued.value!.number);
    expect(cited.value!.unit).toBe(issued.value!.unit);
    expect(cited.references).toMatchObject([
      { sheet: 'TPT2-CALC-0001', revision: 'A', name: 'Brho', status: 'current', error: null },
    ]);
    expect(definition(results, 'I_ratio').error).toBeNull();
    expect(definition(results, 'x_other').error).toMatch(/OTH-CALC-0001 is not a sheet of this project/);
    expect(definition(results, 'Brho_next').error).toMatch(/revision B of TPT2-CALC-0001 is not issued/);
    expect(definition(results, 'B_missing').error).toMatch(/revision A of TPT2-CALC-0001 has no result named Bfield/);
    // Only the citation that resolved is recorded with the version.
    expect(await db.selectFrom('version_references').select(['revision_id', 'name']).execute()).toEqual([
      { revision_id: revA.revisionId, name: 'Brho' },
    ]);

    // The same cells saved again after revision B is issued: still the value of revision A, now
    // marked superseded (the evaluator's recent results are keyed on the citations as resolved).
    await issue(a, RIGIDITY('230 MeV'));
    const latest = (await getVersion(db, b.id))!;
    await saveVersion(db, people.author, b, {
      parentNumber: latest.number,
      message: 'same cells',
      content: latest.content,
    });
    const again = definition((await getVersion(db, b.id))!.results, 'Brho_in');
    expect(again.value!.number).toBe(issued.value!.number);
    expect(again.references).toMatchObject([{ revision: 'A', status: 'superseded', supersededBy: 'B' }]);
  });
});

describe('recording, superseded inputs and impact', ISSUING, () => {
  it('records citations with the version, flags superseded inputs until the sheet cites the current revision, and lists the impact', async () => {
    const db = testDb();
    const a = await newSheet('Gantry dipole rigidity');
    const b = await newSheet('Dipole power supply');
    const c = await newSheet('Interlock set-points');
    const revAA = await issue(a, RIGIDITY('250 MeV'));
    const oldBrho = definition((await getVersion(db, a.id, revAA.versionNumber))!.results, 'Brho');

    // B cites A revision A and is issued; C cites B revision A.
    const revBA = await issue(b, `${cite('TPT2-CALC-0001', 'A')}\nI_max = 400 A`);
    const recorded = await db
      .selectFrom('version_references as vr')
      .innerJoin('versions as v', 'v.id', 'vr.version_id')
      .select(['v.sheet_id', 'v.number', 'vr.revision_id', 'vr.name'])
      .execute();
    expect(recorded).toEqual([
      { sheet_id: b.id, number: revBA.versionNumber, revision_id: revAA.revisionId, name: 'Brho' },
    ]);
    await save(c, `${cite('TPT2-CALC-0002', 'A', 'I_max', 'I_lim')}\n${cite('TPT2-CALC-0001', 'Z')}`);
    // Only citations that resolved are recorded (revision Z does not exist).
    expect(
      await db.selectFrom('version_references').select('name').where('revision_id', '=', revBA.revisionId).execute(),
    ).toEqual([{ name: 'I_max' }]);
    expect(await supersededInputs(db, b.id)).toEqual([]);
    expect((await revisionInputFlags(db, projectId)).size).toBe(0);

    // The records are as immutable as the versions.
    await expect(sql`update version_references set name = 'x'`.execute(db)).rejects.toThrow(/immutable/);
    await expect(sql`delete from version_references`.execute(db)).rejects.toThrow(/immutable/);

    // A is issued at revision B with a changed value: B's latest version now has a superseded input.
    const revAB = await issue(a, RIGIDITY('230 MeV'));
    const newBrho = definition((await getVersion(db, a.id, revAB.versionNumber))!.results, 'Brho');
    expect(newBrho.value!.number).not.toBe(oldBrho.value!.number);
    const flags = await supersededInputs(db, b.id);
    expect(flags).toEqual([
      {
        sheetId: a.id,
        sheet: 'TPT2-CALC-0001',
        sheetNumber: 1,
        title: 'Gantry dipole rigidity',
        revision: 'A',
        status: 'superseded',
        withdrawnReason: null,
        versionNumber: revAA.versionNumber,
        currentRevision: 'B',
        currentVersionNumber: revAB.versionNumber,
        names: [
          {
            name: 'Brho',
            cited: { text: oldBrho.value!.text, number: oldBrho.value!.number, unit: oldBrho.value!.unit, error: null },
            current: {
              text: newBrho.value!.text,
              number: newBrho.value!.number,
              unit: newBrho.value!.unit,
              error: null,
            },
            changed: true,
          },
        ],
        compareHref: `/projects/TPT2/sheets/1/compare?base=${revAA.versionNumber}&target=${revAB.versionNumber}`,
      },
    ]);
    // The register flags B's revision A; the sheet list flags B; C cites only B's current revision.
    const register = await revisionInputFlags(db, projectId);
    expect([...register.keys()]).toEqual([revBA.revisionId]);
    expect(register.get(revBA.revisionId)).toEqual([
      { sheet: 'TPT2-CALC-0001', sheetNumber: 1, revision: 'A', status: 'superseded', currentRevision: 'B' },
    ]);
    expect([...(await sheetInputFlags(db, projectId)).keys()]).toEqual([b.id]);
    expect(await staleRevisionCounts(db, [projectId])).toEqual(new Map([[projectId, 1]]));
    // The register's CSV names the superseded input on B's row only.
    const csvRows = registerCsv(await listRevisions(db, { projectId }), register)
      .trim()
      .split('\r\n');
    expect(csvRows[0].endsWith(',superseded_inputs')).toBe(true);
    expect(
      csvRows
        .filter((line) => line.endsWith(',TPT2-CALC-0001 rev. A (superseded by rev. B)'))
        .map((line) => line.split(',')[0]),
    ).toEqual(['TPT2-CALC-0002']);

    // Impact of A: B directly (through revision A), C through B's revision A.
    const impact = await sheetImpact(db, a.id);
    expect(impact.map((r) => [r.revision, r.status])).toEqual([
      ['B', 'current'],
      ['A', 'superseded'],
    ]);
    expect(impact[0].dependents).toEqual([]);
    expect(
      impact[1].dependents.map((d) => [
        d.depth,
        d.sheet,
        d.via.sheet,
        d.via.revision,
        d.versions,
        d.names,
        d.issuedAs.map((x) => x.revision),
        d.latestCitesVia,
        d.latestCitesSuperseded,
      ]),
    ).toEqual([
      [1, 'TPT2-CALC-0002', 'TPT2-CALC-0001', 'A', [revBA.versionNumber], ['Brho'], ['A'], true, true],
      [2, 'TPT2-CALC-0003', 'TPT2-CALC-0002', 'A', [2], ['I_max'], [], true, false],
    ]);

    // B saves a version citing A's current revision: the flag clears on the sheet; the register row of
    // B's revision A stays flagged, because that revision's own version cites the superseded one.
    await save(b, `${cite('TPT2-CALC-0001', 'B')}\nI_max = 400 A`);
    expect(await supersededInputs(db, b.id)).toEqual([]);
    expect(await supersededInputs(db, b.id, revBA.versionNumber)).toHaveLength(1);
    expect((await sheetInputFlags(db, projectId)).size).toBe(0);
    expect([...(await revisionInputFlags(db, projectId)).keys()]).toEqual([revBA.revisionId]);
    const after = await sheetImpact(db, a.id);
    expect(
      after[0].dependents.map((d) => [d.depth, d.sheet, d.versions, d.latestCitesVia, d.latestCitesSuperseded]),
    ).toEqual([[1, 'TPT2-CALC-0002', [revBA.versionNumber + 1], true, false]]);
    expect(after[1].dependents.map((d) => [d.depth, d.sheet, d.latestCitesVia])).toEqual([
      [1, 'TPT2-CALC-0002', false],
      [2, 'TPT2-CALC-0003', true],
    ]);
  });

  it('refuses to issue a version whose cited revision was superseded after its approval', async () => {
    const db = testDb();
    const a = await newSheet('Gantry dipole rigidity');
    const b = await newSheet('Dipole power supply');
    await issue(a, RIGIDITY('250 MeV'));
    // B cites A rev. A and is approved; then A is issued at rev. B before B is issued.
    const saved = await save(b, `${cite('TPT2-CALC-0001', 'A')}\nI_max = 400 A`);
    const { id } = await submitForCheck(db, people.author, b, {
      versionNumber: saved.number,
      checkerId: people.checker.userId,
      password: PASSWORD,
    });
    await saveCheckWork(db, people.checker, id, { verificationMethod: 'design_review' });
    await decide(db, people.checker, id, { action: 'sign', password: PASSWORD });
    await decide(db, people.approver, id, { action: 'approve', password: PASSWORD });
    await issue(a, RIGIDITY('230 MeV'));
    const refused = await requestIssue(db, people.controller, b, {
      versionNumber: saved.number,
      password: PASSWORD,
    }).then(
      () => null,
      (e: Error & { status?: number; details?: Record<string, unknown> }) => e,
    );
    expect(refused?.message).toMatch(/cites TPT2-CALC-0001 rev\. A \(superseded by rev\. B\); revise the sheet/);
    expect(await db.selectFrom('issue_jobs').select('id').where('sheet_id', '=', b.id).execute()).toEqual([]);
  });

  it('flags a withdrawn input, with no current revision to compare with', async () => {
    const db = testDb();
    const a = await newSheet('Gantry dipole rigidity');
    const b = await newSheet('Dipole power supply');
    const revAA = await issue(a, RIGIDITY('250 MeV'));
    await save(b, cite('TPT2-CALC-0001', 'A'));
    await withdrawRevision(db, people.controller, revAA.revisionId, 'wrong magnet');
    const [flag] = await supersededInputs(db, b.id);
    expect(flag).toMatchObject({
      revision: 'A',
      status: 'withdrawn',
      withdrawnReason: 'wrong magnet',
      currentRevision: null,
      compareHref: null,
    });
    expect(flag.names[0]).toMatchObject({ name: 'Brho', current: null, changed: true });
  });
});
