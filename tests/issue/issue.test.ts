// Issuing against the real database and the local S3-compatible store: an approved version becomes
// revision A with a signed PDF, the next one supersedes it, a crash mid-way resumes to exactly one
// revision and one PDF, a superseded download is stamped, withdrawal needs a reason, and anyone can
// verify a file or a code. PDFs are read back with poppler (pdfsig, pdftotext) as an outside reader.
import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import { sql } from 'kysely';
import { PDFDocument } from 'pdf-lib';
import { beforeEach, describe, expect, it } from 'vitest';
import { normaliseVerificationCode, revisionCode } from '../../lib/issue/codes';
import { requestIssue } from '../../lib/issue/request';
import { processIssueJob } from '../../lib/issue/job';
import { listRevisions, registerCsv } from '../../lib/issue/register';
import { revisionPdf } from '../../lib/issue/download';
import { withdrawRevision } from '../../lib/issue/withdraw';
import { verifyCode, verifyPdfFile } from '../../lib/issue/verification';
import { listSheets } from '../../lib/sheets/sheets';
import { storageConfig } from '../../lib/storage/config';
import { createObjectStore, type ObjectStore } from '../../lib/storage/object-store';
import { approveNewVersion, makeSheet, makeTeam, type SheetRef, type Team } from '../support/approved-sheet';
import { testDb } from '../support/database';
import { drainMailQueue, waitForMail } from '../support/mailbox';
import { PASSWORD } from '../support/people';
import { refusal } from '../support/refusal';

const store = () => createObjectStore(storageConfig());
const folder = mkdtempSync(path.join(tmpdir(), 'ws-issue-'));
process.env.WORLDSHEET_KEY_FOLDER ??= path.join(folder, 'keys');

function poppler(tool: 'pdfsig' | 'pdftotext', bytes: Uint8Array): string {
  const file = path.join(folder, `f${Math.random().toString(36).slice(2)}.pdf`);
  writeFileSync(file, bytes);
  return execFileSync(tool, tool === 'pdftotext' ? ['-layout', file, '-'] : [file], { encoding: 'utf8' });
}

type World = Team & { sheet: SheetRef };

/** Saves `source` as the next version and takes it through check and approval; its number. */
function approve(w: World, source: string) {
  return approveNewVersion(testDb(), w, w.sheet, {
    message: `Rigidity at ${source}`,
    cells: [{ id: 'c1', kind: 'calc', source }],
  });
}

async function issue(w: World, versionNumber: number, s: ObjectStore = store()) {
  const { jobId, revision } = await requestIssue(testDb(), w.controller, w.sheet, {
    versionNumber,
    password: PASSWORD,
  });
  const revisionId = (await processIssueJob(testDb(), s, jobId))!;
  return { jobId, revision, revisionId };
}

let w: World;
beforeEach(async () => {
  const db = testDb();
  const team = await makeTeam(db, { code: 'TPT2' });
  const sheet = await makeSheet(
    db,
    team.author,
    { id: team.projectId, code: 'TPT2' },
    { title: 'Gantry dipole rigidity', safetyRelated: true, objective: 'Bρ of the gantry dipoles' },
  );
  w = { ...team, sheet };
});

describe('revision codes (ASME Y14.35)', () => {
  it('letters skip I, O, Q, S, X and Z, then go on with two letters; numbers count from 0', () => {
    expect(Array.from({ length: 22 }, (_, i) => revisionCode('letters', i)).join(' ')).toBe(
      'A B C D E F G H J K L M N P R T U V W Y AA AB',
    );
    expect(revisionCode('letters', 20 + 20 * 20)).toBe('AAA');
    expect([0, 1, 2, 10].map((n) => revisionCode('numbers', n))).toEqual(['0', '1', '2', '10']);
  });

  it('reads verification codes as people type them', () => {
    expect(normaliseVerificationCode('k7qf 2m9d xw4t')).toBe('K7QF-2M9D-XW4T');
    expect(normaliseVerificationCode('K7QF-2M9D-XW4O')).toBe('K7QF-2M9D-XW40');
    expect(normaliseVerificationCode('not a code')).toBeNull();
  });
});

