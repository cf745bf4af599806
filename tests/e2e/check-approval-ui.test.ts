// The independent check and approval as the three people do it in the browser, each in their own
// browser context: the originator submits a version (signing it "prepared"), the checker comments
// on a cell and returns it, the originator answers and submits again, the checker resolves the
// thread, records the method and signs "checked" (a wrong password first), the approver approves.
// Then a later version is checked against the approved one: changes first, results old → new.
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { resetDatabase, testDb } from '../support/database';
import { type BrowserSession, closeBrowser, openSignedIn, type RunningApp, startApp } from './harness';

let app: RunningApp;
let originator: BrowserSession;
let checker: BrowserSession;
let approver: BrowserSession;
let sheetId: string;

const signedIn = (email: string): Promise<BrowserSession> => openSignedIn(app.baseUrl, email, DEMO_PASSWORD);

/** Saves a new version of sheet 1 through the API with the originator's session, editing one cell. */
async function saveVersion(message: string, edit: (source: string) => string): Promise<number> {
  const latest = await originator.context.request.get(`${app.baseUrl}/api/sheets/${sheetId}`);
  const { version } = await latest.json();
  const content = {
    ...version.content,
    cells: version.content.cells.map((c: { id: string; source: string }) =>
      c.id === 'rigidity' ? { ...c, source: edit(c.source) } : c,
    ),
  };
  // With the session cookie, a change says where it comes from (Origin), as a browser's fetch does.
  const saved = await originator.context.request.post(`${app.baseUrl}/api/sheets/${sheetId}/versions`, {
    headers: { origin: app.baseUrl },
    data: { parentNumber: version.number, message, content },
  });
  expect(saved.status()).toBe(201);
  return (await saved.json()).number;
}

