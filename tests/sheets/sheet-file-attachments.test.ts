// A sheet file can carry the attachments its version cites, each with its SHA-256; an import checks
// the bytes against the recorded size and hash, stores them on the new sheet and cites them in the
// imported version, or refuses the whole file and creates nothing. The confirmation (readSheetFile,
// importPreview) runs the same checks and says whether the file still hashes to the version it was
// exported from. Against the real database and the test object store.
import { createHash } from 'node:crypto';
import { expect, it } from 'vitest';
import { listAttachments, readAttachment, uploadAttachment } from '../../lib/attachments/attachments';
import type { SheetResult } from '../../lib/calc/types';
import { importPreview, importSheetFile, readSheetFile, sheetFileOf } from '../../lib/sheets/sheet-files';
import { createSheet, getVersion, saveVersion } from '../../lib/sheets/sheets';
import { storageConfig } from '../../lib/storage/config';
import { createObjectStore } from '../../lib/storage/object-store';
import { testDb } from '../support/database';
import { makeProject, makeUser } from '../support/people';
import { refusal } from '../support/refusal';

const store = () => createObjectStore(storageConfig());
const CSV = 'energy [MeV], field [T]\n70, 0.4\n150, 0.9\n250, 1.3\n';
// A PNG signature and an IHDR chunk start: enough for the content sniffing (lib/attachments/kinds.ts).
const PNG = new Uint8Array([
  0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52, 0, 0, 0, 1, 0, 0, 0, 1, 8, 2, 0,
  0, 0,
]);

/** A sheet whose version 2 cites a CSV table read by a cell and a PNG figure; its exported file, with the bytes. */
async function exported() {
  const db = testDb();
  const author = await makeUser(db, 'author@example.test');
  const projectId = await makeProject(db, 'BEAM', [[author, 'originator']]);
  const otherId = await makeProject(db, 'OTHR', [[author, 'originator']]);
  const project = { id: projectId, code: 'BEAM' };
  const created = await createSheet(db, author, project, {
    title: 'Rigidity over the energy scan',
    safetyRelated: true,
    objective: 'Dipole rigidity for each energy of the scan.',
  });
  const sheet = {
    id: created.id,
    project_id: projectId,
    number: created.number,
    title: 'Rigidity over the energy scan',
  };
  const csv = await uploadAttachment(db, store(), author, sheet, {
    name: 'energy-scan.csv',
    type: 'text/csv',
    bytes: new TextEncoder().encode(CSV),
  });
  const png = await uploadAttachment(db, store(), author, sheet, { name: 'layout.png', type: 'image/png', bytes: PNG });
  const v1 = (await getVersion(db, sheet.id))!;
  const refs = [csv, png].map((a) => ({ name: a.name, mediaType: a.mediaType, size: a.size, sha256: a.sha256 }));
  await saveVersion(db, author, sheet, {
    parentNumber: 1,
    message: 'Scan table',
    content: {
      ...v1.content,
      attachments: refs,
      cells: [
        {
          id: 'c1',
          kind: 'calc',
          source: 'Brho_max = max(magneticRigidity(momentumFromKinetic(energy_scan.energy, m_p), 1)) to T*m',
        },
      ],
    },
  });
  const version = (await getVersion(db, sheet.id, 2))!;
  const carried = new Map<string, Uint8Array>();
  for (const a of refs) carried.set(a.sha256, (await readAttachment(db, store(), sheet.id, a.sha256)).bytes);
  const file = sheetFileOf(version.content, { number: 'BEAM-CALC-0001', version: 2, sha256: version.sha256 }, carried);
  return { db, author, other: { id: otherId, code: 'OTHR' }, version, refs, file };
}

const brhoMax = (results: unknown) =>
  (results as SheetResult).cells[0].statements.find((s) => s.name === 'Brho_max')!.value!;

