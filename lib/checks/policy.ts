// What a person may do to a check now, and why not: one pure function of the check, the person,
// their roles in the project and a few facts read from the database (who authored or signed the
// version, open threads, whether the sheet was submitted again, work carried over). The mutations
// refuse with its answer (the same message, HTTP status and details), the read model returns its
// answers, and the check view only renders them. The independence rules themselves stay in
// rules.ts; the decisions' states come from the transition table (transitions.ts).
import type { CheckState, ProjectRole, VerificationMethod } from '@/db/schema';
import type { AppErrorCode } from '@/lib/errors/app-error';
import { carriedFieldsText, unconfirmedCarriedOver, type CarriedOver } from './carried-over';
import { approverRefusal, checkerRefusal, mayAnswerThreads, type Participants, type RuleId } from './rules';
import { DECISIONS, TRANSITIONS, type DecisionAction } from './transitions';
import { STATE_LABELS } from './workflow';

/** Everything a person may do to a check (submitting a version for check is done to a sheet: submit.ts). */
export const CHECK_ACTIONS = [
  /** Open a comment thread on a cell. */
  'openThread',
  /** Reply to an open thread. */
  'reply',
  /** Resolve an open thread. */
  'resolveThread',
  /** Record the verification method, notes, alternate calculation and tolerance. */
  'recordWork',
  /** Confirm the work carried over from the returned check of an earlier version. */
  'confirmCarriedOver',
  ...DECISIONS,
] as const;
type CheckAction = (typeof CHECK_ACTIONS)[number];

/** Why an action is refused, as the server answers it. */
export interface Denial {
  /** In plain words, naming the rule and why it applies. */
  reason: string;
  /** The error the mutation answers with (403, 409, 400). */
  code: Extract<AppErrorCode, 'forbidden' | 'conflict' | 'bad_request'>;
  /** The independence rule behind a refusal (403 with `details.rule`, audited as `workflow.refused`). */
  rule?: RuleId;
  details?: Record<string, unknown>;
}

export type Answer =
  | { allowed: true }
  | (Denial & {
      allowed: false;
      /**
       * The action is this person's to take in this state but waits for work on the check (signing
       * waits for open threads, the method, carried-over work, the tolerance): every such item, the
       * first of which is `reason`. The screens still offer the action, listing them.
       */
      waitingFor?: Denial[];
    });

export type CheckPolicy = Record<CheckAction, Answer>;

/** The check's own fields the policy reads (a row of `checks`). */
export interface PolicyCheck {
  state: CheckState;
  submitted_by: string;
  checker_id: string;
  decided_by: string | null;
  verification_method: VerificationMethod | null;
}

/** What the policy needs to know beyond the check's row, read by `policyFacts` (context.ts). */
export interface PolicyFacts {
  /** Who authored or signed anything on the version under check, and its safety flag. */
  participants: Participants;
  /** The checker named on the check, by name. */
  checkerName: string;
  /** Comment threads the check carries that are still open. */
  openThreads: number;
  /** Whether the sheet was submitted for check again after this check. */
  submittedAgain: boolean;
  /** Work carried over from the returned check of an earlier version. */
  carriedOver: CarriedOver | null;
  /** The alternate calculation shares names with the sheet and no tolerance is stated. */
  toleranceMissing: boolean;
}

export interface PolicyActor {
  userId: string;
  name: string;
}

const allowed: Answer = { allowed: true };
const deny = (d: Denial): Answer => ({ allowed: false, ...d });

const PEOPLE_ONLY =
  'Only the people of this check (the person who submitted it, its checker and its approver) comment on it.';

/** "This check is returned by the checker; it cannot be signed as checked now." (409, with the state) */
export const stateConflict = (state: CheckState, wanted: string): Denial => ({
  code: 'conflict',
  reason: `This check is ${STATE_LABELS[state]}; it cannot be ${wanted} now.`,
  details: { state },
});

/**
 * Answering a return: the check was returned (by its checker or its approver), the sheet has not
 * been submitted again, and a thread it carries is still open. Then the check's people reply to the
 * open threads on the returned check; nobody opens a new thread or resolves one there (the checker
 * resolves them on the next check, which carries them).
 */
export function answeringReturn(check: Pick<PolicyCheck, 'state'>, facts: PolicyFacts): boolean {
  return (
    (check.state === 'returned' || check.state === 'approval_returned') &&
    !facts.submittedAgain &&
    facts.openThreads > 0
  );
}

function replyState(check: PolicyCheck, facts: PolicyFacts): Denial | null {
  if (check.state === 'in_check' || answeringReturn(check, facts)) return null;
  if (check.state !== 'returned' && check.state !== 'approval_returned')
    return stateConflict(check.state, 'commented on');
  const conflict = stateConflict(check.state, 'commented on');
  return {
    ...conflict,
    reason: facts.submittedAgain
      ? `${conflict.reason} The sheet was submitted for check again: answer its threads on the new check.`
      : `${conflict.reason} It has no open thread to answer.`,
  };
}