describe('issuing', () => {
  it('issues an approved version as revision A: signed PDF in object storage, signature, register, e-mails', async () => {
    const db = testDb();
    const v = await approve(
      w,
      'T_kin = 250 MeV\nBrho = magneticRigidity(momentumFromKinetic(T_kin, m_p), q_e) to T*m\nBrho < 3 T*m',
    );
    const { revision, revisionId } = await issue(w, v);
    expect(revision).toBe('A');
    const [row] = await listRevisions(db, { sheetId: w.sheet.id });
    expect(row).toMatchObject({
      id: revisionId,
      revision: 'A',
      status: 'current',
      versionNumber: v,
      sheet: 'TPT2-CALC-0001',
    });
    // The project's sheet register shows the current revision and the approved status.
    expect((await listSheets(db, w.sheet.project_id, 'TPT2'))[0]).toMatchObject({
      currentRevision: 'A',
      status: 'approved',
    });

    const file = await revisionPdf(db, store(), revisionId, false);
    expect(createHash('sha256').update(file.bytes).digest('hex')).toBe(row.pdfSha256);
    const sig = poppler('pdfsig', file.bytes);
    expect(sig).toContain('Signature Validation: Signature is Valid.');
    expect(sig).toContain('Total document signed');
    expect(sig).toContain('Signature Type: ETSI.CAdES.detached');
    const text = poppler('pdftotext', file.bytes);
    for (const expected of ['TPT2-CALC-0001', 'Gantry dipole rigidity', row.verificationCode, 'Calculation'])
      expect(text).toContain(expected);
    if (process.env.WORLDSHEET_PRINT_PDF_TEXT) console.log(text);
    // ISO 7200 title block fields, the results with their units, the signatures with their meanings.
    for (const field of [
      /Legal owner/i,
      /Identification number/i,
      /Revision/i,
      /Date of issue/i,
      /Document type/i,
      /Creator/i,
      /Approval person/i,
      /Status/i,
      /Lang/i,
      /Sheet/,
    ])
      expect(text).toMatch(field);
    expect(text).toMatch(/250\s*MeV/);
    expect(text).toMatch(/2\.432[\s\u202f]?13\s*T\s*·\s*m/);
    expect(text).toMatch(/PASS/i);
    for (const [name, meaning] of [
      ['Person author', /prepared/i],
      ['Person checker', /checked/i],
      ['Person approver', /approved/i],
      ['Person controller', /issued/i],
    ] as const) {
      expect(text).toContain(name);
      expect(text).toMatch(meaning);
    }
    expect(text).toContain(row.versionSha256.slice(0, 16));

    const signatures = await db
      .selectFrom('signatures')
      .select(['meaning', 'printed_name'])
      .where('sheet_id', '=', w.sheet.id)
      .orderBy('signed_at')
      .execute();
    expect(signatures.map((s) => s.meaning)).toEqual(['prepared', 'checked', 'approved', 'issued']);
    expect(signatures[3].printed_name).toBe('Person controller');

    await drainMailQueue();
    for (const to of ['author@example.test', 'checker@example.test', 'approver@example.test']) {
      const mail = await waitForMail({ to, kind: 'revision-issued' });
      expect(mail.subject).toBe('TPT2-CALC-0001 revision A is issued');
      expect(mail.links.some((l) => l.endsWith(`/api/revisions/${revisionId}/pdf`))).toBe(true);
    }
  });

  it('refuses a version that is not approved, a wrong password (audited), and a second issue of the same version', async () => {
    const db = testDb();
    expect(
      await refusal(requestIssue(db, w.controller, w.sheet, { versionNumber: 1, password: PASSWORD })),
    ).toMatchObject({ status: 409 });
    const v = await approve(w, 'T_kin = 250 MeV');
    expect(
      await refusal(requestIssue(db, w.controller, w.sheet, { versionNumber: v, password: 'wrong password' })),
    ).toMatchObject({ status: 403 });
    expect(
      await db.selectFrom('audit_events').select('new_value').where('action', '=', 'signature.refused').execute(),
    ).toEqual([{ new_value: { meaning: 'issued' } }]);
    await issue(w, v);
    expect(
      (await refusal(requestIssue(db, w.controller, w.sheet, { versionNumber: v, password: PASSWORD }))).message,
    ).toMatch(/already issued as revision A/);
  });

  it('resumes after a crash between storing the PDF and recording it: one revision, one PDF', async () => {
    const db = testDb();
    const v = await approve(w, 'T_kin = 230 MeV');
    const { jobId } = await requestIssue(db, w.controller, w.sheet, { versionNumber: v, password: PASSWORD });
    const real = store();
    let crashed = false;
    const crashing: ObjectStore = {
      ...real,
      putOnce: real.putOnce,
      exists: real.exists,
      get: async (key) => {
        const stored = await real.exists(key);
        if (stored && !crashed) {
          crashed = true;
          throw new Error('the worker died here');
        }
        return real.get(key);
      },
    };
    await expect(processIssueJob(db, crashing, jobId)).rejects.toThrow('the worker died here');
    expect(await db.selectFrom('revisions').select('id').execute()).toEqual([]);
    expect(
      await db.selectFrom('issue_jobs').select(['state', 'step']).where('id', '=', jobId).executeTakeFirstOrThrow(),
    ).toEqual({ state: 'pending', step: 'storing' });

    const revisionId = await processIssueJob(db, real, jobId);
    expect(await processIssueJob(db, real, jobId)).toBe(revisionId); // and again: nothing more
    expect(await db.selectFrom('revisions').select('id').execute()).toHaveLength(1);
    expect(await db.selectFrom('signatures').select('id').where('meaning', '=', 'issued').execute()).toHaveLength(1);
    const config = storageConfig();
    const client = new S3Client({
      endpoint: config.endpoint,
      region: config.region,
      credentials: config.credentials,
      forcePathStyle: true,
    });
    const listed = await client.send(
      new ListObjectsV2Command({ Bucket: config.bucket, Prefix: `revisions/issue-${jobId}` }),
    );
    expect(listed.KeyCount).toBe(1);
  });

  it('supersedes revision A with B; A downloads stamped, the original stays byte-identical; withdrawal needs a reason', async () => {
    const db = testDb();
    const a = await issue(w, await approve(w, 'T_kin = 250 MeV'));
    const b = await issue(w, await approve(w, 'T_kin = 240 MeV'));
    expect(b.revision).toBe('B');
    const rows = await listRevisions(db, { sheetId: w.sheet.id });
    expect(rows.map((r) => [r.revision, r.status, r.supersededBy])).toEqual([
      ['B', 'current', null],
      ['A', 'superseded', 'B'],
    ]);
    const original = await revisionPdf(db, store(), a.revisionId, true);
    expect(createHash('sha256').update(original.bytes).digest('hex')).toBe(rows[1].pdfSha256);
    const stamped = await revisionPdf(db, store(), a.revisionId, false);
    expect(stamped.stamped).toBe(true);
    expect(poppler('pdftotext', stamped.bytes)).toMatch(/SUPERSEDED by revision B issued \d{4}-\d\d-\d\d/);
    // The same stamped copy every time.
    expect(Buffer.compare((await revisionPdf(db, store(), a.revisionId, false)).bytes, stamped.bytes)).toBe(0);

    // The database keeps the record: the PDF and its hash never change; status only moves forward.
    await expect(
      sql`update revisions set pdf_sha256 = ${'0'.repeat(64)} where id = ${a.revisionId}`.execute(db),
    ).rejects.toThrow(/never change/);
    await expect(
      sql`update revisions set status = 'withdrawn', withdrawn_reason = '' where id = ${b.revisionId}`.execute(db),
    ).rejects.toThrow(/needs a reason/);
    await withdrawRevision(db, w.controller, b.revisionId, 'Dipole field map revised by the magnet supplier.');
    await expect(sql`update revisions set status = 'current' where id = ${b.revisionId}`.execute(db)).rejects.toThrow(
      /cannot go from withdrawn to current/,
    );
    await expect(sql`delete from revisions`.execute(db)).rejects.toThrow(/DELETE on revisions is refused/);
    const csv = registerCsv(await listRevisions(db, { projectId: w.sheet.project_id }));
    expect(csv.split('\r\n')[0]).toBe(
      'sheet,title,revision,status,version,issued_at_utc,issued_by,superseded_by,withdrawn_reason,pdf_sha256,version_sha256,verification_code,superseded_inputs',
    );
    expect(csv).toContain('TPT2-CALC-0001,Gantry dipole rigidity,B,withdrawn,');
  });
});

