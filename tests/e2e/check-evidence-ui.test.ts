// The checker's evidence as the checker and the approver see it: the alternate calculation compared
// with the sheet name by name against a tolerance the checker states (within/outside in words), and
// the work of a returned check carried over to the resubmission, marked "from the check of version
// N" until the checker edits or confirms it; signing waits for the confirmation; the approver reads
// the evidence and what was carried over before approving.
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { decide } from '../../lib/checks/decide';
import { saveCheckWork } from '../../lib/checks/work';
import { submitForCheck } from '../../lib/checks/submit';
import { getVersion, saveVersion } from '../../lib/sheets/sheets';
import { resetDatabase, testDb } from '../support/database';
import { actorByEmail } from '../support/people';
import { type BrowserSession, closeBrowser, openSignedIn, type RunningApp, startApp } from './harness';

let app: RunningApp;
let checker: BrowserSession;
let approver: BrowserSession;
let checkId: string;

const signedIn = (email: string): Promise<BrowserSession> => openSignedIn(app.baseUrl, email, DEMO_PASSWORD);

beforeAll(async () => {
  await resetDatabase();
  const db = testDb();
  await seedDemo(db);
  const project = await db.selectFrom('projects').select('id').where('code', '=', 'TPT2').executeTakeFirstOrThrow();
  const sheet = await db
    .selectFrom('sheets')
    .select(['id', 'project_id', 'number', 'title'])
    .where('project_id', '=', project.id)
    .where('number', '=', 1)
    .executeTakeFirstOrThrow();
  const originatorActor = await actorByEmail(db, 'originator@demo.test');
  const checkerActor = await actorByEmail(db, 'checker@demo.test');
  // The first check: the checker records an alternate calculation and a tolerance, then returns the version.
  // The demo content is version 2 (version 1 is the new sheet).
  const v1 = (await getVersion(db, sheet.id))!;
  const first = await submitForCheck(db, originatorActor, sheet, {
    versionNumber: v1.number,
    checkerId: checkerActor.userId,
    password: DEMO_PASSWORD,
  });
  await saveCheckWork(db, checkerActor, first.id, {
    verificationMethod: 'alternate_calculation',
    checkerNotes: 'Field recomputed from the total energy.',
    // T_max read as 250.1 MeV from the beam specification table: 4 × 10⁻⁴ from the sheet's 250 MeV (arithmetic).
    alternateCells: [
      {
        id: 'alt-1',
        kind: 'calc',
        source:
          'T_max = 250.1 MeV\nE_tot = 250 MeV + m_p * c^2\np_max = sqrt(E_tot^2 - (m_p * c^2)^2) / c\nB_max = p_max / (q_e * 1.5 m) to T',
      },
    ],
    tolerance: '0.01 %',
  });
  await decide(db, checkerActor, first.id, { action: 'return', reason: 'Cite the source of the bending radius.' });
  // The originator saves the next version and submits it again.
  const content = {
    ...v1.content,
    cells: v1.content.cells.map((c) =>
      c.id === 'rigidity'
        ? { ...c, source: c.source.replace('# dipole bending radius', '# dipole bending radius, magnet drawing D-12') }
        : c,
    ),
  };
  const v2 = await saveVersion(db, originatorActor, sheet, {
    parentNumber: v1.number,
    message: 'Radius source cited',
    content,
  });
  checkId = (
    await submitForCheck(db, originatorActor, sheet, {
      versionNumber: v2.number,
      checkerId: checkerActor.userId,
      password: DEMO_PASSWORD,
    })
  ).id;
  app = await startApp();
  checker = await signedIn('checker@demo.test');
  approver = await signedIn('approver@demo.test');
}, 600_000);

afterAll(async () => {
  await Promise.all([checker?.close(), approver?.close()]);
  await closeBrowser();
  await app?.stop();
});

