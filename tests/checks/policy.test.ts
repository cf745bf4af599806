// The check policy (lib/checks/policy.ts) and the decisions' transition table
// (lib/checks/transitions.ts), as pure functions: no database. Each action on a check for each
// person who matters, the independence rules (ASME NQA-1 Requirement 3 §500; ISO 9001 §8.3.4) for
// people holding several roles, what signing waits for, and answering a return.
import { describe, expect, it } from 'vitest';
import type { CheckState, ProjectRole } from '../../db/schema';
import {
  answeringReturn,
  checkPolicy,
  CHECK_ACTIONS,
  offeredDecisions,
  seesEvidenceSummary,
  type Answer,
  type PolicyCheck,
  type PolicyFacts,
} from '../../lib/checks/policy';
import { DECISIONS, TRANSITIONS } from '../../lib/checks/transitions';

const STATES: CheckState[] = ['in_check', 'returned', 'checked', 'approved', 'approval_returned'];
const ROLES: ProjectRole[] = ['originator', 'checker', 'approver', 'controller', 'viewer'];

// The people: Pat submits (signs prepared) and authored the version, Cam is the named checker,
// Ann and Abe approve, Bea is another originator of the project with no part in the check.
const pat = { userId: 'pat', name: 'Pat' };
const cam = { userId: 'cam', name: 'Cam' };
const ann = { userId: 'ann', name: 'Ann' };
const bea = { userId: 'bea', name: 'Bea' };

function aCheck(over: Partial<PolicyCheck> = {}): PolicyCheck {
  return {
    state: 'in_check',
    submitted_by: pat.userId,
    checker_id: cam.userId,
    decided_by: null,
    verification_method: 'design_review',
    ...over,
  };
}

function facts(over: Partial<PolicyFacts> = {}, who: { originators?: string[]; safetyRelated?: boolean } = {}) {
  return {
    participants: {
      originators: new Set(who.originators ?? [pat.userId]),
      preparers: new Set([pat.userId]),
      checkers: new Set([cam.userId]),
      safetyRelated: who.safetyRelated ?? false,
    },
    checkerName: 'Cam',
    openThreads: 0,
    submittedAgain: false,
    carriedOver: null,
    toleranceMissing: false,
    ...over,
  } satisfies PolicyFacts;
}

/** The refusal as the server answers it: its HTTP code, rule and reason; 'allowed' when allowed. */
const outcome = (a: Answer) => (a.allowed ? 'allowed' : a.rule ? `${a.code} ${a.rule}` : a.code);

describe('the transition table of decisions', () => {
  it('moves a check only from the state each decision is taken in, to the state it leads to', () => {
    // Every state × decision: exactly four moves (the product brief's workflow: in check → returned
    // or checked → approved; the approver may also return it).
    const moves = STATES.flatMap((s) =>
      DECISIONS.map((d) => [s, d, TRANSITIONS[d].from === s ? TRANSITIONS[d].to : null] as const),
    ).filter(([, , to]) => to !== null);
    expect(moves).toEqual([
      ['in_check', 'return', 'returned'],
      ['in_check', 'sign', 'checked'],
      ['checked', 'approve', 'approved'],
      ['checked', 'reject', 'approval_returned'],
    ]);
  });

  it('says who decides, what each signature means, which need a reason and which close the check', () => {
    expect(DECISIONS).toEqual(['return', 'sign', 'approve', 'reject']);
    expect(DECISIONS.map((d) => [d, TRANSITIONS[d].by, TRANSITIONS[d].signs, TRANSITIONS[d].needsReason])).toEqual([
      ['return', 'checker', null, true],
      ['sign', 'checker', 'checked', false],
      ['approve', 'approver', 'approved', false],
      ['reject', 'approver', null, true],
    ]);
    // A checked version stays open for its approver; every other outcome closes the check.
    expect(DECISIONS.filter((d) => TRANSITIONS[d].closes)).toEqual(['return', 'approve', 'reject']);
  });
});

