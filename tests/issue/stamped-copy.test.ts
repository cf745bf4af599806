// The stamped copy of a superseded or withdrawn revision is an incremental update of the issued file
// (lib/issue/stamp.ts): poppler's pdfsig, as an outside reader, finds two signatures and calls each
// valid, the last covering the whole file; the issued bytes are its exact prefix; the verification
// answers "authentic stamped copy"; a changed byte in the stamp is caught. Also the issued PDF's
// creation date (the issue time) and language, read with pdfinfo.
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';
import { sql } from 'kysely';
import { PDFArray, PDFDocument, PDFName, type PDFRawStream, PDFString } from 'pdf-lib';
import { beforeEach, describe, expect, it } from 'vitest';
import { requestIssue } from '../../lib/issue/request';
import { processIssueJob } from '../../lib/issue/job';
import { listRevisions } from '../../lib/issue/register';
import { revisionPdf } from '../../lib/issue/download';
import { withdrawRevision } from '../../lib/issue/withdraw';
import { verifyPdfFile } from '../../lib/issue/verification';
import { storageConfig } from '../../lib/storage/config';
import { createObjectStore } from '../../lib/storage/object-store';
import { approveNewVersion, makeSheet, makeTeam, type SheetRef, type Team } from '../support/approved-sheet';
import { testDb } from '../support/database';
import { PASSWORD } from '../support/people';

const store = () => createObjectStore(storageConfig());
const folder = mkdtempSync(path.join(tmpdir(), 'ws-stamp-'));
process.env.WORLDSHEET_KEY_FOLDER ??= path.join(folder, 'keys');
const artifacts = path.join(process.cwd(), 'tests', '.artifacts');

function saved(bytes: Uint8Array): string {
  const file = path.join(folder, `f${Math.random().toString(36).slice(2)}.pdf`);
  writeFileSync(file, bytes);
  return file;
}
const run = (tool: string, args: string[]) =>
  execFileSync(tool, args, { encoding: 'utf8', env: { ...process.env, TZ: 'UTC' } });

