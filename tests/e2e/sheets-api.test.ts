// The sheet and version API against the real database, through the production server.
import { createHash } from 'node:crypto';
import canonicalize from 'canonicalize';
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApiToken } from '../../lib/auth/api-tokens';
import { resetDatabase, testDb } from '../support/database';
import { makeProject, makeUser, PASSWORD } from '../support/people';
import { startApp, type RunningApp } from './harness';

let app: RunningApp;
let token: string;
let projectId: string;

async function api(path: string, init: { method?: string; body?: unknown } = {}) {
  const response = await fetch(`${app.baseUrl}${path}`, {
    method: init.method ?? 'GET',
    headers: {
      authorization: `Bearer ${token}`,
      ...(init.body !== undefined ? { 'content-type': 'application/json' } : {}),
    },
    body: init.body === undefined ? undefined : JSON.stringify(init.body),
  });
  return { status: response.status, body: await response.json() };
}

beforeAll(async () => {
  await resetDatabase();
  const author = await makeUser(testDb(), 'author@example.test');
  projectId = await makeProject(testDb(), 'BEAM', [[author, 'originator']]);
  token = (await createApiToken(testDb(), author, 'sheets api')).token;
  app = await startApp();
});

afterAll(async () => {
  await app?.stop();
});

describe('sheets and versions', () => {
  let sheetId: string;
  let v1: { content: Record<string, unknown> };

  it('creates sheets numbered by the server, one after the other', async () => {
    const a = await api(`/api/projects/${projectId}/sheets`, {
      method: 'POST',
      body: { title: 'Rigidity of the transfer line', safetyRelated: true, objective: 'Dipole field' },
    });
    const b = await api(`/api/projects/${projectId}/sheets`, {
      method: 'POST',
      body: { title: 'Time of flight', safetyRelated: false },
    });
    expect(a).toMatchObject({ status: 201, body: { number: 1, code: 'BEAM-CALC-0001' } });
    expect(b).toMatchObject({ status: 201, body: { number: 2, code: 'BEAM-CALC-0002' } });
    sheetId = a.body.id;
    const register = await api(`/api/projects/${projectId}/sheets`);
    expect(register.body.sheets.map((s: { code: string; latestVersion: number }) => [s.code, s.latestVersion])).toEqual(
      [
        ['BEAM-CALC-0001', 1],
        ['BEAM-CALC-0002', 1],
      ],
    );
    v1 = (await api(`/api/sheets/${sheetId}`)).body.version;
  });

  it('saves a version with its evaluation, hash, engine version and constants edition', async () => {
    const content = {
      ...v1.content,
      cells: [
        {
          id: 'c1',
          kind: 'calc',
          source: 'T_kin = 250 MeV\nBrho = magneticRigidity(momentumFromKinetic(T_kin, m_p), q_e) to T*m',
        },
      ],
    };
    const saved = await api(`/api/sheets/${sheetId}/versions`, {
      method: 'POST',
      body: { parentNumber: 1, message: 'First calculation', content },
    });
    expect(saved).toMatchObject({ status: 201, body: { number: 2, ok: true } });
    const v2 = (await api(`/api/sheets/${sheetId}/versions/2`)).body.version;
    expect(v2.results.cells[0].statements[1].value.unit).toBe('T m');
    expect(v2.engineVersion).toMatch(/^worldsheet-calc /);
    expect(v2.constantsEdition).toBe('CODATA 2022; SI 2019 exact; PDG 2024; AME 2020; IERS 2010');
    // SHA-256 over the RFC 8785 canonical form of the content.
    expect(v2.sha256).toBe(createHash('sha256').update(canonicalize(content)!).digest('hex'));
  });

  it('refuses a save based on a stale version with 409, naming the latest', async () => {
    const stale = await api(`/api/sheets/${sheetId}/versions`, {
      method: 'POST',
      body: { parentNumber: 1, message: 'Edited from an old tab', content: v1.content },
    });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toBe('Version 2 was saved since version 1, which your edits are based on.');
    expect(stale.body.error.details).toMatchObject({
      latestNumber: 2,
      latestSha256: expect.stringMatching(/^[0-9a-f]{64}$/),
    });
    const versions = await api(`/api/sheets/${sheetId}/versions`);
    expect(
      versions.body.versions.map((v: { number: number; parentNumber: number | null }) => [v.number, v.parentNumber]),
    ).toEqual([
      [2, 1],
      [1, null],
    ]);
  });

  it('compares two versions: the added calculation cell and its results', async () => {
    const r = await api(`/api/sheets/${sheetId}/compare?base=1&target=2`);
    expect(r.status).toBe(200);
    expect(r.body.comparison.summary.cells).toMatchObject({ added: 1, removed: 0, changed: 0 });
    expect(r.body.comparison.cells[0]).toMatchObject({ id: 'c1', status: 'added' });
    expect(r.body.comparison.results.map((x: { name: string; status: string }) => [x.name, x.status])).toEqual([
      ['T_kin', 'added'],
      ['Brho', 'added'],
    ]);
    expect((await api(`/api/sheets/${sheetId}/compare?base=7&target=2`)).status).toBe(404);
  });

  it('exports a version as a sheet file that the command-line evaluator reads, and imports it back', async () => {
    const response = await fetch(`${app.baseUrl}/api/sheets/${sheetId}/export?version=2`, {
      headers: { authorization: `Bearer ${token}` },
    });
    expect(response.status).toBe(200);
    expect(response.headers.get('content-disposition')).toBe('attachment; filename="BEAM-CALC-0001-v2.json"');
    const file = await response.json();
    expect(file).toMatchObject({
      title: 'Rigidity of the transfer line',
      cells: [{ id: 'c1', kind: 'calc' }],
      exportedFrom: { sheet: 'BEAM-CALC-0001', version: 2 },
    });
    const { mkdtempSync, writeFileSync } = await import('node:fs');
    const { tmpdir } = await import('node:os');
    const path = `${mkdtempSync(`${tmpdir()}/ws-export-`)}/sheet.json`;
    writeFileSync(path, JSON.stringify(file));
    // Asynchronously: a blocked event loop would miss the server closing idle keep-alive sockets,
    // and the next request would go out on a dead one.
    const { execFile } = await import('node:child_process');
    const { promisify } = await import('node:util');
    const cli = await promisify(execFile)('npm', ['run', '-s', 'calc', '--', path, '--json'], {
      cwd: process.cwd(),
      encoding: 'utf8',
      timeout: 60_000,
    });
    // 250 MeV protons: Bρ = 2.432 13 T m (see tests/e2e/calc.test.ts for the derivation).
    expect(JSON.parse(cli.stdout).values.Brho.value).toBeCloseTo(2.43213, 4);
    const imported = await api(`/api/projects/${projectId}/sheets/import`, { method: 'POST', body: file });
    expect(imported).toMatchObject({ status: 201, body: { code: 'BEAM-CALC-0003', version: 2 } });
    const v = (await api(`/api/sheets/${imported.body.id}/versions/2`)).body.version;
    expect(v.content.cells).toEqual(file.cells);
    expect(
      (await api(`/api/projects/${projectId}/sheets/import`, { method: 'POST', body: { cells: [] } })).status,
    ).toBe(400);
  });

  it('refuses content that is not a sheet, and an unknown sheet or version', async () => {
    expect(
      (
        await api(`/api/sheets/${sheetId}/versions`, {
          method: 'POST',
          body: { parentNumber: 2, message: 'x', content: { cells: 'no' } },
        })
      ).status,
    ).toBe(400);
    expect((await api('/api/sheets/00000000-0000-4000-8000-000000000000')).status).toBe(404);
    expect((await api(`/api/sheets/${sheetId}/versions/99`)).status).toBe(404);
  });

  it('keeps every version byte-identical: the stored hash recomputes from the stored content', async () => {
    const rows = await sql<{
      content: unknown;
      content_hash: string;
    }>`select content, content_hash from versions`.execute(testDb());
    expect(rows.rows.length).toBeGreaterThanOrEqual(3);
    for (const r of rows.rows)
      expect(createHash('sha256').update(canonicalize(r.content)!).digest('hex')).toBe(r.content_hash);
  });

  it('exports a version with its attachments; the import previews it, creating nothing, then brings them back with a new title', async () => {
    const register = await api(`/api/projects/${projectId}/sheets`);
    const tof = register.body.sheets.find((x: { code: string }) => x.code === 'BEAM-CALC-0002');
    const form = new FormData();
    const csv = 'energy [MeV], field [T]\n70, 0.4\n250, 1.3\n';
    form.append('file', new Blob([csv], { type: 'text/csv' }), 'energy-scan.csv');
    const uploaded = await fetch(`${app.baseUrl}/api/sheets/${tof.id}/attachments`, {
      method: 'POST',
      headers: { authorization: `Bearer ${token}` },
      body: form,
    });
    expect(uploaded.status).toBe(201);
    const ref = await uploaded.json();
    const latest = (await api(`/api/sheets/${tof.id}`)).body.version;
    const content = {
      ...latest.content,
      attachments: [{ name: ref.name, mediaType: ref.mediaType, size: ref.size, sha256: ref.sha256 }],
      cells: [{ id: 'c1', kind: 'calc', source: 'T_top = max(energy_scan.energy)' }],
    };
    expect(
      (
        await api(`/api/sheets/${tof.id}/versions`, {
          method: 'POST',
          body: { parentNumber: latest.number, message: 'Scan', content },
        })
      ).status,
    ).toBe(201);

    const plain = await (
      await fetch(`${app.baseUrl}/api/sheets/${tof.id}/export`, { headers: { authorization: `Bearer ${token}` } })
    ).json();
    expect(plain.attachments).toEqual([
      {
        name: 'energy-scan.csv',
        mediaType: 'text/csv',
        size: csv.length,
        sha256: createHash('sha256').update(csv).digest('hex'),
      },
    ]);
    const response = await fetch(`${app.baseUrl}/api/sheets/${tof.id}/export?attachments=include`, {
      headers: { authorization: `Bearer ${token}` },
    });
    expect(response.headers.get('content-disposition')).toBe(
      'attachment; filename="BEAM-CALC-0002-v2-with-attachments.json"',
    );
    const file = await response.json();
    expect(Buffer.from(file.attachments[0].contentBase64, 'base64').toString('utf8')).toBe(csv);

    const before = (await api(`/api/projects/${projectId}/sheets`)).body.sheets.length;
    const preview = await api(`/api/projects/${projectId}/sheets/import/preview`, { method: 'POST', body: file });
    expect(preview).toMatchObject({
      status: 200,
      body: {
        title: 'Time of flight',
        unchangedSinceExport: true,
        exportedFrom: { sheet: 'BEAM-CALC-0002', version: 2 },
        attachments: [{ name: 'energy-scan.csv', carried: true }],
      },
    });
    expect((await api(`/api/projects/${projectId}/sheets`)).body.sheets.length).toBe(before);

    const imported = await api(
      `/api/projects/${projectId}/sheets/import?title=${encodeURIComponent('Time of flight, beam line 2')}`,
      { method: 'POST', body: file },
    );
    expect(imported).toMatchObject({
      status: 201,
      body: { version: 2, attachments: { carried: ['energy-scan.csv'], notCarried: [] } },
    });
    const copy = (await api(`/api/sheets/${imported.body.id}/versions/2`)).body.version;
    expect(copy.content.title).toBe('Time of flight, beam line 2');
    expect(copy.results.cells[0].statements[0].value).toMatchObject({ number: 250, unit: 'MeV' });
    const attachments = (await api(`/api/sheets/${imported.body.id}/attachments`)).body.attachments;
    expect(attachments.map((a: { name: string; sha256: string }) => [a.name, a.sha256])).toEqual([
      ['energy-scan.csv', ref.sha256],
    ]);

    // One changed byte in the carried file: refused, nothing created.
    const tampered = {
      ...file,
      attachments: [
        { ...file.attachments[0], contentBase64: Buffer.from(csv.replace('250', '251')).toString('base64') },
      ],
    };
    const refused = await api(`/api/projects/${projectId}/sheets/import`, { method: 'POST', body: tampered });
    expect(refused.status).toBe(400);
    expect(refused.body.error.message).toMatch(/energy-scan\.csv in the file does not match its record/);
    expect((await api(`/api/projects/${projectId}/sheets`)).body.sheets.length).toBe(before + 1);
  });
});

