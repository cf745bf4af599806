// The decisions on a check as one table: for each decision, the state it is taken in, the state it
// leads to, who takes it (the checker named on the check, or an approver of the project, each under
// the independence rules of rules.ts), the signature it records and whether it needs a reason.
// Pure: decide() (decide.ts) moves a check by this table, the policy (policy.ts) offers a decision
// only in its `from` state, and the tests read it.
import type { CheckState, SignatureMeaning } from '@/db/schema';
import type { Decision } from './workflow';

export type DecisionAction = Decision['action'];

export interface Transition {
  /** The only state the decision is taken in. */
  from: CheckState;
  /** The state it moves the check to. */
  to: CheckState;
  /** Who takes it: the checker named on the check, or an approver of the project. */
  by: 'checker' | 'approver';
  /** The signature it records on the version under check (the password is asked again), or null. */
  signs: Extract<SignatureMeaning, 'checked' | 'approved'> | null;
  /** Whether it needs a written reason (kept as the check's return reason). */
  needsReason: boolean;
  /** Whether it closes the check (a checked check stays open for its approver). */
  closes: boolean;
  /** "This check is …; it cannot be {verb} now." */
  verb: string;
  /** "Only …, the checker named on this check, can {what}." */
  what: string;
}

export const TRANSITIONS: Readonly<Record<DecisionAction, Transition>> = {
  return: {
    from: 'in_check',
    to: 'returned',
    by: 'checker',
    signs: null,
    needsReason: true,
    closes: true,
    verb: 'returned',
    what: 'return it',
  },
  sign: {
    from: 'in_check',
    to: 'checked',
    by: 'checker',
    signs: 'checked',
    needsReason: false,
    closes: false,
    verb: 'signed as checked',
    what: 'sign it as checked',
  },
  approve: {
    from: 'checked',
    to: 'approved',
    by: 'approver',
    signs: 'approved',
    needsReason: false,
    closes: true,
    verb: 'approved',
    what: 'approve it',
  },
  reject: {
    from: 'checked',
    to: 'approval_returned',
    by: 'approver',
    signs: null,
    needsReason: true,
    closes: true,
    verb: 'returned by an approver',
    what: 'return it to the originator',
  },
};

/** The decisions in the order the screens offer them. */
export const DECISIONS = Object.keys(TRANSITIONS) as DecisionAction[];