/** What signing as checked waits for, each as the server refuses it. */
function signWaitsFor(check: PolicyCheck, facts: PolicyFacts): Denial[] {
  const out: Denial[] = [];
  const n = facts.openThreads;
  if (n > 0)
    out.push({
      code: 'conflict',
      reason: `${n} comment thread${n === 1 ? ' is' : 's are'} still open; resolve every thread before signing as checked.`,
      details: { openThreads: n },
    });
  if (!check.verification_method)
    out.push({
      code: 'bad_request',
      reason:
        'Record the verification method (design review, alternate calculation or qualification test) before signing.',
    });
  const pending = unconfirmedCarriedOver(facts.carriedOver);
  if (pending.length)
    out.push({
      code: 'conflict',
      reason: `The ${carriedFieldsText(pending)} ${pending.length === 1 ? 'is' : 'are'} still as carried over from the check of version ${facts.carriedOver!.fromVersion}; confirm or edit ${pending.length === 1 ? 'it' : 'them'} before signing.`,
      details: { carriedOver: pending },
    });
  if (facts.toleranceMissing)
    out.push({
      code: 'bad_request',
      reason: 'State the tolerance of the comparison between the alternate calculation and the sheet before signing.',
    });
  return out;
}

function decision(
  action: DecisionAction,
  check: PolicyCheck,
  actor: PolicyActor,
  roles: readonly ProjectRole[],
  facts: PolicyFacts,
): Answer {
  const t = TRANSITIONS[action];
  const me = { userId: actor.userId, name: actor.name, roles };
  if (t.by === 'checker') {
    if (check.checker_id !== actor.userId)
      return deny({
        code: 'forbidden',
        reason: `Only ${facts.checkerName}, the checker named on this check, can ${t.what}.`,
      });
    if (check.state !== t.from) return deny(stateConflict(check.state, t.verb));
    // The rules are read again at every decision: roles and authors may have changed since the submission.
    const refusal = checkerRefusal(me, facts.participants);
    if (refusal) return deny({ code: 'forbidden', reason: refusal.message, rule: refusal.rule });
  } else {
    if (check.state !== t.from) return deny(stateConflict(check.state, t.verb));
    const refusal = approverRefusal(me, facts.participants);
    if (refusal) return deny({ code: 'forbidden', reason: refusal.message, rule: refusal.rule });
  }
  if (action === 'sign') {
    const waiting = signWaitsFor(check, facts);
    if (waiting.length) return { allowed: false, ...waiting[0], waitingFor: waiting };
  }
  return allowed;
}

/**
 * What `actor`, holding `roles` in the check's project, may do to the check now. Each refusal is
 * the first that applies, in the order the server has always checked them: who may act at all,
 * then the state, then the independence rules, then what the action waits for.
 */
export function checkPolicy(
  check: PolicyCheck,
  actor: PolicyActor,
  roles: readonly ProjectRole[],
  facts: PolicyFacts,
): CheckPolicy {
  const isChecker = check.checker_id === actor.userId;
  const people = mayAnswerThreads(check, actor.userId);
  const checkerWork = (only: string): Answer =>
    !isChecker
      ? deny({ code: 'forbidden', reason: only })
      : check.state !== 'in_check'
        ? deny(stateConflict(check.state, 'changed'))
        : allowed;
  const recordWork = checkerWork('Only the checker named on this check records its work.');
  const replyRefusal = replyState(check, facts);
  return {
    openThread: !people
      ? deny({ code: 'forbidden', reason: PEOPLE_ONLY })
      : check.state !== 'in_check'
        ? deny(stateConflict(check.state, 'commented on'))
        : !isChecker
          ? deny({ code: 'forbidden', reason: 'The checker opens comment threads; originators answer them.' })
          : allowed,
    reply: !people ? deny({ code: 'forbidden', reason: PEOPLE_ONLY }) : replyRefusal ? deny(replyRefusal) : allowed,
    resolveThread: checkerWork('Only the checker resolves comment threads.'),
    recordWork,
    confirmCarriedOver: !recordWork.allowed
      ? recordWork
      : !facts.carriedOver
        ? deny({ code: 'conflict', reason: 'This check carries over no work from an earlier check.' })
        : allowed,
    return: decision('return', check, actor, roles, facts),
    sign: decision('sign', check, actor, roles, facts),
    approve: decision('approve', check, actor, roles, facts),
    reject: decision('reject', check, actor, roles, facts),
  };
}

/** The decisions the screens offer this person: those allowed now, and signing while it waits for work. */
export function offeredDecisions(policy: CheckPolicy): DecisionAction[] {
  return DECISIONS.filter((a) => {
    const answer = policy[a];
    return answer.allowed || (answer.waitingFor?.length ?? 0) > 0;
  });
}

/**
 * Whether the decision column shows the checker's evidence (method, comparison, carried-over work):
 * to the checker while checking, to everyone once the check is decided.
 */
export const seesEvidenceSummary = (check: Pick<PolicyCheck, 'state' | 'checker_id'>, actor: PolicyActor): boolean =>
  check.state !== 'in_check' || check.checker_id === actor.userId;