it("compares the alternate calculation, carries the returned check's work over, and shows both to the approver", async () => {
  let page = checker.page;
  await page.goto(`${app.baseUrl}/checks/${checkId}`);
  const work = page.getByRole('region', { name: "The checker's work" });
  // Carried over, visibly, field by field, and not yet confirmed.
  await work
    .getByRole('note', { name: 'Carried over' })
    .getByText(/From the check of version 2:/)
    .waitFor();
  await work.getByText('Not yet confirmed by the checker for this version.').waitFor();
  expect(await work.getByText('from the check of version 2', { exact: true }).count()).toBe(4);
  expect(await work.getByLabel("Checker's notes").inputValue()).toBe('Field recomputed from the total energy.');
  expect(await work.getByLabel('Tolerance of the comparison (relative)').inputValue()).toBe('0.01 %');
  // The comparison, in words: 250.1 MeV against 250 MeV is 4 × 10⁻⁴ (arithmetic), outside 0.01 %; the
  // momentum and field recomputed from E² = p²c² + m²c⁴ agree with the library to rounding (PDG RPP "Kinematics").
  const table = work.getByRole('table', { name: 'Alternate calculation compared with the sheet' });
  const row = (name: string) =>
    table.getByRole('row').filter({ has: page.getByRole('rowheader', { name, exact: true }) });
  await row('T_max').getByText('Outside the tolerance of 0.01 %').waitFor();
  expect(await row('T_max').getByRole('cell').nth(2).innerText()).toBe('4 × 10⁻⁴');
  await row('p_max').getByText('Within the tolerance of 0.01 %').waitFor();
  await row('B_max').getByText('Within the tolerance of 0.01 %').waitFor();
  await work.getByText('1 of 3 shared names is not within the tolerance.').waitFor();
  await checker.screenshot('check-evidence-carried');

  // Signing waits for the confirmation of what is carried over.
  const sign = page.getByRole('form', { name: 'Sign as checked' });
  await sign.getByLabel('Your password (signs as checked)').fill(DEMO_PASSWORD);
  await sign.getByRole('button', { name: 'Sign as checked' }).click();
  await page
    .getByRole('alert')
    .filter({ hasText: 'still as carried over from the check of version 2; confirm or edit them before signing.' })
    .waitFor();

  // The checker states a looser tolerance (their own edit now) and confirms the rest.
  await work.getByLabel('Tolerance of the comparison (relative)').fill('0.1 %');
  await work.getByRole('button', { name: 'Save and evaluate' }).click();
  await row('T_max').getByText('Within the tolerance of 0.1 %').waitFor();
  expect(await work.getByText('from the check of version 2', { exact: true }).count()).toBe(3);
  await work.getByRole('button', { name: 'Confirm the work carried over from version 2' }).click();
  await work.getByText(/Confirmed for this version by Demo Checker on \d{4}-\d\d-\d\d \d\d:\d\d UTC\./).waitFor();
  await sign.getByLabel('Your password (signs as checked)').fill(DEMO_PASSWORD);
  await sign.getByRole('button', { name: 'Sign as checked' }).click();
  await page.getByRole('status').filter({ hasText: 'Signed as checked. The version now awaits approval.' }).waitFor();
  await checker.screenshot('check-evidence-checked');
  // The refused signature (409) is the only HTTP error.
  expect(checker.problems.filter((p) => !/409/.test(p))).toEqual([]);

  // The approver reads the evidence beside the decision, and the comparison read-only.
  page = approver.page;
  await page.goto(`${app.baseUrl}/approvals`);
  await page.getByRole('link', { name: 'Open the check of TPT2-CALC-0001 version 3' }).click();
  const evidence = page.getByRole('group', { name: "The checker's evidence" });
  await evidence.getByText('Verification method: Alternate calculation').waitFor();
  await evidence.getByText(/3 of 3 shared names within 0\.1 %/).waitFor();
  await evidence
    .getByText(
      "Carried over from the check of version 2: verification method, checker's notes and alternate calculation; confirmed by Demo Checker.",
    )
    .waitFor();
  const readOnly = page.getByRole('region', { name: "The checker's work" });
  await readOnly
    .getByRole('note', { name: 'Carried over' })
    .getByText(/Confirmed for this version by Demo Checker/)
    .waitFor();
  expect(await readOnly.getByRole('textbox').count()).toBe(0);
  await readOnly
    .getByRole('table', { name: 'Alternate calculation compared with the sheet' })
    .getByText('Within the tolerance of 0.1 %')
    .first()
    .waitFor();
  await approver.screenshot('check-evidence-approver');
  const approve = page.getByRole('form', { name: 'Approve' });
  await approve.getByLabel('Your password (signs as approved)').fill(DEMO_PASSWORD);
  await approve.getByRole('button', { name: 'Approve' }).click();
  await page.getByRole('status').filter({ hasText: 'Approved.' }).waitFor();
  expect(approver.problems).toEqual([]);
}, 300_000);
