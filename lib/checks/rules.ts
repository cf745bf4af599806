// The independence rules of checking and approval (ASME NQA-1 Requirement 3 §500; ISO 9001 §8.3.4;
// the product brief's "Workflow"), as pure functions of who did what, so that the server enforces
// them in one place and the tests can name each one. They count everyone who authored or signed
// anything on the version under check: the authors of every version since the last approved one
// (those saved after the version under check too), whoever submitted it (signed it "prepared") and
// whoever checked it; the safety rule reads the flag recorded in the version under check.
import type { CheckState, ProjectRole } from '@/db/schema';

export type RuleId =
  | 'checker-role'
  | 'checker-not-preparer'
  | 'checker-not-originator'
  | 'approver-role'
  | 'approver-not-preparer'
  | 'approver-not-originator'
  | 'safety-approver-not-checker';

const RULES: Record<RuleId, string> = {
  'checker-role': 'The checker must hold the checker role in the project.',
  'checker-not-preparer':
    'The checker must be someone other than the person who submits the version and signs it prepared.',
  'checker-not-originator':
    'The checker must not be an originator of any version since the last approved one (ASME NQA-1 Requirement 3 §500: checked by someone other than its originator).',
  'approver-role': 'The approver must hold the approver role in the project.',
  'approver-not-preparer':
    'The approver must be someone other than the person who submitted the version and signed it prepared.',
  'approver-not-originator': 'The approver must not be an originator of any version since the last approved one.',
  'safety-approver-not-checker':
    'On a safety-related version the approver must be someone other than the checker: three different people prepare, check and approve it.',
};

export interface Refusal {
  rule: RuleId;
  /** The rule, and why it applies to this person. */
  message: string;
}

export interface Person {
  userId: string;
  name: string;
  roles: readonly ProjectRole[];
}

/** Who authored or signed anything on the version under check, and the safety flag it records. */
export interface Participants {
  /** Everyone who saved a version of the sheet since the last approved one, before or after the version under check. */
  originators: ReadonlySet<string>;
  /** Whoever submits or submitted the version under check (signed it "prepared"). */
  preparers: ReadonlySet<string>;
  /** The checker named on the check, and whoever signed the version "checked" in an earlier check. */
  checkers: ReadonlySet<string>;
  /** The safety flag recorded in the version under check (not the sheet's current one). */
  safetyRelated: boolean;
}

/** Why `person` may not check the version, or null. */
export function checkerRefusal(person: Person, who: Pick<Participants, 'originators' | 'preparers'>): Refusal | null {
  if (!person.roles.includes('checker'))
    return { rule: 'checker-role', message: `${person.name} cannot check: ${RULES['checker-role']}` };
  if (who.originators.has(person.userId)) {
    return {
      rule: 'checker-not-originator',
      message: `${person.name} cannot check this version: they saved a version of it since the last approved one. ${RULES['checker-not-originator']}`,
    };
  }
  if (who.preparers.has(person.userId)) {
    return {
      rule: 'checker-not-preparer',
      message: `${person.name} cannot check this version: they are its preparer (they submit it for check, signing it prepared). ${RULES['checker-not-preparer']}`,
    };
  }
  return null;
}

/** Why `person` may not approve (or return as approver) the version, or null. */
export function approverRefusal(person: Person, who: Participants): Refusal | null {
  if (!person.roles.includes('approver'))
    return { rule: 'approver-role', message: `${person.name} cannot approve: ${RULES['approver-role']}` };
  if (who.originators.has(person.userId)) {
    return {
      rule: 'approver-not-originator',
      message: `${person.name} cannot approve this version: they saved a version of it since the last approved one. ${RULES['approver-not-originator']}`,
    };
  }
  if (who.preparers.has(person.userId)) {
    return {
      rule: 'approver-not-preparer',
      message: `${person.name} cannot approve this version: they are its preparer (they submitted it for check, signing it prepared). ${RULES['approver-not-preparer']}`,
    };
  }
  if (who.safetyRelated && who.checkers.has(person.userId)) {
    return {
      rule: 'safety-approver-not-checker',
      message: `${person.name} checked this version and cannot also approve it. ${RULES['safety-approver-not-checker']}`,
    };
  }
  return null;
}

/**
 * Who may answer a check's comment threads: its people only — the person who submitted it, its
 * checker, and its approver once one has acted (who returned it) — not every originator of the project.
 */
export function mayAnswerThreads(
  check: { submitted_by: string; checker_id: string; decided_by: string | null; state: CheckState },
  userId: string,
): boolean {
  if (userId === check.submitted_by || userId === check.checker_id) return true;
  const approver = check.state === 'approved' || check.state === 'approval_returned' ? check.decided_by : null;
  return approver !== null && userId === approver;
}
