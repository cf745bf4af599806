// Starting a sheet from another (lib/sheets/start-from.ts): only from an approved version or the
// latest version of a starter, only from a project the person is a member of; the copy is a new
// draft whose version 2 carries the source's content and attachments under the new title, and the
// sheet records the exact version it came from, which the database keeps unchanged.
import { sql } from 'kysely';
import { expect, it } from 'vitest';
import { listAttachments, uploadAttachment } from '../../lib/attachments/attachments';
import type { SheetResult } from '../../lib/calc/types';
import { sheetWorkflow } from '../../lib/checks/queries';
import { getVersion, saveVersion } from '../../lib/sheets/sheets';
import { sheetOrigin, startCandidates, startSheetFrom } from '../../lib/sheets/start-from';
import { voidSheet } from '../../lib/sheets/void';
import { storageConfig } from '../../lib/storage/config';
import { createObjectStore } from '../../lib/storage/object-store';
import { approvedSheet, makeSheet } from '../support/approved-sheet';
import { testDb } from '../support/database';
import { makeProject, makeUser } from '../support/people';
import { refusal } from '../support/refusal';

const CSV = 'energy [MeV], field [T]\n70, 0.4\n250, 1.3\n';

it('starts a draft from an approved version: content and attachments copied, origin recorded, nothing of the checks carried', async () => {
  const db = testDb();
  const w = await approvedSheet(db);
  const project = { id: w.projectId, code: 'TPT2' };
  // Version 3 cites a CSV table and is approved; version 4, a later draft, is not.
  const csv = await uploadAttachment(db, createObjectStore(storageConfig()), w.author, w.sheet, {
    name: 'energy-scan.csv',
    type: 'text/csv',
    bytes: new TextEncoder().encode(CSV),
  });
  const v2 = (await getVersion(db, w.sheet.id))!;
  const v3 = await saveVersion(db, w.author, w.sheet, {
    parentNumber: 2,
    message: 'scan',
    content: {
      ...v2.content,
      attachments: [{ name: csv.name, mediaType: csv.mediaType, size: csv.size, sha256: csv.sha256 }],
      cells: [...v2.content.cells, { id: 'c2', kind: 'calc', source: 'T_top = max(energy_scan.energy)' }],
    },
  });
  const { checkAndApprove } = await import('../support/approved-sheet');
  await checkAndApprove(db, w, w.sheet, { versionNumber: v3.number });
  await saveVersion(db, w.author, w.sheet, {
    parentNumber: 3,
    message: 'draft',
    content: { ...(await getVersion(db, w.sheet.id, 3))!.content, title: 'Draft title' },
  });

  const candidates = await startCandidates(db, w.author);
  expect(candidates.map((c) => [c.code, c.version, c.kind])).toEqual([['TPT2-CALC-0001', 3, 'approved']]);
  expect(
    await refusal(startSheetFrom(db, w.author, project, { sheetId: w.sheet.id, version: 4, title: 'From a draft' })),
  ).toMatchObject({ code: 'conflict', message: expect.stringMatching(/Version 4 of TPT2-CALC-0001 is not approved/) });

  const source = (await getVersion(db, w.sheet.id, 3))!;
  const made = await startSheetFrom(db, w.author, project, {
    sheetId: w.sheet.id,
    version: 3,
    title: 'Time of flight, second gantry',
  });
  expect(made).toMatchObject({ code: 'TPT2-CALC-0002', version: 2 });
  const copy = (await getVersion(db, made.id, 2))!;
  expect(copy.content).toEqual({ ...source.content, title: 'Time of flight, second gantry' });
  expect(copy.message).toBe(`Started from TPT2-CALC-0001 version 3 (approved; SHA-256 ${source.sha256.slice(0, 12)}…)`);
  // The copied table feeds the same cell: 250 MeV is the largest energy of the table.
  expect((copy.results as SheetResult).cells[1].statements[0].value).toMatchObject({ number: 250, unit: 'MeV' });
  expect((await listAttachments(db, made.id)).map((a) => [a.name, a.sha256])).toEqual([[csv.name, csv.sha256]]);
  expect(await sheetOrigin(db, made.id)).toEqual({
    code: 'TPT2-CALC-0001',
    projectCode: 'TPT2',
    number: 1,
    version: 3,
    sha256: source.sha256,
  });
  // A new draft: no check, no signature of the source's.
  const flow = await sheetWorkflow(db, made.id);
  expect([flow.status, flow.checks.length, flow.signatures.length]).toEqual(['draft', 0, 0]);
  const audit = await db
    .selectFrom('audit_events')
    .select(['action', 'new_value'])
    .where('object_id', '=', made.id)
    .where('action', 'in', ['sheet.create', 'attachment.copy'])
    .orderBy('id')
    .execute();
  expect(audit.map((a) => a.action)).toEqual(['sheet.create', 'attachment.copy']);
  expect(audit[0].new_value).toMatchObject({
    startedFrom: { sheet: 'TPT2-CALC-0001', version: 3, sha256: source.sha256 },
  });
  // Where a sheet came from never changes, even by direct SQL.
  await expect(sql`update sheets set started_from_version_id = null where id = ${made.id}`.execute(db)).rejects.toThrow(
    /where a sheet was started from never changes/,
  );
});