async function submitForCheck(versionNumber: number) {
  const { page } = originator;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/1`);
  const form = page.getByRole('region', { name: 'Submit for check' });
  await expect(form.getByLabel('Version').inputValue()).resolves.toBe(String(versionNumber));
  await form.getByLabel('Checker').selectOption({ label: 'Demo Checker' });
  await form.getByLabel('Your password (signs as prepared)').fill(DEMO_PASSWORD);
  return form;
}

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  const project = await testDb()
    .selectFrom('projects')
    .select('id')
    .where('code', '=', 'TPT2')
    .executeTakeFirstOrThrow();
  sheetId = (
    await testDb()
      .selectFrom('sheets')
      .select('id')
      .where('project_id', '=', project.id)
      .where('number', '=', 1)
      .executeTakeFirstOrThrow()
  ).id;
  // The demo originator also holds the checker role here, so the submit form has someone to refuse.
  const user = await testDb()
    .selectFrom('users')
    .select('id')
    .where('email', '=', 'originator@demo.test')
    .executeTakeFirstOrThrow();
  await testDb()
    .insertInto('project_members')
    .values({ project_id: project.id, user_id: user.id, role: 'checker', granted_by: null })
    .execute();
  app = await startApp();
  originator = await signedIn('originator@demo.test');
  checker = await signedIn('checker@demo.test');
  approver = await signedIn('approver@demo.test');
});

afterAll(async () => {
  await Promise.all([originator?.close(), checker?.close(), approver?.close()]);
  await closeBrowser();
  await app?.stop();
});

it('takes a version from submission through a return, a resubmission, the check and the approval', async () => {
  // The originator saves version 3 and submits it; they cannot pick themselves as the checker.
  expect(
    await saveVersion('Charge state stated', (s) =>
      s.replace('magneticRigidity(p_max, q_e)', 'magneticRigidity(p_max, 1 * q_e)'),
    ),
  ).toBe(3);
  let form = await submitForCheck(3);
  const self = form.getByRole('option', { name: 'Demo Originator (not eligible)' });
  expect(await self.isDisabled()).toBe(true);
  await form
    .getByText(/Demo Originator is not eligible: .*saved a version of it since the last approved one/)
    .waitFor();
  await originator.screenshot('submit-for-check');
  await form.getByRole('button', { name: 'Submit for check' }).click();
  await form
    .getByRole('status')
    .filter({ hasText: 'Version 3 is submitted to Demo Checker for check and signed as prepared.' })
    .waitFor();
  const status = originator.page.getByRole('region', { name: 'Status' });
  await status.getByText('In check', { exact: true }).waitFor();
  await status.getByText('Version 3 is in check by Demo Checker.').waitFor();
  expect(originator.problems).toEqual([]);

  // The checker finds it in "My checks", comments on a line of a cell and returns it.
  let page = checker.page;
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'My checks' }).click();
  await page.getByRole('heading', { level: 1, name: 'My checks' }).waitFor();
  const queue = page.getByRole('table', { name: 'Versions waiting for your check' });
  await queue.getByRole('row').filter({ hasText: 'TPT2-CALC-0001' }).getByText('safety-related').waitFor();
  await checker.screenshot('my-checks');
  await queue.getByRole('link', { name: 'Open the check of TPT2-CALC-0001 version 3' }).click();
  await page.getByText('Version 3, first check: the whole sheet').waitFor();
  await page.getByRole('note').filter({ hasText: 'Safety-related calculation' }).waitFor();
  let cell = page.getByRole('article', { name: /^Cell 2 \(rigidity\)/ });
  await cell.getByRole('button', { name: 'Comment on this cell' }).click();
  await cell
    .getByLabel('Statement line (optional)')
    .selectOption({ label: 'Line 3: Brho_max = magneticRigidity(p_max, 1 * q_e) to T*m' });
  await cell
    .getByLabel('Comment', { exact: true })
    .fill('Which ion species is assumed? Cite the charge state in the design inputs.');
  await cell.getByRole('button', { name: 'Add the comment' }).click();
  await cell.getByText('Open thread · Line 3').waitFor();
  await page.getByLabel('Reason for returning').fill('One open comment on the rigidity cell.');
  await page.getByRole('button', { name: 'Return with comments' }).click();
  await page.getByRole('status').filter({ hasText: 'Returned to the originator with comments.' }).waitFor();
  await page.getByText('Returned with comments: One open comment on the rigidity cell.').waitFor();
  expect(checker.problems).toEqual([]);

  // The originator reads the comments from the sheet page, answers, saves version 4 and submits it.
  page = originator.page;
  await page.reload();
  await status.getByText('Returned', { exact: true }).waitFor();
  await status.getByRole('link', { name: 'Read the comments' }).click();
  cell = page.getByRole('article', { name: /^Cell 2 \(rigidity\)/ });
  await cell.getByText('Which ion species is assumed?').waitFor();
  await cell.getByRole('button', { name: 'Reply' }).click();
  await cell.getByLabel('Your reply').fill('Protons, charge state 1; now in the cell comment.');
  await cell.getByRole('button', { name: 'Send the reply' }).click();
  await cell.getByText('Protons, charge state 1; now in the cell comment.').waitFor();
  expect(
    await saveVersion('Charge state in the comment', (s) => s.replace('to T*m', 'to T*m   # protons, charge state 1')),
  ).toBe(4);
  form = await submitForCheck(4);
  await form.getByRole('button', { name: 'Submit for check' }).click();
  await status.getByText('Version 4 is in check by Demo Checker.').waitFor();
  expect(originator.problems).toEqual([]);

  // The checker resolves the thread carried over, records the method and an alternate calculation,
  // and signs, first with a wrong password.
  page = checker.page;
  await page.goto(`${app.baseUrl}/checks`);
  await page.getByRole('link', { name: 'Open the check of TPT2-CALC-0001 version 4' }).click();
  // A re-check: what changed since the returned version 3 comes first (no version is approved yet).
  await page.getByText('Version 4, re-check after the return of version 3; no version is approved yet').waitFor();
  const sinceReturn = page.getByRole('region', { name: 'Changes since version 3, the version you returned' });
  await sinceReturn
    .getByRole('article', { name: 'Cell rigidity, changed since version 3' })
    .getByRole('insertion')
    .filter({ hasText: '# protons, charge state 1' })
    .waitFor();
  await page
    .getByRole('heading', { name: 'Since the last approved version: none is approved yet, so every cell is new' })
    .waitFor();
  cell = page.getByRole('article', { name: /^Cell 2 \(rigidity\)/ });
  await cell.getByText('Open thread · Line 3 · opened at the check of version 3').waitFor();
  await cell.getByText('Protons, charge state 1; now in the cell comment.').waitFor();
  await page
    .getByRole('region', { name: 'Decision' })
    .getByText('1 comment thread is still open; resolve every thread before signing as checked.')
    .waitFor();
  await cell.getByRole('button', { name: 'Resolve' }).click();
  await cell.getByText(/Resolved thread · Line 3 .* resolved by Demo Checker/).waitFor();
  await page.getByRole('radio', { name: 'Design review' }).check();
  await page.getByRole('status').filter({ hasText: 'Verification method recorded: Design review.' }).waitFor();
  await page.getByRole('button', { name: 'Add an alternate calculation cell' }).click();
  await page
    .getByLabel('Alternate cell 1 source')
    .fill(
      'gamma_alt = 1 + 250 MeV / (m_p * c^2)\np_alt = m_p * c * sqrt(gamma_alt^2 - 1)\nB_alt = p_alt / (q_e * 1.5 m) to T',
    );
  await page.getByLabel("Checker's notes").fill('Field recomputed from the Lorentz factor; agrees with B_max.');
  await page.getByRole('button', { name: 'Save and evaluate' }).click();
  // 250 MeV protons on a 1.5 m radius: B = Bρ/ρ = 2.432 13 T·m / 1.5 m = 1.621 42 T (PDG RPP "Kinematics", m_p from CODATA 2022).
  await page
    .getByRole('group', { name: 'Results of alternate cell 1' })
    .getByText(/1\.621\s?42\s?T/)
    .waitFor();
  const sign = page.getByRole('form', { name: 'Sign as checked' });
  await sign.getByText('Meaning of your signature: Checked').waitFor();
  await sign.getByLabel('Your password (signs as checked)').fill('not the password');
  await sign.getByRole('button', { name: 'Sign as checked' }).click();
  await page.getByRole('alert').filter({ hasText: 'The password is not correct; nothing was signed.' }).waitFor();
  await checker.screenshot('check-view');
  await sign.getByLabel('Your password (signs as checked)').fill(DEMO_PASSWORD);
  await sign.getByRole('button', { name: 'Sign as checked' }).click();
  await page.getByRole('status').filter({ hasText: 'Signed as checked. The version now awaits approval.' }).waitFor();
  await page.getByRole('list', { name: 'Signatures of version 4' }).getByText('Checked', { exact: true }).waitFor();
  // The refused signature (403) is the only HTTP error.
  expect(checker.problems.filter((p) => !/403/.test(p))).toEqual([]);
  checker.problems.length = 0;

  // The approver approves from "My approvals".
  page = approver.page;
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'My approvals' }).click();
  const approvals = page.getByRole('table', { name: 'Checked versions waiting for approval' });
  await approvals.getByRole('row').filter({ hasText: 'TPT2-CALC-0001' }).getByText('Yes', { exact: true }).waitFor();
  await approver.screenshot('my-approvals');
  await approvals.getByRole('link', { name: 'Open the check of TPT2-CALC-0001 version 4' }).click();
  const approve = page.getByRole('form', { name: 'Approve' });
  await approve.getByText('Meaning of your signature: Approved').waitFor();
  await approve.getByLabel('Your password (signs as approved)').fill(DEMO_PASSWORD);
  await approve.getByRole('button', { name: 'Approve' }).click();
  await page
    .getByRole('status')
    .filter({ hasText: 'Approved. Document control can now issue it as a revision.' })
    .waitFor();
  expect(approver.problems).toEqual([]);

  // The sheet is approved, with the signatures of version 4: prepared, checked, approved.
  page = originator.page;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/1`);
  await status.getByText('Approved', { exact: true }).waitFor();
  const signatures = page.getByRole('table', { name: 'Signatures of this sheet' });
  const v4 = signatures.getByRole('row').filter({ has: page.getByRole('cell', { name: '4', exact: true }) });
  expect(await v4.allInnerTexts()).toEqual([
    expect.stringMatching(/^Demo Originator\s+Prepared\s+\d{4}-\d\d-\d\d \d\d:\d\d UTC\s+4\s+[0-9a-f]{64}$/),
    expect.stringMatching(/^Demo Checker\s+Checked\s+\d{4}-\d\d-\d\d \d\d:\d\d UTC\s+4\s+[0-9a-f]{64}$/),
    expect.stringMatching(/^Demo Approver\s+Approved\s+\d{4}-\d\d-\d\d \d\d:\d\d UTC\s+4\s+[0-9a-f]{64}$/),
  ]);
  // Version 3's "prepared" stays on record.
  expect(await signatures.getByRole('row').count()).toBe(5);
  await page.getByRole('list', { name: 'Signatures of version 4' }).getByText('Approved', { exact: true }).waitFor();
  await originator.screenshot('sheet-signatures');
  expect(originator.problems).toEqual([]);
}, 300_000);