describe('each action for each person, on a check in check', () => {
  const check = aCheck();
  const f = facts();
  const table = (actor: { userId: string; name: string }, roles: ProjectRole[]) =>
    Object.fromEntries(CHECK_ACTIONS.map((a) => [a, outcome(checkPolicy(check, actor, roles, f)[a])]));

  it('lets the named checker do the checker’s work and decide; no approval yet', () => {
    expect(table(cam, ['checker'])).toEqual({
      openThread: 'allowed',
      reply: 'allowed',
      resolveThread: 'allowed',
      recordWork: 'allowed',
      confirmCarriedOver: 'conflict', // nothing is carried over
      return: 'allowed',
      sign: 'allowed',
      approve: 'conflict',
      reject: 'conflict',
    });
  });

  it('lets the submitter only reply', () => {
    expect(table(pat, ['originator'])).toEqual({
      openThread: 'forbidden',
      reply: 'allowed',
      resolveThread: 'forbidden',
      recordWork: 'forbidden',
      confirmCarriedOver: 'forbidden',
      return: 'forbidden',
      sign: 'forbidden',
      approve: 'conflict',
      reject: 'conflict',
    });
    const p = checkPolicy(check, pat, ['originator'], f);
    expect(p.openThread).toMatchObject({ reason: 'The checker opens comment threads; originators answer them.' });
    expect(p.sign).toMatchObject({
      code: 'forbidden',
      reason: 'Only Cam, the checker named on this check, can sign it as checked.',
    });
    expect(p.return).toMatchObject({ reason: 'Only Cam, the checker named on this check, can return it.' });
  });

  it('lets another originator or checker of the project do nothing', () => {
    for (const roles of [['originator'], ['checker'], ['originator', 'checker']] as ProjectRole[][]) {
      const t = table(bea, roles);
      expect(Object.values(t).filter((o) => o === 'allowed')).toEqual([]);
      expect(checkPolicy(check, bea, roles, f).reply).toMatchObject({
        code: 'forbidden',
        reason:
          'Only the people of this check (the person who submitted it, its checker and its approver) comment on it.',
      });
    }
  });

  it('answers 409 with the state to a decision taken in the wrong state', () => {
    const p = checkPolicy(check, ann, ['approver'], f);
    expect(p.approve).toEqual({
      allowed: false,
      code: 'conflict',
      reason: 'This check is in check; it cannot be approved now.',
      details: { state: 'in_check' },
    });
    expect(p.reject).toMatchObject({ reason: 'This check is in check; it cannot be returned by an approver now.' });
  });
});

describe('decisions in every state', () => {
  it('offers each decision only in its state, to its decider', () => {
    for (const state of STATES) {
      const check = aCheck({ state, decided_by: state === 'in_check' ? null : cam.userId });
      const asChecker = checkPolicy(check, cam, ['checker'], facts());
      const asApprover = checkPolicy(check, ann, ['approver'], facts());
      expect(offeredDecisions(asChecker), state).toEqual(state === 'in_check' ? ['return', 'sign'] : []);
      expect(offeredDecisions(asApprover), state).toEqual(state === 'checked' ? ['approve', 'reject'] : []);
      for (const d of DECISIONS) {
        const answer = (TRANSITIONS[d].by === 'checker' ? asChecker : asApprover)[d];
        if (TRANSITIONS[d].from !== state)
          expect(answer, `${state} ${d}`).toMatchObject({ code: 'conflict', details: { state } });
      }
    }
  });

  it('refuses an approver without the approver role, by the role rule', () => {
    const p = checkPolicy(aCheck({ state: 'checked' }), bea, ['originator', 'viewer'], facts());
    expect(outcome(p.approve)).toBe('forbidden approver-role');
    expect(outcome(p.reject)).toBe('forbidden approver-role');
  });
});

