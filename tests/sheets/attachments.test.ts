// Attachments against the real database and the local S3-compatible object store: content
// sniffing, limits, sanitised names, SHA-256, immutability, input tables from CSV, and versions
// that cite attachments.
import { createHash } from 'node:crypto';
import { PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { sql } from 'kysely';
import { describe, expect, it } from 'vitest';
import {
  listAttachments,
  readAttachment,
  resolveAttachments,
  uploadAttachment,
} from '../../lib/attachments/attachments';
import { parseInputTable, tableNameFor } from '../../lib/attachments/csv-table';
import { sanitizeFileName } from '../../lib/attachments/file-name';
import { sniffKind } from '../../lib/attachments/kinds';
import { createSheet, getVersion, saveVersion } from '../../lib/sheets/sheets';
import { storageConfig } from '../../lib/storage/config';
import { createObjectStore } from '../../lib/storage/object-store';
import { testDb } from '../support/database';
import { makeProject, makeUser } from '../support/people';
import { refusal } from '../support/refusal';

const store = () => createObjectStore(storageConfig());
const bytes = (text: string) => new TextEncoder().encode(text);
// The smallest well-formed PDF header and PNG signature (ISO 32000-2 §7.5.2; ISO/IEC 15948 §5.2).
const PDF = bytes('%PDF-1.7\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n');
const PNG = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
const SCAN_CSV = 'energy [MeV], field [T], turns\n70, 0.5, 1\n150, 1.0, 2\n250, 1.5, 3\n';

async function world() {
  const db = testDb();
  const author = await makeUser(db, 'author@example.test');
  const projectId = await makeProject(db, 'BEAM', [[author, 'originator']]);
  const created = await createSheet(
    db,
    author,
    { id: projectId, code: 'BEAM' },
    { title: 'Energy scan', safetyRelated: false, objective: '' },
  );
  return { db, author, sheet: { id: created.id, project_id: projectId } };
}

describe('what a file is, by its content', () => {
  it('recognises PDF, PNG, JPEG and CSV by their leading bytes or text, and nothing else', () => {
    expect(sniffKind(PDF)).toBe('pdf');
    expect(sniffKind(PNG)).toBe('png');
    expect(sniffKind(new Uint8Array([0xff, 0xd8, 0xff, 0xe0, 0, 16]))).toBe('jpeg');
    expect(sniffKind(bytes(SCAN_CSV))).toBe('csv');
    // A Windows executable ("MZ"), a ZIP ("PK\3\4") and text with NUL bytes are none of them.
    expect(sniffKind(new Uint8Array([0x4d, 0x5a, 0x90, 0, 3, 0]))).toBeNull();
    expect(sniffKind(new Uint8Array([0x50, 0x4b, 3, 4, 20, 0]))).toBeNull();
    expect(sniffKind(bytes('a,b\n1,2\u0000'))).toBeNull();
    // Not UTF-8 (a lone continuation byte).
    expect(sniffKind(new Uint8Array([0x61, 0x80, 0x62]))).toBeNull();
  });

  it('sanitises names: no folders, no control or markup characters, the true extension', () => {
    expect(sanitizeFileName('../../etc/passwd.csv', 'csv')).toBe('passwd.csv');
    expect(sanitizeFileName('C:\\Users\\x\\scan data.CSV', 'csv')).toBe('scan data.CSV'.replace('.CSV', '.csv'));
    // The "/" of "</script>" is a folder separator: only what follows it is kept.
    expect(sanitizeFileName('<script>alert(1)</script>.pdf', 'pdf')).toBe('script_.pdf');
    expect(sanitizeFileName('.hidden\u0000\u202e.pdf', 'pdf')).toBe('hidden_.pdf');
    expect(sanitizeFileName('report', 'pdf')).toBe('report.pdf');
    expect(sanitizeFileName('...', 'png')).toBe('attachment.png');
    expect(sanitizeFileName(`${'é'.repeat(300)}.pdf`, 'pdf')).toHaveLength(120);
  });
});

describe('CSV data tables', () => {
  const known = (unit: string) => (['MeV', 'T', 'm', 'mm', 'ns'].includes(unit) ? null : `"${unit}" is not a unit`);

  it('reads the header as column names with units and the rows as numbers', () => {
    const t = parseInputTable(SCAN_CSV, known);
    expect(t.rows).toBe(3);
    expect(t.columns).toEqual([
      { name: 'energy', unit: 'MeV', values: [70, 150, 250] },
      { name: 'field', unit: 'T', values: [0.5, 1, 1.5] },
      { name: 'turns', unit: null, values: [1, 2, 3] },
    ]);
    // Semicolons and tabs as separators, a byte-order mark, quoted headings, exponents, blank lines.
    expect(parseInputTable('\uFEFF"beam current [mm]";t [ns]\n1e-3;2.5E2\n\n-4;.5\n', known).columns).toEqual([
      { name: 'beam_current', unit: 'mm', values: [0.001, -4] },
      { name: 't', unit: 'ns', values: [250, 0.5] },
    ]);
  });

  it('names what is wrong, with the row and column', () => {
    expect(() => parseInputTable('energy [MeV]\n70\nabc\n', known)).toThrow(
      'row 3, column energy: "abc" is not a number',
    );
    expect(() => parseInputTable('energy [MeV]\n"1,5"\n', known)).toThrow('use a point, not a comma, for decimals');
    expect(() => parseInputTable('energy [furlongs]\n1\n', known)).toThrow('"furlongs" is not a unit');
    expect(() => parseInputTable('energy [MeV],energy [MeV]\n1,2\n', known)).toThrow('two columns named energy');
    expect(() => parseInputTable('constructor\n1\n', known)).toThrow('reserved word');
    expect(() => parseInputTable('2x\n1\n', known)).toThrow('starts with a letter');
    expect(() => parseInputTable('a,b\n1,2\n3\n', known)).toThrow(/cannot be read as CSV/);
    expect(() => parseInputTable('a,b\n1,\n', known)).toThrow('row 2, column b is empty');
    expect(() => parseInputTable('a\n', known)).toThrow('at least one row');
    expect(() => parseInputTable(`a\n${'1\n'.repeat(10_001)}`, known)).toThrow('at most 10000 rows');
  });

  it('names the table after its file', () => {
    expect(tableNameFor('beam-energies.csv')).toBe('beam_energies');
    expect(tableNameFor('2026 scan (final).csv')).toBe('table_2026_scan_final');
    expect(tableNameFor('Énergie.csv')).toBe('Energie');
    expect(tableNameFor('__proto__.csv')).toBe('proto');
  });
});

describe('uploading to a sheet', () => {
  it('stores the bytes in object storage under their SHA-256 and records the attachment', async () => {
    const { db, author, sheet } = await world();
    const info = await uploadAttachment(db, store(), author, sheet, {
      name: 'scan.csv',
      type: 'text/csv',
      bytes: bytes(SCAN_CSV),
    });
    const sha = createHash('sha256').update(SCAN_CSV).digest('hex');
    expect(info).toMatchObject({
      name: 'scan.csv',
      mediaType: 'text/csv',
      size: SCAN_CSV.length,
      sha256: sha,
      table: { name: 'scan', rows: 3 },
    });
    const file = await readAttachment(db, store(), sheet.id, sha);
    expect(Buffer.from(file.bytes).toString()).toBe(SCAN_CSV);
    const again = await uploadAttachment(db, store(), author, sheet, {
      name: 'scan.csv',
      type: 'text/csv',
      bytes: bytes(SCAN_CSV),
    });
    expect(again.sha256).toBe(sha);
    expect(await listAttachments(db, sheet.id)).toHaveLength(1);
    const audit = await db
      .selectFrom('audit_events')
      .select(['action', 'new_value'])
      .where('action', '=', 'attachment.upload')
      .execute();
    expect(audit).toHaveLength(1);
    expect(audit[0].new_value).toMatchObject({ sha256: sha, name: 'scan.csv' });
  });

  it('refuses a file whose content is not what its name or type says (415), and unknown kinds', async () => {
    const { db, author, sheet } = await world();
    const disguised = await refusal(
      uploadAttachment(db, store(), author, sheet, { name: 'drawing.pdf', type: 'application/pdf', bytes: PNG }),
    );
    expect(disguised.status).toBe(415);
    expect(disguised.message).toBe(
      'The file is named as a PDF document but its content is a PNG image; rename it or upload the right file.',
    );
    const sentAs = await refusal(
      uploadAttachment(db, store(), author, sheet, { name: 'drawing', type: 'image/png', bytes: PDF }),
    );
    expect(sentAs.message).toMatch(/sent as a PNG image \(image\/png\) but its content is a PDF document/);
    const exe = await refusal(
      uploadAttachment(db, store(), author, sheet, {
        name: 'tool.pdf',
        type: '',
        bytes: new Uint8Array([0x4d, 0x5a, 0x90, 0, 3]),
      }),
    );
    expect(exe.status).toBe(415);
    const text = await refusal(
      uploadAttachment(db, store(), author, sheet, {
        name: 'notes.txt',
        type: 'text/plain',
        bytes: bytes('a,b\n1,2\n'),
      }),
    );
    expect(text.message).toMatch(/only when their name ends in .csv/);
    expect(await listAttachments(db, sheet.id)).toEqual([]);
  });

  it('refuses files over the limit of their kind (413) and empty files (400)', async () => {
    const { db, author, sheet } = await world();
    const big = new Uint8Array(2 * 1024 * 1024 + 1).fill(0x31);
    big.set(bytes('n\n'));
    const tooBig = await refusal(
      uploadAttachment(db, store(), author, sheet, { name: 'big.csv', type: 'text/csv', bytes: big }),
    );
    expect(tooBig.status).toBe(413);
    expect(tooBig.message).toBe('A CSV table may be at most 2 MiB; this file is 2.0 MiB.');
    const empty = await refusal(
      uploadAttachment(db, store(), author, sheet, { name: 'e.pdf', type: 'application/pdf', bytes: new Uint8Array() }),
    );
    expect(empty.status).toBe(400);
  });

  it('refuses a table whose name would hide a built-in function', async () => {
    const { db, author, sheet } = await world();
    const e = await refusal(
      uploadAttachment(db, store(), author, sheet, { name: 'max.csv', type: 'text/csv', bytes: bytes('a\n1\n') }),
    );
    expect(e.status).toBe(400);
    expect(e.message).toMatch(/max.csv would be called `max` in cells, but is a built-in function/);
  });

  it('never serves bytes that no longer match their recorded SHA-256', async () => {
    const { db, author, sheet } = await world();
    const info = await uploadAttachment(db, store(), author, sheet, {
      name: 'spec.pdf',
      type: 'application/pdf',
      bytes: PDF,
    });
    // Someone with direct access to the bucket replaces the object.
    const config = storageConfig();
    const client = new S3Client({
      endpoint: config.endpoint,
      region: config.region,
      credentials: config.credentials,
      forcePathStyle: true,
    });
    await client.send(
      new PutObjectCommand({
        Bucket: config.bucket,
        Key: `attachments/sha256/${info.sha256}`,
        Body: bytes('%PDF-1.7 tampered'),
      }),
    );
    const e = await refusal(readAttachment(db, store(), sheet.id, info.sha256));
    expect(e.message).toMatch(/does not match its recorded SHA-256/);
  });

  it('keeps attachment rows immutable in the database', async () => {
    const { db, author, sheet } = await world();
    await uploadAttachment(db, store(), author, sheet, { name: 'spec.pdf', type: 'application/pdf', bytes: PDF });
    await expect(sql`update attachments set name = 'other.pdf'`.execute(db)).rejects.toThrow(
      /UPDATE on attachments is refused/,
    );
    await expect(sql`delete from attachments`.execute(db)).rejects.toThrow(/DELETE on attachments is refused/);
  });
});

describe('versions that cite attachments', () => {
  it('evaluates cells with the columns of a CSV table, units included, and records the hashes', async () => {
    const { db, author, sheet } = await world();
    const info = await uploadAttachment(db, store(), author, sheet, {
      name: 'scan.csv',
      type: 'text/csv',
      bytes: bytes(SCAN_CSV),
    });
    const v1 = (await getVersion(db, sheet.id, 1))!;
    const content = {
      ...v1.content,
      attachments: [{ name: info.name, mediaType: info.mediaType, size: info.size, sha256: info.sha256 }],
      cells: [
        {
          id: 'c1',
          kind: 'calc' as const,
          source: 'T_max = max(scan.energy)\nBrho = magneticRigidity(momentumFromKinetic(scan.energy, m_p), 1) to T*m',
        },
      ],
    };
    const saved = await saveVersion(db, author, sheet, { parentNumber: 1, message: 'Rigidity over the scan', content });
    expect(saved.ok).toBe(true);
    const v2 = (await getVersion(db, sheet.id, 2))!;
    expect(v2.content.attachments[0].sha256).toBe(createHash('sha256').update(SCAN_CSV).digest('hex'));
    const [tMax, brho] = v2.results!.cells[0].statements;
    expect(tMax.value!.text).toBe('250 MeV');
    // Bρ = p/e with pc = √(T² + 2T·m_p c²), m_p c² = 938.272 089 43 MeV (CODATA 2022); PDG RPP
    // "Kinematics": p [GeV/c] = 0.299 792 458 · B [T] · ρ [m]. For T = 250 MeV: pc = 729.134 MeV,
    // Bρ = 2.432 13 T·m (computed by hand from those two sources).
    expect(brho.value!.unit).toBe('T m');
    expect(brho.value!.text).toBe('[1.231\u202f29, 1.839\u202f09, 2.432\u202f13] T·m');
  });

  it('refuses a version citing an attachment that was not uploaded to the sheet', async () => {
    const { db, author, sheet } = await world();
    const v1 = (await getVersion(db, sheet.id, 1))!;
    const forged = { name: 'scan.csv', mediaType: 'text/csv', size: 10, sha256: 'a'.repeat(64) };
    const e = await refusal(
      saveVersion(db, author, sheet, {
        parentNumber: 1,
        message: 'forged',
        content: { ...v1.content, attachments: [forged] },
      }),
    );
    expect(e.status).toBe(400);
    expect(e.message).toMatch(/scan.csv .* is not an attachment uploaded to this sheet/);
  });

  it('does not resolve another sheet\u2019s attachment', async () => {
    const { db, author, sheet } = await world();
    const info = await uploadAttachment(db, store(), author, sheet, {
      name: 'scan.csv',
      type: 'text/csv',
      bytes: bytes(SCAN_CSV),
    });
    const second = await createSheet(
      db,
      author,
      { id: sheet.project_id, code: 'BEAM' },
      { title: 'Another', safetyRelated: false, objective: '' },
    );
    await expect(resolveAttachments(db, second.id, [{ name: info.name, sha256: info.sha256 }])).rejects.toThrow(
      'not an attachment uploaded to this sheet',
    );
    expect((await resolveAttachments(db, sheet.id, [{ name: info.name, sha256: info.sha256 }]))[0]).toMatchObject({
      name: 'scan',
      fileName: 'scan.csv',
    });
  });
});