describe('attachments', () => {
  let sheetId: string;
  const csv = 'energy [MeV], field [T]\n70, 0.5\n250, 1.5\n';

  async function upload(name: string, type: string, data: Uint8Array | string) {
    const form = new FormData();
    form.append('file', new Blob([typeof data === 'string' ? data : new Uint8Array(data)], { type }), name);
    const response = await fetch(`${app.baseUrl}/api/sheets/${sheetId}/attachments`, {
      method: 'POST',
      headers: { authorization: `Bearer ${token}` },
      body: form,
    });
    return { status: response.status, body: await response.json() };
  }

  beforeAll(async () => {
    sheetId = (
      await api(`/api/projects/${projectId}/sheets`, {
        method: 'POST',
        body: { title: 'Energy scan', safetyRelated: false },
      })
    ).body.id;
  });

  it('uploads a CSV table and answers with its SHA-256 and how cells name its columns', async () => {
    const r = await upload('energy scan.csv', 'text/csv', csv);
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({
      name: 'energy scan.csv',
      mediaType: 'text/csv',
      size: csv.length,
      sha256: createHash('sha256').update(csv).digest('hex'),
      table: {
        name: 'energy_scan',
        rows: 2,
        columns: [
          { name: 'energy', unit: 'MeV' },
          { name: 'field', unit: 'T' },
        ],
      },
    });
    const list = await api(`/api/sheets/${sheetId}/attachments`);
    expect(list.body.attachments.map((a: { name: string }) => a.name)).toEqual(['energy scan.csv']);
  });

  it('downloads the exact bytes, as a download, with their SHA-256', async () => {
    const sha = createHash('sha256').update(csv).digest('hex');
    const response = await fetch(`${app.baseUrl}/api/sheets/${sheetId}/attachments/${sha}`, {
      headers: { authorization: `Bearer ${token}` },
    });
    expect(response.status).toBe(200);
    expect(await response.text()).toBe(csv);
    expect(response.headers.get('content-disposition')).toBe(
      `attachment; filename="energy scan.csv"; filename*=UTF-8''energy%20scan.csv`,
    );
    expect(response.headers.get('x-content-type-options')).toBe('nosniff');
    expect(response.headers.get('x-worldsheet-sha256')).toBe(sha);
    expect(
      (
        await fetch(`${app.baseUrl}/api/sheets/${sheetId}/attachments/${'0'.repeat(64)}`, {
          headers: { authorization: `Bearer ${token}` },
        })
      ).status,
    ).toBe(404);
  });

  it('refuses mislabelled (415), oversized (413) and malformed (400) uploads with a clear message', async () => {
    const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0]);
    const mislabelled = await upload('datasheet.pdf', 'application/pdf', png);
    expect(mislabelled.status).toBe(415);
    expect(mislabelled.body.error.message).toMatch(/named as a PDF document but its content is a PNG image/);
    const huge = new Uint8Array(21 * 1024 * 1024);
    huge.set(new TextEncoder().encode('%PDF-1.7\n'));
    const tooBig = await upload('huge.pdf', 'application/pdf', huge);
    expect(tooBig.status).toBe(413);
    const badCsv = await upload('bad.csv', 'text/csv', 'energy [MeV]\n70\nseventy\n');
    expect(badCsv.status).toBe(400);
    expect(badCsv.body.error.message).toBe('bad.csv: row 3, column energy: "seventy" is not a number');
    const notMultipart = await api(`/api/sheets/${sheetId}/attachments`, { method: 'POST', body: { file: 'x' } });
    expect(notMultipart.status).toBe(400);
    const list = await api(`/api/sheets/${sheetId}/attachments`);
    expect(list.body.attachments).toHaveLength(1);
  });

  it('evaluates cells that use the table, and saves a version citing it', async () => {
    const sha = createHash('sha256').update(csv).digest('hex');
    const cells = [
      {
        id: 'c1',
        kind: 'calc',
        source:
          'p = momentumFromKinetic(energy_scan.energy, m_p)\nBrho = magneticRigidity(p, 1) to T*m\nmax(energy_scan.field) * 1 m < Brho[2]',
      },
    ];
    const evaluated = await api('/api/evaluate', {
      method: 'POST',
      body: { cells, sheetId, attachments: [{ name: 'energy scan.csv', sha256: sha }] },
    });
    expect(evaluated.status).toBe(200);
    // 250 MeV protons: Bρ = 2.432 13 T·m (PDG RPP "Kinematics", p = 0.299 792 458 Bρ, m_p from CODATA 2022).
    expect(evaluated.body.cells[0].statements[1].value.text).toBe('[1.231\u202f29, 2.432\u202f13] T·m');
    expect(evaluated.body.cells[0].statements[2].criterion.pass).toBe(true);
    const v1 = (await api(`/api/sheets/${sheetId}`)).body.version;
    const attachment = { name: 'energy scan.csv', mediaType: 'text/csv', size: csv.length, sha256: sha };
    const saved = await api(`/api/sheets/${sheetId}/versions`, {
      method: 'POST',
      body: {
        parentNumber: 1,
        message: 'Rigidity over the scan',
        content: { ...v1.content, cells, attachments: [attachment] },
      },
    });
    expect(saved).toMatchObject({ status: 201, body: { number: 2, ok: true } });
    const v2 = (await api(`/api/sheets/${sheetId}/versions/2`)).body.version;
    expect(v2.content.attachments).toEqual([attachment]);
    // Without the table the same cells fail: the table really is what the cells read.
    const without = await api('/api/evaluate', { method: 'POST', body: { cells } });
    expect(without.body.cells[0].statements[0].error).toBe('`energy_scan` is not defined');
  });

  it('compares any two versions with the calculation record and the attachments: replaced CSV with its row/column diff, an added one, SHA-256 and sizes', async () => {
    // Invented demo data: the scan re-measured (the 250 MeV field corrected, a 300 MeV point added).
    const csv2 = 'energy [MeV], field [T]\n70, 0.5\n250, 1.6\n300, 1.8\n';
    const notes = 'position [m], loss [W]\n1, 0.5\n';
    expect((await upload('energy scan.csv', 'text/csv', csv2)).status).toBe(201);
    expect((await upload('beam-losses.csv', 'text/csv', notes)).status).toBe(201);
    const v2 = (await api(`/api/sheets/${sheetId}/versions/2`)).body.version;
    const sha = (t: string) => createHash('sha256').update(t).digest('hex');
    const content = {
      ...v2.content,
      safetyRelated: true,
      significantFigures: 4,
      record: {
        ...v2.content.record,
        conclusions: 'The dipole reaches the rigidity of the whole scan.',
        inputs: [{ name: 'Scan energies', value: '70 to 300 MeV', source: 'Beam request BR-7', sourceRevision: 'B' }],
        assumptions: [{ text: 'Fields measured at 20 °C', needsVerification: true }],
        references: ['PDG RPP, Kinematics'],
      },
      attachments: [
        { name: 'energy scan.csv', mediaType: 'text/csv', size: csv2.length, sha256: sha(csv2) },
        { name: 'beam-losses.csv', mediaType: 'text/csv', size: notes.length, sha256: sha(notes) },
      ],
    };
    expect(
      (
        await api(`/api/sheets/${sheetId}/versions`, {
          method: 'POST',
          body: { parentNumber: 2, message: 'Re-measured scan', content },
        })
      ).status,
    ).toBe(201);
    // Version 4 only changes a design input's source revision: 1 → 4 skips two versions.
    const v4content = {
      ...content,
      record: { ...content.record, inputs: [{ ...content.record.inputs[0], sourceRevision: 'C' }] },
    };
    expect(
      (
        await api(`/api/sheets/${sheetId}/versions`, {
          method: 'POST',
          body: { parentNumber: 3, message: 'Beam request revision C', content: v4content },
        })
      ).status,
    ).toBe(201);

    const r = await api(`/api/sheets/${sheetId}/compare?base=2&target=4`);
    expect(r.status).toBe(200);
    const { record } = r.body.comparison;
    expect(record.fields.map((f: { field: string }) => f.field)).toEqual([
      'safetyRelated',
      'significantFigures',
      'conclusions',
    ]);
    expect(record.fields[0]).toMatchObject({ old: false, new: true });
    expect(record.fields[1]).toMatchObject({ old: 6, new: 4 });
    expect(record.inputs).toEqual([
      { key: 'Scan energies', status: 'added', old: null, new: v4content.record.inputs[0], changedFields: [] },
    ]);
    expect(record.assumptions).toMatchObject([
      { key: 'Fields measured at 20 °C', status: 'added', new: { needsVerification: true } },
    ]);
    expect(record.references).toMatchObject([{ key: 'PDG RPP, Kinematics', status: 'added' }]);
    const replaced = record.attachments.find((a: { key: string }) => a.key === 'energy scan.csv');
    expect(replaced).toMatchObject({
      status: 'changed',
      changedFields: ['sha256', 'size'],
      old: { size: csv.length, sha256: sha(csv) },
      new: { size: csv2.length, sha256: sha(csv2) },
      table: {
        oldRows: 2,
        newRows: 3,
        rowCounts: { added: 1, removed: 0, changed: 1 },
        rows: [
          { status: 'changed', oldRow: 2, newRow: 2, old: [250, 1.5], new: [250, 1.6], changedColumns: ['field'] },
          { status: 'added', oldRow: null, newRow: 3, old: null, new: [300, 1.8], changedColumns: [] },
        ],
      },
    });
    expect(record.attachments.find((a: { key: string }) => a.key === 'beam-losses.csv')).toMatchObject({
      status: 'added',
      new: { sha256: sha(notes), size: notes.length },
      table: { newRows: 1 },
    });
    expect(r.body.comparison.summary).toMatchObject({ attachmentChanges: 2 });

    // Any pair, either way round: 4 → 3 differs only by the source revision.
    const back = await api(`/api/sheets/${sheetId}/compare?base=4&target=3`);
    expect(back.body.comparison.record).toMatchObject({
      fields: [],
      attachments: [],
      inputs: [
        {
          key: 'Scan energies',
          status: 'changed',
          changedFields: ['sourceRevision'],
          old: { sourceRevision: 'C' },
          new: { sourceRevision: 'B' },
        },
      ],
    });
  });
});

