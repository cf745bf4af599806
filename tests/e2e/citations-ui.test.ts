// Citations between sheets in the browser: sheet 2 cites the rigidity issued in sheet 1 revision A;
// sheet 1 is then issued at revision B with another value. The originator sees the superseded input
// on sheet 2 (values then and now) and the cited statement's source with its status; the register
// flags sheet 2's revision; sheet 1's impact page lists sheet 2; document control is refused when it
// tries to issue a version that still cites revision A; software impact lists what the engine touched.
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import type { Actor } from '../../lib/auth/actor';
import { requestIssue } from '../../lib/issue/request';
import { processIssueJob } from '../../lib/issue/job';
import { getVersion, saveVersion } from '../../lib/sheets/sheets';
import { storageConfig } from '../../lib/storage/config';
import { createObjectStore } from '../../lib/storage/object-store';
import { ENGINE_VERSION } from '../../lib/calc/version';
import { checkAndApprove, type SheetRef } from '../support/approved-sheet';
import { resetDatabase, testDb } from '../support/database';
import { actorByEmail } from '../support/people';
import { type BrowserSession, closeBrowser, openSignedIn, type RunningApp, startApp } from './harness';

let app: RunningApp;
let team: { author: Actor; checker: Actor; approver: Actor; controller: Actor };
let sheets: SheetRef[];

async function saveCells(
  sheet: SheetRef,
  message: string,
  edit: (
    cells: Array<{ id: string; kind: 'calc' | 'text'; source: string }>,
  ) => Array<{ id: string; kind: 'calc' | 'text'; source: string }>,
) {
  const latest = (await getVersion(testDb(), sheet.id))!;
  return (
    await saveVersion(testDb(), team.author, sheet, {
      parentNumber: latest.number,
      message,
      content: { ...latest.content, cells: edit(latest.content.cells) },
    })
  ).number;
}

async function approveAndIssue(sheet: SheetRef, versionNumber: number) {
  await checkAndApprove(testDb(), team, sheet, { versionNumber, password: DEMO_PASSWORD });
  const { jobId } = await requestIssue(testDb(), team.controller, sheet, { versionNumber, password: DEMO_PASSWORD });
  await processIssueJob(testDb(), createObjectStore(storageConfig()), jobId);
}

const signedIn = (email: string): Promise<BrowserSession> => openSignedIn(app.baseUrl, email, DEMO_PASSWORD);

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  const project = await testDb()
    .selectFrom('projects')
    .select('id')
    .where('code', '=', 'TPT2')
    .executeTakeFirstOrThrow();
  sheets = await testDb()
    .selectFrom('sheets')
    .select(['id', 'project_id', 'number', 'title'])
    .where('project_id', '=', project.id)
    .orderBy('number')
    .execute();
  const [author, checker, approver, controller] = await Promise.all(
    ['originator', 'checker', 'approver', 'controller'].map((r) => actorByEmail(testDb(), `${r}@demo.test`)),
  );
  team = { author, checker, approver, controller };
  // Sheet 1 revision A (250 MeV); sheet 2 cites its Brho_max and is issued as revision A.
  await approveAndIssue(sheets[0], 2); // version 2: the demo content
  const cited = await saveCells(sheets[1], 'Cite the dipole rigidity', (cells) => [
    ...cells,
    {
      id: 'cited',
      kind: 'calc',
      source: 'Brho_dip = fromRevision("TPT2-CALC-0001", "A", "Brho_max")\nI_set = Brho_dip / (2 m) * 1000 A/T to A',
    },
  ]);
  await approveAndIssue(sheets[1], cited);
  // Sheet 1 revision B at 230 MeV: sheet 2's input is superseded. Sheet 2 then gets an approved
  // version that still cites revision A.
  const lower = await saveCells(sheets[0], 'Highest energy 230 MeV', (cells) =>
    cells.map((c) =>
      c.id === 'rigidity' ? { ...c, source: c.source.replace('T_max = 250 MeV', 'T_max = 230 MeV') } : c,
    ),
  );
  await approveAndIssue(sheets[0], lower);
  const stale = await saveCells(sheets[1], 'Wording', (cells) =>
    cells.map((c) => (c.id === 'tof' ? { ...c, source: `${c.source}\n# timing read-out` } : c)),
  );
  await checkAndApprove(testDb(), team, sheets[1], { versionNumber: stale, password: DEMO_PASSWORD });
  app = await startApp();
});

afterAll(async () => {
  await closeBrowser();
  await app?.stop();
});

it('shows the originator the superseded input and the cited source with its status', async () => {
  const originator = await signedIn('originator@demo.test');
  const { page } = originator;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/2`);
  const caution = page.getByRole('complementary', { name: /Superseded input/ });
  await caution.waitFor();
  const text = await caution.innerText();
  expect(text).toMatch(/TPT2-CALC-0001/);
  expect(text).toMatch(/Brho_max/);
  // Bρ at 250 MeV then and at 230 MeV now (PDG kinematics, pc = √(T² + 2T·mc²): 2.432 13 and 2.321 82 T·m).
  expect(text).toMatch(/2\.432\s?13/);
  expect(text).toMatch(/2\.321\s?82/);
  await page
    .getByText(/from TPT2-CALC-0001 rev\. A, Brho_max/)
    .first()
    .waitFor();
  await page
    .getByText(/superseded by rev\. B/i)
    .first()
    .waitFor();
  await originator.screenshot('citations-superseded-input');
  expect(originator.problems).toEqual([]);

  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/1/impact`);
  await page.getByRole('heading', { name: 'Impact of TPT2-CALC-0001' }).waitFor();
  await page.getByRole('link', { name: 'TPT2-CALC-0002' }).first().waitFor();
  await originator.screenshot('citations-impact');

  await page.goto(`${app.baseUrl}/projects/TPT2/register`);
  // The page streams in after a loading state: wait for the register itself.
  await page
    .getByText(/superseded input/i)
    .first()
    .waitFor();
  const register = await page.locator('main').innerText();
  expect(register).toMatch(/TPT2-CALC-0002/);
  await originator.screenshot('citations-register');

  await page.goto(
    `${app.baseUrl}/software-impact?engineVersion=${encodeURIComponent(ENGINE_VERSION)}&function=magneticRigidity`,
  );
  await page.getByRole('heading', { name: 'What used it' }).waitFor();
  const impact = await page.locator('main').innerText();
  expect(impact).toMatch(/TPT2-CALC-0001/);
  expect(impact).not.toMatch(/TPT2-CALC-0003/);
  await originator.screenshot('software-impact');
  expect(originator.problems).toEqual([]);
  await originator.close();
});

it('refuses document control an issue of a version that cites a superseded revision', async () => {
  const controller = await signedIn('controller@demo.test');
  const { page } = controller;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/2`);
  await page.getByRole('heading', { level: 2, name: 'Issue a revision' }).waitFor();
  await page.getByLabel('Your password (signs as issued)').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Issue as revision B' }).click();
  await page
    .getByRole('alert')
    .filter({ hasText: /cites TPT2-CALC-0001 rev\. A \(superseded by rev\. B\)/ })
    .waitFor();
  await controller.screenshot('citations-issue-refused');
  // The refusal is the server's 409, which the panel shows; nothing else failed.
  expect(
    controller.problems.filter((p) => !/HTTP 409: .*\/revisions$/.test(p) && !/status of 409 \(Conflict\)/.test(p)),
  ).toEqual([]);
  await controller.close();
});