it('carries the attachments in the file and brings them back on import, SHA-256 verified, with the same results', async () => {
  const { db, author, other, version, refs, file } = await exported();
  expect(
    file.attachments.map((a) => [a.name, a.size, a.sha256, typeof (a as { contentBase64?: string }).contentBase64]),
  ).toEqual(refs.map((r) => [r.name, r.size, r.sha256, 'string']));
  const text = JSON.stringify(file);

  // The confirmation: what would be created, checked, nothing created yet.
  const preview = importPreview(readSheetFile(text));
  expect(preview).toMatchObject({
    title: 'Rigidity over the energy scan',
    safetyRelated: true,
    calcCells: 1,
    textCells: 0,
    exportedFrom: { sheet: 'BEAM-CALC-0001', version: 2, sha256: version.sha256 },
    unchangedSinceExport: true,
  });
  expect(preview.attachments).toEqual(refs.map((r) => ({ ...r, carried: true })));
  expect(await db.selectFrom('sheets').select('id').where('project_id', '=', other.id).execute()).toEqual([]);

  const imported = await importSheetFile(db, author, other, text, {
    title: 'Rigidity over the energy scan (beam line 2)',
    store: store(),
  });
  expect(imported).toMatchObject({
    code: 'OTHR-CALC-0001',
    version: 2,
    attachments: { carried: ['energy-scan.csv', 'layout.png'], notCarried: [] },
  });
  const copy = (await getVersion(db, imported.id, 2))!;
  expect(copy.content.title).toBe('Rigidity over the energy scan (beam line 2)');
  expect(copy.content.attachments).toEqual(refs);
  // The same table gives the same number: the largest rigidity of the scan, at 250 MeV.
  expect(brhoMax(copy.results)).toEqual(brhoMax(version.results));
  // PDG RPP kinematics: 250 MeV protons have pc = 729.134 MeV, so Bρ = p/e = 2.432 13 T·m (common practice, Bρ[T·m] = p[GeV/c]/0.299 792 458).
  expect(brhoMax(copy.results).number).toBeCloseTo(2.43213, 4);
  // The attachments are the new sheet's own, served only when the stored bytes still match.
  const listed = await listAttachments(db, imported.id);
  expect(listed.map((a) => [a.name, a.sha256]).sort()).toEqual(refs.map((r) => [r.name, r.sha256]).sort());
  const bytes = (await readAttachment(db, store(), imported.id, refs[0].sha256)).bytes;
  expect(new TextDecoder().decode(bytes)).toBe(CSV);
  const message = (
    await db
      .selectFrom('versions')
      .select('message')
      .where('sheet_id', '=', imported.id)
      .where('number', '=', 2)
      .executeTakeFirstOrThrow()
  ).message;
  expect(message).toBe(
    `Imported from a sheet file exported from BEAM-CALC-0001 version 2 (SHA-256 ${version.sha256.slice(0, 12)}…; content unchanged since export); 2 attachments carried, SHA-256 verified`,
  );
  const audit = await db
    .selectFrom('audit_events')
    .select(['action', 'object_id'])
    .where('action', '=', 'attachment.import')
    .execute();
  expect(audit).toEqual([
    { action: 'attachment.import', object_id: imported.id },
    { action: 'attachment.import', object_id: imported.id },
  ]);
});

