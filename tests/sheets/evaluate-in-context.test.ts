// The three ways the server evaluates cells in a sheet's context (POST /api/evaluate, saving a
// version, the checker's alternate cells) go through one evaluateInContext
// (lib/sheets/evaluate-in-context.ts): the same cells under the sheet's settings show the same
// results by all three, and a calculation source holding a bidirectional control character is
// refused by all three, whether or not the caller parsed a schema first.
import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { Actor } from '../../lib/auth/actor';
import type { SheetResult } from '../../lib/calc/types';
import { getCheckDetail } from '../../lib/checks/queries';
import { saveCheckWork } from '../../lib/checks/work';
import { submitForCheck } from '../../lib/checks/submit';
import { AppError } from '../../lib/errors/app-error';
import { createSheet, getVersion, saveVersion } from '../../lib/sheets/sheets';
import { testDb } from '../support/database';
import { makeProject, makeUser, PASSWORD } from '../support/people';
import { refusal } from '../support/refusal';

// The route asks lib/auth/current-actor who is calling (a session cookie or a token through
// next/headers, which exists only inside Next): here the caller is `caller`, a member of the
// projects the test database says.
let caller: Actor;
vi.mock('server-only', () => ({}));
vi.mock('@/lib/auth/current-actor', async () => {
  const { AppError: Refusal } = await import('../../lib/errors/app-error');
  const { testDb: db } = await import('../support/database');
  return {
    requireActor: async () => caller,
    requireProjectRole: async (projectId: string) => {
      const project = await db()
        .selectFrom('projects')
        .select(['id', 'code', 'name', 'legal_owner', 'revision_scheme'])
        .where('id', '=', projectId)
        .executeTakeFirstOrThrow();
      const roles = (
        await db()
          .selectFrom('project_members')
          .select('role')
          .where('project_id', '=', projectId)
          .where('user_id', '=', caller.userId)
          .execute()
      ).map((r) => r.role);
      if (roles.length === 0) throw new Refusal('not_found', 'No such project, or you are not a member of it.');
      return { actor: caller, project, roles };
    },
  };
});
const { POST } = await import('../../app/api/evaluate/route');

function evaluateRoute(body: unknown): Promise<Response> {
  return POST(
    new Request('http://localhost/api/evaluate', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify(body),
    }),
  );
}

/** Every statement's displayed text, cell by cell. */
const shown = (r: SheetResult) => r.cells.map((c) => c.statements.map((s) => s.value?.text ?? s.error));

// The proton's rest energy in the sheet's trade units, and a plain fraction: m_p c² = 938.272 089 43 MeV
// (CODATA 2022), 938.3 MeV to 4 significant figures; 2/3 = 0.6667 to 4 (common practice).
const CELLS = [{ id: 'c1', kind: 'calc' as const, source: 'E_p = m_p * c^2\nf = 2 / 3' }];
const RLO = '\u202e';
const TROJAN = [{ id: 'c1', kind: 'calc' as const, source: `f = 2 / 3 # ${RLO} checked` }];

let author: Actor;
let checker: Actor;
let sheet: { id: string; project_id: string; number: number; title: string };

beforeEach(async () => {
  const db = testDb();
  author = await makeUser(db, 'author@example.test');
  checker = await makeUser(db, 'checker@example.test');
  const projectId = await makeProject(db, 'EVAL', [
    [author, 'originator'],
    [checker, 'checker'],
  ]);
  const created = await createSheet(
    db,
    author,
    { id: projectId, code: 'EVAL' },
    { title: 'Proton rest energy', safetyRelated: false, objective: '' },
  );
  sheet = { id: created.id, project_id: projectId, number: created.number, title: 'Proton rest energy' };
  const v1 = (await getVersion(db, sheet.id, 1))!;
  // The sheet's settings: 4 significant figures, trade units (not the 6 and SI of a bare evaluation).
  await saveVersion(db, author, sheet, {
    parentNumber: 1,
    message: 'the rest energy',
    content: { ...v1.content, significantFigures: 4, displayUnits: 'trade', cells: CELLS },
  });
});

describe('the same cells under the sheet settings show the same results by all three callers', () => {
  it('POST /api/evaluate, the saved version and the alternate cells of a check agree', async () => {
    const db = testDb();
    caller = author;
    const response = await evaluateRoute({
      cells: CELLS,
      significantFigures: 4,
      displayUnits: 'trade',
      sheetId: sheet.id,
    });
    expect(response.status).toBe(200);
    const viaRoute = shown((await response.json()) as SheetResult);
    expect(viaRoute).toEqual([['938.3 MeV', '0.6667']]);

    const saved = (await getVersion(db, sheet.id, 2))!;
    expect(shown(saved.results!)).toEqual(viaRoute);

    const check = await submitForCheck(db, author, sheet, {
      versionNumber: 2,
      checkerId: checker.userId,
      password: PASSWORD,
    });
    await saveCheckWork(db, checker, check.id, { alternateCells: CELLS, tolerance: '1e-9' });
    const detail = await getCheckDetail(db, checker, check.id);
    expect(shown(detail.alternateResults!)).toEqual(viaRoute);
    // The comparison shows the two side by side as the version shows them, and finds them equal.
    expect(detail.alternateComparison!.rows.map((r) => [r.name, r.sheet, r.alternate, r.status])).toEqual([
      ['E_p', '938.3 MeV', '938.3 MeV', 'within'],
      ['f', '0.6667', '0.6667', 'within'],
    ]);
  });
});

describe('a calculation source holding a bidirectional control character is refused by all three', () => {
  const REFUSAL = /^cell 1: holds U\+202E \(RIGHT-TO-LEFT OVERRIDE\) on line 1, /;

  it('POST /api/evaluate answers 400', async () => {
    caller = author;
    const response = await evaluateRoute({ cells: TROJAN, sheetId: sheet.id });
    expect(response.status).toBe(400);
    expect(((await response.json()) as { error: { message: string } }).error.message).toMatch(
      /^cells\.0\.source: cell 1: holds U\+202E/,
    );
  });

  it('a save and the alternate cells refuse it with 400 even without the schema, and store nothing', async () => {
    const db = testDb();
    const v2 = (await getVersion(db, sheet.id, 2))!;
    const save = await refusal(
      saveVersion(db, author, sheet, { parentNumber: 2, message: 'edit', content: { ...v2.content, cells: TROJAN } }),
    );
    expect(save).toBeInstanceOf(AppError);
    expect(save).toMatchObject({ status: 400 });
    expect(save.message).toMatch(REFUSAL);
    expect((await getVersion(db, sheet.id))!.number).toBe(2);

    const check = await submitForCheck(db, author, sheet, {
      versionNumber: 2,
      checkerId: checker.userId,
      password: PASSWORD,
    });
    const alternate = await refusal(saveCheckWork(db, checker, check.id, { alternateCells: TROJAN }));
    expect(alternate).toMatchObject({ status: 400 });
    expect(alternate.message).toMatch(REFUSAL);
    const stored = await db
      .selectFrom('checks')
      .select(['alternate_cells', 'alternate_results'])
      .where('id', '=', check.id)
      .executeTakeFirstOrThrow();
    expect(stored).toEqual({ alternate_cells: [], alternate_results: null });
  });
});