describe('submission over HTTP', () => {
  it('refuses to submit a version with an evaluation error until each item is acknowledged in writing, then accepts it', async () => {
    const author = await testDb()
      .selectFrom('users')
      .select('id')
      .where('email', '=', 'author@example.test')
      .executeTakeFirstOrThrow();
    const checker = await makeUser(testDb(), 'checker@example.test');
    const acks = await makeProject(testDb(), 'ACKS', [
      [{ userId: author.id } as never, 'originator'],
      [checker, 'checker'],
    ]);
    const created = await api(`/api/projects/${acks}/sheets`, {
      method: 'POST',
      body: { title: 'Muon decay length', safetyRelated: false },
    });
    const v1 = (await api(`/api/sheets/${created.body.id}`)).body.version;
    // A deliberate dimension error in the second line.
    const content = {
      ...v1.content,
      cells: [{ id: 'c1', kind: 'calc', source: 'L_dec = decayLength(1 GeV, m_mu, 2.1969811 us)\nbad = 2 m + 3 s' }],
    };
    expect(
      (
        await api(`/api/sheets/${created.body.id}/versions`, {
          method: 'POST',
          body: { parentNumber: 1, message: 'with an error', content },
        })
      ).status,
    ).toBe(201);

    const refused = await api(`/api/sheets/${created.body.id}/checks`, {
      method: 'POST',
      body: { versionNumber: 2, checkerId: checker.userId, password: PASSWORD },
    });
    expect(refused.status).toBe(400);
    expect(refused.body.error.message).toMatch(
      /^Version 2 has an item to acknowledge in writing before it can be submitted: cell 1, line 2 \(bad = 2 m \+ 3 s\)/,
    );
    const needed = refused.body.error.details.acknowledgementsNeeded as Array<{ key: string; kind: string }>;
    expect(needed.map((f) => f.kind)).toEqual(['cell-error']);
    // An empty acknowledgement is not one.
    const blank = await api(`/api/sheets/${created.body.id}/checks`, {
      method: 'POST',
      body: {
        versionNumber: 2,
        checkerId: checker.userId,
        password: PASSWORD,
        acknowledgements: [{ key: needed[0].key, text: '  ' }],
      },
    });
    expect(blank.status).toBe(400);
    expect(await testDb().selectFrom('checks').select('id').execute()).toEqual([]);

    const accepted = await api(`/api/sheets/${created.body.id}/checks`, {
      method: 'POST',
      body: {
        versionNumber: 2,
        checkerId: checker.userId,
        password: PASSWORD,
        acknowledgements: [{ key: needed[0].key, text: 'A scratch line; the checker may ignore it.' }],
      },
    });
    expect(accepted.status).toBe(201);
    const stored = await testDb().selectFrom('checks').select('acknowledgements').executeTakeFirstOrThrow();
    expect(stored.acknowledgements).toEqual([
      expect.objectContaining({
        key: needed[0].key,
        kind: 'cell-error',
        text: 'A scratch line; the checker may ignore it.',
      }),
    ]);
  });
});