describe('one person holding several roles cannot get round the independence rules', () => {
  // Every set of roles a person may hold in the project (2^5), in every state.
  const roleSets = Array.from({ length: 1 << ROLES.length }, (_, mask) => ROLES.filter((_, i) => mask & (1 << i)));

  it('never lets the submitter decide anything on the version they prepared, whatever roles they hold', () => {
    for (const roles of roleSets)
      for (const state of STATES) {
        // Pat named as checker of their own submission (the database allows the row; the rules do not).
        for (const check of [aCheck({ state }), aCheck({ state, checker_id: pat.userId })]) {
          const f = facts({}, { originators: [] }); // Pat submitted someone else's version
          const p = checkPolicy(check, pat, roles, f);
          expect(offeredDecisions(p), `${roles} ${state}`).toEqual([]);
          for (const d of DECISIONS) expect(p[d].allowed, `${roles} ${state} ${d}`).toBe(false);
        }
      }
    const named = checkPolicy(aCheck({ checker_id: pat.userId }), pat, ROLES, facts({}, { originators: [] }));
    expect(outcome(named.sign)).toBe('forbidden checker-not-preparer');
    const approving = checkPolicy(aCheck({ state: 'checked' }), pat, ROLES, facts({}, { originators: [] }));
    expect(outcome(approving.approve)).toBe('forbidden approver-not-preparer');
  });

  it('never lets an originator of any version since the last approved one check or approve it', () => {
    // Mo holds every role and saved a version since the last approved one (before or after the version under check).
    const mo = { userId: 'mo', name: 'Mo' };
    const f = facts({}, { originators: [pat.userId, mo.userId] });
    for (const roles of roleSets)
      for (const state of STATES) {
        const p = checkPolicy(aCheck({ state, checker_id: mo.userId }), mo, roles, f);
        for (const d of DECISIONS) expect(p[d].allowed, `${roles} ${state} ${d}`).toBe(false);
      }
    const checking = checkPolicy(aCheck({ checker_id: mo.userId }), mo, ROLES, f);
    expect(outcome(checking.sign)).toBe('forbidden checker-not-originator');
    expect(outcome(checking.return)).toBe('forbidden checker-not-originator');
    expect(checking.sign).toMatchObject({
      reason: expect.stringMatching(/^Mo cannot check this version: they saved a version/),
    });
    const approving = checkPolicy(aCheck({ state: 'checked' }), mo, ROLES, f);
    expect(outcome(approving.approve)).toBe('forbidden approver-not-originator');
    expect(outcome(approving.reject)).toBe('forbidden approver-not-originator');
    // Still free to do the checker's work it was named for: recording work is no decision.
    expect(checking.recordWork.allowed).toBe(true);
  });

  it('on a safety-related version, never lets its checker approve it, whatever roles they hold', () => {
    for (const safetyRelated of [true, false])
      for (const roles of roleSets) {
        const p = checkPolicy(aCheck({ state: 'checked' }), cam, roles, facts({}, { safetyRelated }));
        const may = roles.includes('approver') && !safetyRelated;
        expect(p.approve.allowed, `${safetyRelated} ${roles}`).toBe(may);
        expect(p.reject.allowed, `${safetyRelated} ${roles}`).toBe(may);
      }
    const p = checkPolicy(
      aCheck({ state: 'checked' }),
      cam,
      ['checker', 'approver'],
      facts({}, { safetyRelated: true }),
    );
    expect(outcome(p.approve)).toBe('forbidden safety-approver-not-checker');
    // Another approver may approve it.
    expect(
      checkPolicy(aCheck({ state: 'checked' }), ann, ['approver'], facts({}, { safetyRelated: true })).approve,
    ).toEqual({
      allowed: true,
    });
  });

  it('refuses a named checker who has lost the checker role', () => {
    expect(outcome(checkPolicy(aCheck(), cam, ['approver'], facts()).sign)).toBe('forbidden checker-role');
  });
});

describe('signing as checked waits for the work on the check', () => {
  it('lists every item it waits for, in the order the server refuses them, and still offers it', () => {
    const check = aCheck({ verification_method: null });
    const f = facts({
      openThreads: 2,
      carriedOver: {
        fromCheckId: 'k0',
        fromVersion: 3,
        fields: ['checkerNotes', 'tolerance'],
        confirmedAt: null,
        confirmedBy: null,
      },
      toleranceMissing: true,
    });
    const p = checkPolicy(check, cam, ['checker'], f);
    expect(p.sign.allowed).toBe(false);
    const sign = p.sign as Extract<Answer, { allowed: false }>;
    expect(sign.waitingFor!.map((w) => [w.code, w.reason, w.details])).toEqual([
      [
        'conflict',
        '2 comment threads are still open; resolve every thread before signing as checked.',
        { openThreads: 2 },
      ],
      [
        'bad_request',
        'Record the verification method (design review, alternate calculation or qualification test) before signing.',
        undefined,
      ],
      [
        'conflict',
        "The checker's notes and tolerance are still as carried over from the check of version 3; confirm or edit them before signing.",
        { carriedOver: ['checkerNotes', 'tolerance'] },
      ],
      [
        'bad_request',
        'State the tolerance of the comparison between the alternate calculation and the sheet before signing.',
        undefined,
      ],
    ]);
    // The refusal is the first item.
    expect(sign).toMatchObject({ code: 'conflict', details: { openThreads: 2 } });
    expect(offeredDecisions(p)).toEqual(['return', 'sign']);
    // Returning waits for nothing.
    expect(p.return).toEqual({ allowed: true });
  });

  it('waits for nothing once the threads are resolved, the method recorded and the carried-over work confirmed', () => {
    const f = facts({
      carriedOver: {
        fromCheckId: 'k0',
        fromVersion: 3,
        fields: ['checkerNotes'],
        confirmedAt: '2026-12-04T08:00:00.000Z',
        confirmedBy: 'Cam',
      },
    });
    expect(checkPolicy(aCheck(), cam, ['checker'], f).sign).toEqual({ allowed: true });
    expect(checkPolicy(aCheck(), cam, ['checker'], f).confirmCarriedOver).toEqual({ allowed: true });
  });

  it('names the independence rule before anything signing waits for', () => {
    const p = checkPolicy(
      aCheck({ verification_method: null }),
      cam,
      ['checker'],
      facts({ openThreads: 1 }, { originators: [cam.userId] }),
    );
    expect(outcome(p.sign)).toBe('forbidden checker-not-originator');
    expect((p.sign as { waitingFor?: unknown }).waitingFor).toBeUndefined();
    expect(offeredDecisions(p)).toEqual([]);
  });
});

