// Nothing is signed on a broken sheet unacknowledged, as people see it: the originator submits a
// version with an evaluation error and a design input whose record value (0.16 GeV) differs from
// the 150 MeV the cell uses; the form lists each item with a text field before the first attempt
// and cannot be sent with one empty (the server refuses it too: tests/checks/acknowledgements.test.ts);
// the originator writes an acknowledgement for each and submits; the checker's view shows them,
// and the design inputs beside the values the engine used.
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { getVersion, saveVersion } from '../../lib/sheets/sheets';
import { resetDatabase, testDb } from '../support/database';
import { actorByEmail } from '../support/people';
import { type BrowserSession, closeBrowser, openSignedIn, type RunningApp, startApp } from './harness';

let app: RunningApp;
let originator: BrowserSession;
let checker: BrowserSession;

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
    .where('number', '=', 2)
    .executeTakeFirstOrThrow();
  const me = await actorByEmail(db, 'originator@demo.test');
  // The demo content is version 2 (version 1 is the new sheet); the originator saves version 3.
  const v1 = (await getVersion(db, sheet.id))!;
  await saveVersion(db, me, sheet, {
    parentNumber: v1.number,
    message: 'Linked design inputs; a draft line',
    content: {
      ...v1.content,
      record: {
        ...v1.content.record,
        inputs: [
          { ...v1.content.record.inputs[0], value: '12.50 m', cell: 'd_bpm' },
          {
            name: 'Proton kinetic energy',
            value: '0.16 GeV',
            source: 'TPT2 beam specification (demo)',
            sourceRevision: 'B',
            cell: 'T_beam',
          },
        ],
      },
      cells: v1.content.cells.map((c) =>
        c.id === 'tof' ? { ...c, source: `${c.source}\nL_total = d_bpm + t_flight` } : c,
      ),
    },
  });
  app = await startApp();
  originator = await signedIn('originator@demo.test');
  checker = await signedIn('checker@demo.test');
}, 600_000);

afterAll(async () => {
  await Promise.all([originator?.close(), checker?.close()]);
  await closeBrowser();
  await app?.stop();
});

it('asks the originator to acknowledge each item, then shows the acknowledgements to the checker', async () => {
  const { page } = originator;
  page.setDefaultTimeout(15_000);
  checker.page.setDefaultTimeout(15_000);
  await page.goto(`${app.baseUrl}/projects/TPT2/sheets/2`);
  // The sheet page shows the design inputs against the values used: one matches, one does not.
  await page.getByText(/feeds d_bpm; value used: 12\.5/).waitFor();
  await page
    .getByText(/Error: feeds T_beam, does not match: the record gives 0\.16 GeV, the sheet uses 150 MeV/)
    .waitFor();
  const form = page.getByRole('region', { name: 'Submit for check' });
  await form.getByLabel('Checker').selectOption({ label: 'Demo Checker' });
  // The form lists what needs acknowledging before the first attempt; the browser will not send it with an empty one.
  const asked = form.getByRole('group', { name: /Acknowledge in writing before submitting \(2\)/ });
  await asked.waitFor();
  await form.getByLabel('Your password (signs as prepared)').fill(DEMO_PASSWORD);
  await form.getByRole('button', { name: 'Submit for check' }).click();
  expect(
    await asked
      .getByRole('textbox')
      .first()
      .evaluate((e) => (e as HTMLTextAreaElement).validity.valueMissing),
  ).toBe(true);
  expect(await testDb().selectFrom('checks').select('id').where('version_number', '=', 3).execute()).toEqual([]);
  await originator.screenshot('submit-acknowledgements-asked');
  const error = asked.getByLabel(/Cell error: .*L_total = d_bpm \+ t_flight/);
  const input = asked.getByLabel(/Design input does not match the sheet: .*Proton kinetic energy/);
  await error.fill('The total is a draft line; the checker may ignore it.');
  await input.fill(
    'The specification revision B value is 160 MeV; the sheet keeps 150 MeV until the change is approved.',
  );
  await form.getByLabel('Your password (signs as prepared)').fill(DEMO_PASSWORD);
  await form.getByRole('button', { name: 'Submit for check' }).click();
  await form.getByText(/Version 3 is submitted to Demo Checker for check and signed as prepared/).waitFor();
  expect(originator.problems).toEqual([]);

  const check = await testDb()
    .selectFrom('checks')
    .select('id')
    .where('version_number', '=', 3)
    .executeTakeFirstOrThrow();
  const view = checker.page;
  await view.goto(`${app.baseUrl}/checks/${check.id}`);
  const section = view.getByRole('region', { name: /Acknowledged by Demo Originator on submission \(2\)/ });
  await section.waitFor();
  await section.getByText('The total is a draft line; the checker may ignore it.').waitFor();
  await section.getByText(/the sheet keeps 150 MeV until the change is approved/).waitFor();
  await section.getByRole('cell', { name: /Error: does not match: the record gives 0\.16 GeV/ }).waitFor();
  await section.getByRole('cell', { name: 'matches' }).waitFor();
  await checker.screenshot('submit-acknowledgements-checker');
  expect(checker.problems).toEqual([]);
}, 120_000);
