// An approved sheet, the starting point of every issuing test: four people (author, checker,
// approver, document controller) as members of one project, a sheet, and a version taken through
// check and approval. Built in layers, so that a test needing only part of it takes that part
// (the browser tests take their people and sheets from the demo seed and use checkAndApprove).
import type { Kysely } from 'kysely';
import type { Database, VerificationMethod } from '../../db/schema';
import type { Actor } from '../../lib/auth/actor';
import { decide } from '../../lib/checks/decide';
import { saveCheckWork } from '../../lib/checks/work';
import { submitForCheck } from '../../lib/checks/submit';
import type { Cell } from '../../lib/sheets/content';
import { createSheet, getVersion, saveVersion } from '../../lib/sheets/sheets';
import { makeProject, makeUser, PASSWORD } from './people';

export interface Team {
  author: Actor;
  checker: Actor;
  approver: Actor;
  controller: Actor;
}

/** A sheet as the workflow and issuing functions take it. */
export interface SheetRef {
  id: string;
  project_id: string;
  number: number;
  title: string;
}

/**
 * author@, checker@, approver@ and controller@`domain` (password PASSWORD), members of a new project
 * `code` as originator, checker, approver and controller.
 */
export async function makeTeam(
  db: Kysely<Database>,
  options: { code: string; domain?: string },
): Promise<Team & { projectId: string }> {
  const domain = options.domain ?? 'example.test';
  const [author, checker, approver, controller] = await Promise.all(
    ['author', 'checker', 'approver', 'controller'].map((n) => makeUser(db, `${n}@${domain}`)),
  );
  const projectId = await makeProject(db, options.code, [
    [author, 'originator'],
    [checker, 'checker'],
    [approver, 'approver'],
    [controller, 'controller'],
  ]);
  return { author, checker, approver, controller, projectId };
}

/** A new sheet (with its version 1) created by `author`. */
export async function makeSheet(
  db: Kysely<Database>,
  author: Actor,
  project: { id: string; code: string },
  input: { title: string; safetyRelated?: boolean; objective?: string },
): Promise<SheetRef> {
  const created = await createSheet(db, author, project, {
    title: input.title,
    safetyRelated: input.safetyRelated ?? false,
    objective: input.objective ?? '',
  });
  return { id: created.id, project_id: project.id, number: created.number, title: input.title };
}

/**
 * Submits version `versionNumber` to the checker (signed "prepared" by the author), who records the
 * verification method (design review unless told) and signs it "checked"; the approver approves it.
 * Every signature uses `password` (PASSWORD unless told). Returns the check's id.
 */
export async function checkAndApprove(
  db: Kysely<Database>,
  people: Pick<Team, 'author' | 'checker' | 'approver'>,
  sheet: SheetRef,
  options: { versionNumber: number; password?: string; verificationMethod?: VerificationMethod },
): Promise<string> {
  const password = options.password ?? PASSWORD;
  const { id } = await submitForCheck(db, people.author, sheet, {
    versionNumber: options.versionNumber,
    checkerId: people.checker.userId,
    password,
  });
  await saveCheckWork(db, people.checker, id, { verificationMethod: options.verificationMethod ?? 'design_review' });
  await decide(db, people.checker, id, { action: 'sign', password });
  await decide(db, people.approver, id, { action: 'approve', password });
  return id;
}

/**
 * The author saves `cells` as a new version on top of the latest one, which then goes through check
 * and approval (checkAndApprove). Returns the new version's number.
 */
export async function approveNewVersion(
  db: Kysely<Database>,
  team: Pick<Team, 'author' | 'checker' | 'approver'>,
  sheet: SheetRef,
  input: { message: string; cells: Cell[] },
): Promise<number> {
  const latest = (await getVersion(db, sheet.id))!;
  const saved = await saveVersion(db, team.author, sheet, {
    parentNumber: latest.number,
    message: input.message,
    content: { ...latest.content, cells: input.cells },
  });
  await checkAndApprove(db, team, sheet, { versionNumber: saved.number });
  return saved.number;
}

/**
 * The whole world of an issuing test: a team (makeTeam) in project TPT2 and its sheet "Time of
 * flight", whose version 2 (one time-of-flight cell) is approved and ready to issue.
 */
export async function approvedSheet(db: Kysely<Database>): Promise<Team & { projectId: string; sheet: SheetRef }> {
  const team = await makeTeam(db, { code: 'TPT2' });
  const sheet = await makeSheet(db, team.author, { id: team.projectId, code: 'TPT2' }, { title: 'Time of flight' });
  await approveNewVersion(db, team, sheet, {
    message: 'flight time',
    cells: [{ id: 'c1', kind: 'calc', source: 'L = 12.5 m\nt_f = L / speedFromKinetic(150 MeV, m_p) to ns' }],
  });
  return { ...team, sheet };
}
