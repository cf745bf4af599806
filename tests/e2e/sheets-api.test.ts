// The sheet and version API against the real database, through the production server.
import { createHash } from 'node:crypto';
import canonicalize from 'canonicalize';
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApiToken } from '../../lib/auth/api-tokens';
import { resetDatabase, testDb } from '../support/database';
import { makeProject, makeUser } from '../support/people';
import { startApp, type RunningApp } from './harness';

let app: RunningApp;
let token: string;
let projectId: string;

async function api(path: string, init: { method?: string; body?: unknown } = {}) {
  const response = await fetch(`${app.baseUrl}${path}`, {
    method: init.method ?? 'GET',
    headers: { authorization: `Bearer ${token}`, ...(init.body !== undefined ? { 'content-type': 'application/json' } : {}) },
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
    const a = await api(`/api/projects/${projectId}/sheets`, { method: 'POST', body: { title: 'Rigidity of the transfer line', safetyRelated: true, objective: 'Dipole field' } });
    const b = await api(`/api/projects/${projectId}/sheets`, { method: 'POST', body: { title: 'Time of flight', safetyRelated: false } });
    expect(a).toMatchObject({ status: 201, body: { number: 1, code: 'BEAM-CALC-0001' } });
    expect(b).toMatchObject({ status: 201, body: { number: 2, code: 'BEAM-CALC-0002' } });
    sheetId = a.body.id;
    const register = await api(`/api/projects/${projectId}/sheets`);
    expect(register.body.sheets.map((s: { code: string; latestVersion: number }) => [s.code, s.latestVersion])).toEqual([
      ['BEAM-CALC-0001', 1],
      ['BEAM-CALC-0002', 1],
    ]);
    v1 = (await api(`/api/sheets/${sheetId}`)).body.version;
  });

  it('saves a version with its evaluation, hash, engine version and constants edition', async () => {
    const content = { ...v1.content, cells: [{ id: 'c1', kind: 'calc', source: 'T_kin = 250 MeV\nBrho = magneticRigidity(momentumFromKinetic(T_kin, m_p), q_e) to T*m' }] };
    const saved = await api(`/api/sheets/${sheetId}/versions`, { method: 'POST', body: { parentNumber: 1, message: 'First calculation', content } });
    expect(saved).toMatchObject({ status: 201, body: { number: 2, ok: true } });
    const v2 = (await api(`/api/sheets/${sheetId}/versions/2`)).body.version;
    expect(v2.results.cells[0].statements[1].value.unit).toBe('T m');
    expect(v2.engineVersion).toMatch(/^worldsheet-calc /);
    expect(v2.constantsEdition).toBe('CODATA 2022; SI 2019 exact constants');
    // SHA-256 over the RFC 8785 canonical form of the content.
    expect(v2.sha256).toBe(createHash('sha256').update(canonicalize(content)!).digest('hex'));
  });

  it('refuses a save based on a stale version with 409, naming the latest', async () => {
    const stale = await api(`/api/sheets/${sheetId}/versions`, { method: 'POST', body: { parentNumber: 1, message: 'Edited from an old tab', content: v1.content } });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toBe('Version 2 was saved since version 1, which your edits are based on.');
    expect(stale.body.error.details).toMatchObject({ latestNumber: 2, latestSha256: expect.stringMatching(/^[0-9a-f]{64}$/) });
    const versions = await api(`/api/sheets/${sheetId}/versions`);
    expect(versions.body.versions.map((v: { number: number; parentNumber: number | null }) => [v.number, v.parentNumber])).toEqual([
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
    const response = await fetch(`${app.baseUrl}/api/sheets/${sheetId}/export?version=2`, { headers: { authorization: `Bearer ${token}` } });
    expect(response.status).toBe(200);
    expect(response.headers.get('content-disposition')).toBe('attachment; filename="BEAM-CALC-0001-v2.json"');
    const file = await response.json();
    expect(file).toMatchObject({ title: 'Rigidity of the transfer line', cells: [{ id: 'c1', kind: 'calc' }], exportedFrom: { sheet: 'BEAM-CALC-0001', version: 2 } });
    const { mkdtempSync, writeFileSync } = await import('node:fs');
    const { tmpdir } = await import('node:os');
    const path = `${mkdtempSync(`${tmpdir()}/ws-export-`)}/sheet.json`;
    writeFileSync(path, JSON.stringify(file));
    const { spawnSync } = await import('node:child_process');
    const cli = spawnSync('npm', ['run', '-s', 'calc', '--', path, '--json'], { cwd: process.cwd(), encoding: 'utf8', timeout: 60_000 });
    expect(cli.status).toBe(0);
    // 250 MeV protons: Bρ = 2.432 13 T m (see tests/e2e/calc.test.ts for the derivation).
    expect(JSON.parse(cli.stdout).values.Brho.value).toBeCloseTo(2.43213, 4);
    const imported = await api(`/api/projects/${projectId}/sheets/import`, { method: 'POST', body: file });
    expect(imported).toMatchObject({ status: 201, body: { code: 'BEAM-CALC-0003', version: 2 } });
    const v = (await api(`/api/sheets/${imported.body.id}/versions/2`)).body.version;
    expect(v.content.cells).toEqual(file.cells);
    expect((await api(`/api/projects/${projectId}/sheets/import`, { method: 'POST', body: { cells: [] } })).status).toBe(400);
  });

  it('refuses content that is not a sheet, and an unknown sheet or version', async () => {
    expect((await api(`/api/sheets/${sheetId}/versions`, { method: 'POST', body: { parentNumber: 2, message: 'x', content: { cells: 'no' } } })).status).toBe(400);
    expect((await api('/api/sheets/00000000-0000-4000-8000-000000000000')).status).toBe(404);
    expect((await api(`/api/sheets/${sheetId}/versions/99`)).status).toBe(404);
  });

  it('keeps every version byte-identical: the stored hash recomputes from the stored content', async () => {
    const rows = await sql<{ content: unknown; content_hash: string }>`select content, content_hash from versions`.execute(testDb());
    expect(rows.rows.length).toBeGreaterThanOrEqual(3);
    for (const r of rows.rows) expect(createHash('sha256').update(canonicalize(r.content)!).digest('hex')).toBe(r.content_hash);
  });
});