describe('verification by anyone', () => {
  it('recognises the issued file, its status, a stamped copy, a changed byte, a stranger\u2019s PDF and a non-PDF', async () => {
    const db = testDb();
    const a = await issue(w, await approve(w, 'T_kin = 250 MeV'));
    const fileA = (await revisionPdf(db, store(), a.revisionId, true)).bytes;
    expect(await verifyPdfFile(db, fileA)).toMatchObject({
      authentic: true,
      revision: { sheet: 'TPT2-CALC-0001', revision: 'A', status: 'current' },
      checks: { hashInRegister: true, signatureValid: true, signedByOrganisation: true },
    });
    const b = await issue(w, await approve(w, 'T_kin = 240 MeV'));
    const nowA = await verifyPdfFile(db, fileA);
    expect(nowA.summary).toMatch(
      /^Authentic: this is TPT2-CALC-0001 revision A, issued \d{4}-\d\d-\d\d\. It is superseded by revision B: do not use it\.$/,
    );

    const stamped = (await revisionPdf(db, store(), a.revisionId, false)).bytes;
    // The stamped copy keeps the issued file as its prefix and is signed by document control (tests/issue/stamped-copy.test.ts).
    expect(await verifyPdfFile(db, stamped)).toMatchObject({
      authentic: true,
      checks: { stampedCopy: true },
      revision: { revision: 'A', status: 'superseded' },
    });

    const changed = Buffer.from(fileA);
    changed[Math.floor(changed.length / 3)] ^= 0x20;
    const tampered = await verifyPdfFile(db, changed);
    expect(tampered.authentic).toBe(false);
    expect(tampered.checks.hashInRegister).toBe(false);

    const stranger = Buffer.from(await (await PDFDocument.create()).save());
    expect((await verifyPdfFile(db, stranger)).summary).toMatch(
      /^Not an issued revision: no revision in the register has this file's SHA-256\./,
    );
    expect((await verifyPdfFile(db, Buffer.from('GIF89a not a pdf'))).summary).toBe(
      'This file is not a PDF, so it is not a revision issued by Worldsheet.',
    );

    const codeB = (await listRevisions(db, { sheetId: w.sheet.id }))[0].verificationCode;
    expect(await verifyCode(db, codeB.toLowerCase().replace(/-/g, ' '))).toMatchObject({
      authentic: true,
      revision: { revision: 'B', status: 'current' },
    });
    expect((await verifyCode(db, 'ZZZZ-ZZZZ-ZZZZ')).summary).toBe(
      'No issued revision has the verification code ZZZZ-ZZZZ-ZZZZ.',
    );
    void b;
  });
});
