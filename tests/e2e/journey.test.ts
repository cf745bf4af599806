// The whole job in one browser journey, each person in their own browser: an originator creates a
// sheet and writes relativistic calculations with units in the editor, saves versions and submits
// one; the checker comments on a cell and returns it; the originator answers, fixes and resubmits;
// the checker signs as checked; an approver approves; document control issues revision A; a visitor
// who is not signed in verifies the downloaded PDF. Screenshots of every main screen are saved, and
// every step fails on a console error or a failed request.
import { execFileSync } from 'node:child_process';
import path from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { resetDatabase, testDb } from '../support/database';
import {
  closeBrowser,
  openBrowser,
  SCREENSHOT_DIR,
  startApp,
  submitSignIn,
  type BrowserSession,
  type RunningApp,
} from './harness';

let app: RunningApp;
const sessions: BrowserSession[] = [];

async function signedIn(email: string): Promise<BrowserSession> {
  const session = await openBrowser();
  sessions.push(session);
  await submitSignIn(session.page, app.baseUrl, email, DEMO_PASSWORD);
  await session.page.waitForURL(`${app.baseUrl}/projects`);
  return session;
}

beforeAll(async () => {
  await resetDatabase();
  await seedDemo(testDb());
  app = await startApp();
});

afterAll(async () => {
  for (const s of sessions) await s.close();
  await closeBrowser();
  await app?.stop();
});