it('checks a later version against the approved one: changed cells first, unchanged folded, results old → new', async () => {
  expect(await saveVersion('Larger bending radius', (s) => s.replace('rho = 1.5 m', 'rho = 1.6 m'))).toBe(5);
  const form = await submitForCheck(5);
  await form.getByRole('button', { name: 'Submit for check' }).click();
  await originator.page
    .getByRole('region', { name: 'Status' })
    .getByText('Version 5 is in check by Demo Checker.')
    .waitFor();

  const { page } = checker;
  await page.goto(`${app.baseUrl}/checks`);
  await page.getByRole('link', { name: 'Open the check of TPT2-CALC-0001 version 5' }).click();
  await page.getByText('Version 5 against version 4, the last approved one').waitFor();
  const changes = page.getByRole('region', { name: 'Cells changed since version 4' });
  const cell = changes.getByRole('article', { name: 'Cell 2 (rigidity), changed' });
  expect(await cell.locator('del').innerText()).toContain('1.5');
  expect(await cell.locator('ins').innerText()).toContain('1.6');
  // B = 2.432 13 T·m / 1.6 m = 1.520 08 T; the relative change is 1.5/1.6 − 1 = −6.25 % (arithmetic).
  await cell.getByText(/Changed since version 4:\s*1\.621\s?42\s?T → 1\.520\s?08\s?T \(−6\.25 %\)/).waitFor();
  const folded = changes.locator('details').filter({ hasText: '2 unchanged cells' });
  expect(await folded.getAttribute('open')).toBeNull();
  expect(await page.getByRole('article', { name: 'Cell 1 (intro), unchanged' }).isVisible()).toBe(false);
  await folded.locator('summary').click();
  await page.getByRole('article', { name: 'Cell 1 (intro), unchanged' }).waitFor();
  await page.getByRole('article', { name: 'Cell 3 (lowest), unchanged' }).waitFor();
  await checker.screenshot('check-view-changes');
  expect(checker.problems).toEqual([]);
  expect(originator.problems).toEqual([]);
}, 120_000);