/** pdfsig's report, one block per signature ("Signature #1:" …). */
function signatures(bytes: Uint8Array) {
  const out = run('pdfsig', [saved(bytes)]);
  return out
    .split(/^Signature #\d+:$/m)
    .slice(1)
    .map((block) => ({
      valid: block.includes('Signature Validation: Signature is Valid.'),
      whole: block.includes('- Total document signed'),
      block,
    }));
}

type World = Team & { sheet: SheetRef };
let w: World;
beforeEach(async () => {
  const db = testDb();
  const team = await makeTeam(db, { code: 'STMP' });
  const sheet = await makeSheet(
    db,
    team.author,
    { id: team.projectId, code: 'STMP' },
    { title: 'Gantry dipole rigidity', safetyRelated: false, objective: 'Bρ of the gantry dipoles' },
  );
  w = { ...team, sheet };
});

async function issue(source: string) {
  const versionNumber = await approveNewVersion(testDb(), w, w.sheet, {
    message: `Rigidity at ${source}`,
    cells: [{ id: 'c1', kind: 'calc', source }],
  });
  const { jobId } = await requestIssue(testDb(), w.controller, w.sheet, { versionNumber, password: PASSWORD });
  return (await processIssueJob(testDb(), store(), jobId))!;
}

describe('stamped copies keep the issued signature', () => {
  it('superseded and withdrawn copies: every signature valid, the original a byte-identical prefix, verified as a stamped copy', async () => {
    const db = testDb();
    const a = await issue('T_kin = 250 MeV');
    const b = await issue('T_kin = 240 MeV');
    const originalA = (await revisionPdf(db, store(), a, true)).bytes;

    // The issued file: one signature, the whole file; its creation date is the issue time, to the second.
    expect(signatures(originalA).map((s) => [s.valid, s.whole])).toEqual([[true, true]]);
    const rowA = (await listRevisions(db, { sheetId: w.sheet.id })).find((r) => r.revision === 'A')!;
    const info = run('pdfinfo', ['-isodates', saved(originalA)]);
    const created = /^CreationDate:\s+(\S+)/m.exec(info)![1];
    expect(new Date(created).toISOString()).toBe(
      new Date(Math.floor(Date.parse(rowA.issuedAt) / 1000) * 1000).toISOString(),
    );
    expect(created).not.toMatch(/T00:00:00/);
    // The document language (ISO 32000-1 §14.9.2.2, the catalog's /Lang).
    const lang = (await PDFDocument.load(originalA, { updateMetadata: false })).catalog.lookup(PDFName.of('Lang'));
    expect(lang instanceof PDFString && lang.decodeText()).toBe('en');
    // A tagged PDF (ISO 32000-1 §14.8; the structure itself is tested in tests/issue/pdf-render.test.ts).
    expect(info).toMatch(/^Tagged:\s+yes$/m);

    const copies: Array<[string, Buffer, string]> = [];
    const superseded = Buffer.from((await revisionPdf(db, store(), a, false)).bytes);
    copies.push(['superseded', superseded, 'A']);
    await withdrawRevision(db, w.controller, b, 'Dipole field map revised by the magnet supplier.');
    const withdrawn = Buffer.from((await revisionPdf(db, store(), b, false)).bytes);
    copies.push(['withdrawn', withdrawn, 'B']);
    const originalB = (await revisionPdf(db, store(), b, true)).bytes;

    for (const [status, copy, revision] of copies) {
      const original = revision === 'A' ? originalA : originalB;
      // Append-only: the issued bytes are the copy's prefix.
      expect(copy.length).toBeGreaterThan(original.length);
      expect(Buffer.compare(copy.subarray(0, original.length), Buffer.from(original))).toBe(0);
      // pdfsig (poppler-utils): the issued signature and the document-control signature, both valid;
      // only the last covers the whole file.
      const sigs = signatures(copy);
      expect(sigs.map((s) => [s.valid, s.whole])).toEqual([
        [true, false],
        [true, true],
      ]);
      expect(sigs[1].block).toContain('Signature Type: ETSI.CAdES.detached');
      expect(sigs[1].block).toContain(`Signature Field Name: Stamp ${status}`);
      // The verification page's answer.
      const answer = await verifyPdfFile(db, copy);
      expect(answer).toMatchObject({
        authentic: true,
        checks: { stampedCopy: true, hashInRegister: true, signatureValid: true, signedByOrganisation: true },
        revision: { revision, status },
      });
      expect(answer.summary).toMatch(
        new RegExp(`^Authentic stamped copy: this is STMP-CALC-0001 revision ${revision} .*stamped "${status}"`),
      );
      // What the copy says, as text: the stamp's words, and the title block's status overlaid.
      const text = run('pdftotext', ['-layout', saved(copy), '-']);
      expect(text).toMatch(new RegExp(`Stamped copy, not for use: ${status.toUpperCase()}`));
      // The overlays: the title block's status field, and this revision's status in the revision
      // history (its original says "Issued" and "current"; the lower-case word is only the overlay's).
      const page1 = run('pdftotext', ['-f', '1', '-l', '1', '-layout', saved(copy), '-']);
      expect(page1).toMatch(new RegExp(`\\b${status}\\b`));
      expect(page1.match(new RegExp(`\\b${status.toUpperCase()}\\b`, 'g'))!.length).toBeGreaterThanOrEqual(3);
      // Still a tagged PDF, and the stamp is an artifact (ISO 32000-1 §14.8.2.2): its content streams,
      // appended to each page's, open with /Artifact BMC and close every sequence they open.
      expect(run('pdfinfo', [saved(copy)])).toMatch(/^Tagged:\s+yes$/m);
      const stampDoc = await PDFDocument.load(copy, { updateMetadata: false });
      const contents = stampDoc.getPage(0).node.lookup(PDFName.of('Contents'), PDFArray);
      const stampStream = stampDoc.context.lookup(contents.get(contents.size() - 1)) as PDFRawStream;
      const raw = Buffer.from(stampStream.getContents());
      const ops = (stampStream.dict.get(PDFName.of('Filter')) ? zlib.inflateSync(raw) : raw).toString('latin1');
      expect(ops.trimStart()).toMatch(/^\/Artifact BMC/);
      expect((ops.match(/\bEMC\b/g) ?? []).length).toBe((ops.match(/\bBMC\b|\bBDC\b/g) ?? []).length);

      // A changed byte in the stamp's update breaks the document-control signature.
      const changed = Buffer.from(copy);
      const at = copy.indexOf('(Document control)', original.length, 'latin1') + 1;
      expect(at).toBeGreaterThan(original.length);
      changed[at] ^= 0x01;
      const tampered = await verifyPdfFile(db, changed);
      expect(tampered.authentic).toBe(false);
      expect(tampered.checks.stampedCopy).toBe(false);
      expect(tampered.summary).toMatch(/not a stamp signed by document control/);
    }

    // A superseded revision later withdrawn gets a copy stamped "withdrawn" (made once for each
    // status); the earlier "superseded" copy still verifies, as what it says, with the present status.
    await withdrawRevision(db, w.controller, a, 'Superseded and then found wrong.');
    const laterA = Buffer.from((await revisionPdf(db, store(), a, false)).bytes);
    expect(Buffer.compare(laterA, superseded)).not.toBe(0);
    expect(signatures(laterA).map((s) => [s.valid, s.whole])).toEqual([
      [true, false],
      [true, true],
    ]);
    expect(run('pdftotext', ['-layout', saved(laterA), '-'])).toMatch(/Stamped copy, not for use: WITHDRAWN/);
    expect(Buffer.compare((await revisionPdf(db, store(), a, false)).bytes, laterA)).toBe(0);
    // The database keeps it once for that status.
    await expect(
      sql`update revisions set stamped_key = ${`revisions/stamped-${a}-withdrawn-x.pdf`}, stamped_sha256 = ${'0'.repeat(64)} where id = ${a}`.execute(
        db,
      ),
    ).rejects.toThrow(/made once for each status/);
    const oldCopy = await verifyPdfFile(db, superseded);
    expect(oldCopy).toMatchObject({
      authentic: true,
      checks: { stampedCopy: true },
      revision: { revision: 'A', status: 'withdrawn' },
    });
    expect(oldCopy.summary).toMatch(
      /stamped "superseded".*It is withdrawn \(Superseded and then found wrong\.\): do not use it\.$/,
    );

    // A picture of the stamped first page, for a person to look at.
    mkdirSync(artifacts, { recursive: true });
    writeFileSync(path.join(artifacts, 'stamped-superseded.pdf'), superseded);
    run('pdftoppm', [
      '-png',
      '-r',
      '80',
      '-f',
      '1',
      '-l',
      '1',
      saved(superseded),
      path.join(artifacts, 'stamped-superseded-page'),
    ]);
  });
});
