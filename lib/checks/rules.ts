// The independence rules of checking and approval (ASME NQA-1 Requirement 3 §500; ISO 9001 §8.3.4;
// the product brief's "Workflow"), as pure functions of who did what, so that the server enforces
// them in one place and the tests can name each one.
import type { ProjectRole } from '@/db/schema';

export type RuleId = 'checker-role' | 'checker-not-originator' | 'approver-role' | 'approver-not-originator' | 'safety-approver-not-checker';

export const RULES: Record<RuleId, string> = {
  'checker-role': 'The checker must hold the checker role in the project.',
  'checker-not-originator':
    'The checker must not be an originator of any version since the last approved one (ASME NQA-1 Requirement 3 §500: checked by someone other than its originator).',
  'approver-role': 'The approver must hold the approver role in the project.',
  'approver-not-originator': 'The approver must not be an originator of any version since the last approved one.',
  'safety-approver-not-checker': 'On a safety-related sheet the approver must be someone other than the checker.',
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

/** Why `person` may not check a version whose originators (since the last approved version) are `originators`. */
export function checkerRefusal(person: Person, originators: ReadonlySet<string>): Refusal | null {
  if (!person.roles.includes('checker')) return { rule: 'checker-role', message: `${person.name} cannot check: ${RULES['checker-role']}` };
  if (originators.has(person.userId)) {
    return { rule: 'checker-not-originator', message: `${person.name} cannot check this version: they saved a version of it since the last approved one. ${RULES['checker-not-originator']}` };
  }
  return null;
}

export function approverRefusal(person: Person, originators: ReadonlySet<string>, checkerId: string, safetyRelated: boolean): Refusal | null {
  if (!person.roles.includes('approver')) return { rule: 'approver-role', message: `${person.name} cannot approve: ${RULES['approver-role']}` };
  if (originators.has(person.userId)) {
    return { rule: 'approver-not-originator', message: `${person.name} cannot approve this version: they saved a version of it since the last approved one. ${RULES['approver-not-originator']}` };
  }
  if (safetyRelated && person.userId === checkerId) {
    return { rule: 'safety-approver-not-checker', message: `${person.name} checked this version and cannot also approve it. ${RULES['safety-approver-not-checker']}` };
  }
  return null;
}