it('goes from a new sheet to a verified issued revision', async () => {
  const originator = await signedIn('originator@demo.test');
  const checker = await signedIn('checker@demo.test');
  const approver = await signedIn('approver@demo.test');
  const controller = await signedIn('controller@demo.test');

  // ── The originator creates the sheet and writes it in the editor.
  let page = originator.page;
  await page.goto(`${app.baseUrl}/projects/TPT2`);
  await page.getByText('New sheet').click();
  await page.getByLabel('Title', { exact: true }).fill('Muon decay length in the gantry 2 beam dump line');
  await page.getByLabel('Objective').fill('Mean decay length of muons produced at the degrader (demo).');
  await page.getByRole('button', { name: 'Create the sheet' }).click();
  await page.waitForURL(`${app.baseUrl}/projects/TPT2/sheets/4`);
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/4/edit`);
  // The sheet starts empty: its first cell, a note, comes from "Add to the sheet…".
  await page.getByRole('button', { name: 'Add to the sheet' }).click();
  await page.getByRole('menuitem', { name: 'Note' }).click();
  // Hostile Markdown (OWASP XSS filter evasion cheat sheet classes): it must show as text, never run.
  await page
    .getByLabel('Cell 1 (note) source')
    .fill(
      'Muons from pion decay, momentum $p_\\mu$; mean decay length $\\beta\\gamma c\\tau$. <img src=x onerror="window.__xss=1"> <script>window.__xss=2</script> [link](javascript:window.__xss=3)',
    );
  await page.getByRole('button', { name: 'Insert below cell 1' }).click();
  await page.getByRole('menuitem', { name: 'Calculation step' }).click();
  await page
    .getByLabel('Cell 2 (calculation) source')
    .fill('p_mu = 150 MeV / c\nL_dec = decayLength(p_mu, m_mu, 2.1969811 us) to m\nL_dec < 1000 m');
  // βγcτ = (p/mc)·cτ with m_μc² = 105.658 375 5 MeV (CODATA 2022) and τ_μ = 2.196 981 1 µs (PDG RPP):
  // p/mc = 1.419 67, cτ = 658.638 m, so L = 935.05 m (arithmetic from those two sources).
  await page
    .getByRole('article', { name: 'Cell 2 (calculation)' })
    .getByText(/935\.0\d*\s?m/)
    .first()
    .waitFor();
  await page.getByRole('article', { name: 'Cell 2 (calculation)' }).getByText('Pass').waitFor();
  await page.getByLabel('What changed').fill('Decay length at 150 MeV/c');
  await page.getByRole('button', { name: 'Save version' }).click();
  await page.getByRole('status').filter({ hasText: 'Saved as version 2.' }).waitFor();
  await originator.screenshot('journey-editor');
  expect(originator.problems).toEqual([]);

  // ── Submits version 2 to the demo checker, signing it as prepared.
  const submit = async (version: number) => {
    await page.goto(`${app.baseUrl}/projects/TPT2/sheets/4`);
    const form = page.getByRole('region', { name: 'Submit for check' });
    await expect(form.getByLabel('Version').inputValue()).resolves.toBe(String(version));
    await form.getByLabel('Checker').selectOption({ label: 'Demo Checker' });
    await form.getByLabel('Your password (signs as prepared)').fill(DEMO_PASSWORD);
    await form.getByRole('button', { name: 'Submit for check' }).click();
    await page
      .getByRole('region', { name: 'Status' })
      .getByText(`Version ${version} is in check by Demo Checker.`)
      .waitFor();
  };
  await submit(2);

  // ── The checker comments on the calculation cell and returns it.
  page = checker.page;
  await page.goto(`${app.baseUrl}/checks`);
  await page.getByRole('link', { name: 'Open the check of TPT2-CALC-0004 version 2' }).click();
  let cell = page.getByRole('article', { name: /^Cell 2 / });
  await cell.getByRole('button', { name: 'Comment on this cell' }).click();
  await cell
    .getByLabel('Comment', { exact: true })
    .fill(
      'Use the momentum at the dump entrance, 140 MeV/c, per the beam dump note. <img src=x onerror="window.__xss=4">',
    );
  await cell.getByRole('button', { name: 'Add the comment' }).click();
  await cell.getByText(/Open thread/).waitFor();
  await page.getByLabel('Reason for returning').fill('Momentum at the wrong place.');
  await page.getByRole('button', { name: 'Return with comments' }).click();
  await page.getByRole('status').filter({ hasText: 'Returned to the originator with comments.' }).waitFor();
  await checker.screenshot('journey-returned');
  expect(await page.evaluate(() => (window as unknown as { __xss?: number }).__xss)).toBeUndefined();
  expect(checker.problems).toEqual([]);

  // ── The originator answers, fixes the cell in the editor and resubmits.
  page = originator.page;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/4`);
  await page.getByRole('region', { name: 'Status' }).getByRole('link', { name: 'Read the comments' }).click();
  cell = page.getByRole('article', { name: /^Cell 2 / });
  await cell.getByRole('button', { name: 'Reply' }).click();
  await cell.getByLabel('Your reply').fill('Changed to 140 MeV/c.');
  await cell.getByRole('button', { name: 'Send the reply' }).click();
  await cell.getByText('Changed to 140 MeV/c.').waitFor();
  expect(await page.evaluate(() => (window as unknown as { __xss?: number }).__xss)).toBeUndefined();
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/4/edit`);
  await page
    .getByLabel('Cell 2 (calculation) source')
    .fill('p_mu = 140 MeV / c\nL_dec = decayLength(p_mu, m_mu, 2.1969811 us) to m\nL_dec < 1000 m');
  // 140/105.658 375 5 × 658.638 m = 872.71 m (same sources).
  await page
    .getByRole('article', { name: 'Cell 2 (calculation)' })
    .getByText(/872\.7\d*\s?m/)
    .first()
    .waitFor();
  await page.getByLabel('What changed').fill('Momentum at the dump entrance');
  await page.getByRole('button', { name: 'Save version' }).click();
  await page.getByRole('status').filter({ hasText: 'Saved as version 3.' }).waitFor();
  await submit(3);
  expect(originator.problems).toEqual([]);

  // ── The checker resolves the thread, records the method and signs.
  page = checker.page;
  await page.goto(`${app.baseUrl}/checks`);
  await page.getByRole('link', { name: 'Open the check of TPT2-CALC-0004 version 3' }).click();
  cell = page.getByRole('article', { name: /^Cell 2 / });
  await cell.getByText('Changed to 140 MeV/c.').waitFor();
  await cell.getByRole('button', { name: 'Resolve' }).click();
  await cell.getByText(/Resolved thread/).waitFor();
  await page.getByRole('radio', { name: 'Design review' }).check();
  await page.getByRole('status').filter({ hasText: 'Verification method recorded: Design review.' }).waitFor();
  const sign = page.getByRole('form', { name: 'Sign as checked' });
  await sign.getByLabel('Your password (signs as checked)').fill(DEMO_PASSWORD);
  await sign.getByRole('button', { name: 'Sign as checked' }).click();
  await page.getByRole('status').filter({ hasText: 'Signed as checked. The version now awaits approval.' }).waitFor();
  await checker.screenshot('journey-check-view');
  expect(checker.problems).toEqual([]);

  // ── The approver approves.
  page = approver.page;
  await page.goto(`${app.baseUrl}/approvals`);
  await page.getByRole('link', { name: 'Open the check of TPT2-CALC-0004 version 3' }).click();
  const approve = page.getByRole('form', { name: 'Approve' });
  await approve.getByLabel('Your password (signs as approved)').fill(DEMO_PASSWORD);
  await approve.getByRole('button', { name: 'Approve' }).click();
  await page.getByRole('status').filter({ hasText: 'Approved.' }).waitFor();
  await approver.screenshot('journey-approved');
  expect(approver.problems).toEqual([]);

  // ── Document control issues revision A and downloads it.
  page = controller.page;
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/4`);
  await page.getByLabel('Your password (signs as issued)').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Issue as revision A' }).click();
  await page.getByRole('status').filter({ hasText: 'Issued.' }).waitFor({ timeout: 90_000 });
  const [download] = await Promise.all([
    page.waitForEvent('download'),
    page.getByRole('link', { name: 'Download the signed PDF' }).click(),
  ]);
  const pdf = path.join(SCREENSHOT_DIR, 'journey-TPT2-CALC-0004-rev-A.pdf');
  await download.saveAs(pdf);
  const text = execFileSync('pdftotext', ['-layout', pdf, '-'], { encoding: 'utf8' });
  expect(text).toMatch(/872\.7\d*\s*m/);
  for (const name of ['Demo Originator', 'Demo Checker', 'Demo Approver', 'Demo Document Controller'])
    expect(text).toContain(name);
  execFileSync('pdftoppm', [
    '-r',
    '70',
    '-png',
    '-f',
    '1',
    '-l',
    '2',
    pdf,
    path.join(SCREENSHOT_DIR, 'journey-pdf-page'),
  ]);
  await controller.screenshot('journey-issued');
  expect(controller.problems).toEqual([]);

  // ── A visitor who is not signed in verifies the downloaded file.
  const visitor = await openBrowser();
  sessions.push(visitor);
  page = visitor.page;
  await page.goto(`${app.baseUrl}/verify`);
  await page.getByLabel('The PDF you were given').setInputFiles(pdf);
  await page.getByRole('button', { name: 'Check the file' }).click();
  await page.getByRole('heading', { name: 'Authentic and current' }).waitFor();
  await page.getByText(/this is TPT2-CALC-0004 revision A/).waitFor();
  await visitor.screenshot('journey-verified');
  for (const s of [originator, checker, approver, controller]) {
    await s.page.goto(`${app.baseUrl}/projects/TPT2/sheets/4`);
    await s.page.getByRole('heading', { level: 1 }).waitFor();
    expect(await s.page.evaluate(() => (window as unknown as { __xss?: number }).__xss)).toBeUndefined();
  }
  expect(visitor.problems).toEqual([]);
}, 600_000);