it('offers starters by their latest version, and refuses a non-member, a void sheet and an unknown version', async () => {
  const db = testDb();
  const w = await approvedSheet(db);
  const project = { id: w.projectId, code: 'TPT2' };
  const starter = await makeSheet(db, w.author, project, { title: 'Starter: rigidity' });
  await sql`update sheets set starter = true where id = ${starter.id}`.execute(db);
  const candidates = await startCandidates(db, w.author);
  expect(candidates.map((c) => [c.code, c.version, c.kind])).toEqual([
    ['TPT2-CALC-0002', 1, 'starter'],
    ['TPT2-CALC-0001', 2, 'approved'],
  ]);
  const fromStarter = await startSheetFrom(db, w.author, project, {
    sheetId: starter.id,
    version: 1,
    title: 'My rigidity sheet',
  });
  expect((await getVersion(db, fromStarter.id, 2))!.message).toMatch(
    /^Started from TPT2-CALC-0002 version 1 \(starter; SHA-256 /,
  );

  // Someone outside the source's project sees neither the candidates nor the sheet.
  const outsider = await makeUser(db, 'outsider@example.test');
  const elsewhere = await makeProject(db, 'ELSE', [[outsider, 'originator']]);
  expect(await startCandidates(db, outsider)).toEqual([]);
  expect(
    await refusal(
      startSheetFrom(db, outsider, { id: elsewhere, code: 'ELSE' }, { sheetId: w.sheet.id, version: 2, title: 'x' }),
    ),
  ).toMatchObject({ code: 'not_found' });
  expect(
    await refusal(startSheetFrom(db, w.author, project, { sheetId: w.sheet.id, version: 9, title: 'x' })),
  ).toMatchObject({ code: 'not_found' });
  // Nor does an administrator without a role in the source's project.
  const admin = await makeUser(db, 'admin@example.test', { admin: true });
  const adminProject = await makeProject(db, 'ADMN', [[admin, 'originator']]);
  expect(await startCandidates(db, admin)).toEqual([]);
  expect(
    await refusal(
      startSheetFrom(db, admin, { id: adminProject, code: 'ADMN' }, { sheetId: w.sheet.id, version: 2, title: 'x' }),
    ),
  ).toMatchObject({ code: 'not_found' });

  await voidSheet(db, w.author, ['originator'], starter.id, { reason: 'replaced' });
  expect((await startCandidates(db, w.author)).map((c) => c.code)).toEqual(['TPT2-CALC-0001']);
  expect(
    await refusal(startSheetFrom(db, w.author, project, { sheetId: starter.id, version: 1, title: 'x' })),
  ).toMatchObject({ code: 'conflict', message: 'TPT2-CALC-0002 is void; a new sheet cannot be started from it.' });
});