describe('answering a return', () => {
  // One meaning: the check was returned (by its checker or its approver), the sheet has not been
  // submitted again, and a thread it carries is still open. Replies only; nobody opens or resolves a thread there.
  const returned = aCheck({ state: 'returned', decided_by: cam.userId });

  it('lets the check’s people reply to its open threads until the sheet is submitted again', () => {
    const f = facts({ openThreads: 1 });
    expect(answeringReturn(returned, f)).toBe(true);
    expect(checkPolicy(returned, pat, ['originator'], f).reply).toEqual({ allowed: true });
    expect(checkPolicy(returned, cam, ['checker'], f).reply).toEqual({ allowed: true });
    expect(outcome(checkPolicy(returned, bea, ['originator'], f).reply)).toBe('forbidden');
    // Nobody opens a thread or resolves one on a returned check, nor records work.
    const c = checkPolicy(returned, cam, ['checker'], f);
    expect([c.openThread, c.resolveThread, c.recordWork].map(outcome)).toEqual(['conflict', 'conflict', 'conflict']);
  });

  it('ends when the sheet is submitted again, or when no thread is open', () => {
    const again = checkPolicy(returned, pat, ['originator'], facts({ openThreads: 1, submittedAgain: true }));
    expect(again.reply).toMatchObject({
      code: 'conflict',
      details: { state: 'returned' },
      reason:
        'This check is returned by the checker; it cannot be commented on now. The sheet was submitted for check again: answer its threads on the new check.',
    });
    const none = checkPolicy(returned, pat, ['originator'], facts({ openThreads: 0 }));
    expect(none.reply).toMatchObject({
      code: 'conflict',
      reason: 'This check is returned by the checker; it cannot be commented on now. It has no open thread to answer.',
    });
    expect(answeringReturn(returned, facts({ openThreads: 0 }))).toBe(false);
  });

  it('after a return by the approver, the approver who returned it counts among the check’s people', () => {
    const check = aCheck({ state: 'approval_returned', decided_by: ann.userId });
    expect(checkPolicy(check, ann, ['approver'], facts({ openThreads: 1 })).reply).toEqual({ allowed: true });
    expect(
      outcome(checkPolicy(check, { userId: 'abe', name: 'Abe' }, ['approver'], facts({ openThreads: 1 })).reply),
    ).toBe('forbidden');
  });

  it('is never possible on a check in any other state', () => {
    for (const state of ['checked', 'approved'] as const)
      expect(
        outcome(
          checkPolicy(aCheck({ state, decided_by: ann.userId }), pat, ['originator'], facts({ openThreads: 1 })).reply,
        ),
      ).toBe('conflict');
  });
});

describe('the checker’s evidence beside the decision', () => {
  it('is shown to the checker while checking, and to everyone once decided', () => {
    expect(STATES.map((state) => seesEvidenceSummary(aCheck({ state }), pat))).toEqual([false, true, true, true, true]);
    expect(seesEvidenceSummary(aCheck(), cam)).toBe(true);
  });
});