it('refuses a file whose carried bytes do not match their SHA-256 or size, or are not base64, and creates nothing', async () => {
  const { db, author, other, file } = await exported();
  const tampered = structuredClone(file);
  const csvEntry = tampered.attachments.find((a) => a.name === 'energy-scan.csv') as { contentBase64: string };
  // 250 MeV becomes 260 MeV: same size, different bytes.
  csvEntry.contentBase64 = Buffer.from(CSV.replace('250', '260')).toString('base64');
  const refused = await refusal(importSheetFile(db, author, other, JSON.stringify(tampered), { store: store() }));
  expect(refused.code).toBe('bad_request');
  expect(refused.message).toMatch(
    new RegExp(
      `^The attachment energy-scan\\.csv in the file does not match its record: the file says ${CSV.length} bytes with SHA-256 [0-9a-f]{64}, the bytes carried are ${CSV.length} bytes with SHA-256 [0-9a-f]{64}\\. The file was altered or damaged; nothing was imported\\.$`,
    ),
  );
  expect(refused.message).toContain(createHash('sha256').update(CSV.replace('250', '260')).digest('hex'));
  // The confirmation refuses it the same way.
  expect((await refusal(Promise.resolve().then(() => readSheetFile(JSON.stringify(tampered))))).message).toBe(
    refused.message,
  );

  const short = structuredClone(file);
  (short.attachments[1] as { size: number }).size += 1;
  expect(
    (await refusal(importSheetFile(db, author, other, JSON.stringify(short), { store: store() }))).message,
  ).toMatch(/layout\.png in the file does not match its record/);
  const garbled = structuredClone(file);
  (garbled.attachments[1] as { contentBase64: string }).contentBase64 = 'not base64!';
  expect(
    (await refusal(importSheetFile(db, author, other, JSON.stringify(garbled), { store: store() }))).message,
  ).toMatch(/layout\.png in the file is not valid base64/);
  // A file that lies about its kind: PNG bytes recorded as a CSV table.
  const disguised = structuredClone(file);
  const png = disguised.attachments[1] as { name: string; mediaType: string; sha256: string };
  png.name = 'layout.csv';
  png.mediaType = 'text/csv';
  expect(
    (await refusal(importSheetFile(db, author, other, JSON.stringify(disguised), { store: store() }))).message,
  ).toMatch(/^The attachment layout\.csv in the file is not accepted: .*content is a PNG image/);

  expect(await db.selectFrom('sheets').select('id').where('project_id', '=', other.id).execute()).toEqual([]);
  expect(await db.selectFrom('attachments').select('id').where('project_id', '=', other.id).execute()).toEqual([]);
});

it('imports a file that lists attachments without their bytes, says so, and the cell reading the table shows an error', async () => {
  const { db, author, other, file } = await exported();
  const listed = {
    ...file,
    attachments: file.attachments.map((a) => ({
      name: a.name,
      mediaType: a.mediaType,
      size: a.size,
      sha256: a.sha256,
    })),
  };
  const preview = importPreview(readSheetFile(JSON.stringify(listed)));
  // Still the exported version: the listing without bytes is what the version cites.
  expect(preview.unchangedSinceExport).toBe(true);
  expect(preview.attachments.map((a) => [a.name, a.carried])).toEqual([
    ['energy-scan.csv', false],
    ['layout.png', false],
  ]);
  const imported = await importSheetFile(db, author, other, JSON.stringify(listed), { store: store() });
  expect(imported.attachments).toEqual({ carried: [], notCarried: ['energy-scan.csv', 'layout.png'] });
  const copy = (await getVersion(db, imported.id, 2))!;
  expect(copy.content.attachments).toEqual([]);
  expect((copy.results as SheetResult).cells[0].error).toMatch(/energy_scan/);
  const message = (
    await db
      .selectFrom('versions')
      .select('message')
      .where('sheet_id', '=', imported.id)
      .where('number', '=', 2)
      .executeTakeFirstOrThrow()
  ).message;
  expect(message).toMatch(/; not carried, to upload again: energy-scan\.csv, layout\.png$/);
});

it('says when a file was edited after export, and refuses an unreadable calculation record instead of dropping it', async () => {
  const { file } = await exported();
  const edited = { ...file, cells: [{ ...file.cells[0], source: `${file.cells[0].source}\nx_1 = 1 m` }] };
  expect(importPreview(readSheetFile(JSON.stringify(edited))).unchangedSinceExport).toBe(false);
  const renamed = readSheetFile(JSON.stringify(file), 'A new title');
  // The title given at import does not count as an edit of the file.
  expect(renamed.unchangedSinceExport).toBe(true);
  expect(renamed.content.title).toBe('A new title');
  const broken = { ...file, record: { ...file.record, inputs: 'none' } };
  expect((await refusal(Promise.resolve().then(() => readSheetFile(JSON.stringify(broken))))).message).toMatch(
    /^not a sheet file: record\.inputs: /,
  );
  // A hand-written file with no record at all imports with an empty one.
  expect(
    readSheetFile(JSON.stringify({ title: 'Hand-written', cells: [{ kind: 'calc', source: 'x_1 = 1 m' }] }))
      .unchangedSinceExport,
  ).toBeNull();
});
