// The audit trail in words (lib/audit/sentences.ts): each kind of event a project records reads as a
// sentence naming the person, the version and the sheet, made from the stored values as the event
// writers store them (lib/checks/signing.ts, decide.ts, submit.ts, lib/issue/*, lib/projects/projects.ts).
import { describe, expect, it } from 'vitest';
import { auditSentence, type AuditNames } from '../../lib/audit/sentences';
import { resultChangesText } from '../../lib/sheets/compare';

const names: AuditNames = {
  sheets: new Map([['s61', { number: 61, code: 'TPT2-CALC-0061' }]]),
  checks: new Map([['c1', 's61']]),
  users: new Map([['u-checker', 'Demo Checker']]),
};
const event = (action: string, objectType: string, objectId: string | null, now: unknown, was: unknown = null) => ({
  action,
  object_type: objectType,
  object_id: objectId,
  new_value: now,
  old_value: was,
  actor_name: 'Demo Checker',
});

describe('the audit trail in words', () => {
  it('says who signed which version of which sheet, with what meaning, and names the sheet to link to', () => {
    const s = auditSentence(
      event('signature.sign', 'sheet', 's61', { version: 4, meaning: 'checked', sha256: 'ab', printedName: 'x' }),
      names,
    );
    expect(s).toEqual({
      text: 'Demo Checker signed version 4 of TPT2-CALC-0061 as checked',
      sheet: { number: 61, code: 'TPT2-CALC-0061' },
    });
  });

  it('finds the sheet of a check event through the check', () => {
    const s = auditSentence(
      event('check.return', 'check', 'c1', { state: 'returned', version: 4 }, { state: 'in_check' }),
      names,
    );
    expect(s.text).toBe(
      'Demo Checker moved the check of version 4 of TPT2-CALC-0061 from in check to returned by the checker',
    );
    expect(s.sheet?.code).toBe('TPT2-CALC-0061');
  });

  it('names the person a role was given to, and the project of its creation', () => {
    expect(auditSentence(event('membership.grant', 'user', 'u-checker', { role: 'checker' }), names)).toEqual({
      text: 'Demo Checker gave Demo Checker the checker role',
      sheet: null,
    });
    expect(
      auditSentence(
        { ...event('project.create', 'project', 'p', { code: 'TPT2', name: 'Gantry 2' }), actor_name: null },
        names,
      ).text,
    ).toBe('The system created the project TPT2, Gantry 2');
  });

  it('issues, requests and withdrawals name the revision and the version', () => {
    expect(
      auditSentence(
        event('revision.issue', 'sheet', 's61', { revision: 'B', version: 7, verificationCode: 'AB12' }),
        names,
      ).text,
    ).toBe('Demo Checker issued revision B of TPT2-CALC-0061 from version 7 (verification code AB12)');
    expect(
      auditSentence(event('revision.withdraw', 'sheet', 's61', { status: 'withdrawn' }, { revision: 'A' }), names).text,
    ).toBe('Demo Checker withdrew revision A of TPT2-CALC-0061');
  });

  it('keeps an action it does not know readable by its code', () => {
    expect(auditSentence(event('sheet.rename', 'sheet', 's61', {}), names).text).toBe(
      'Demo Checker: sheet.rename on TPT2-CALC-0061',
    );
  });
});

describe('the results’ changes in words', () => {
  it('names only what happened', () => {
    expect(resultChangesText({ added: 5, removed: 0, changed: 0, unchanged: 0 })).toBe('results: 5 added');
    expect(resultChangesText({ added: 1, removed: 2, changed: 3, unchanged: 9 })).toBe(
      'results: 3 changed, 1 added, 2 removed',
    );
    expect(resultChangesText({ added: 0, removed: 0, changed: 0, unchanged: 9 })).toBe('no result changed');
  });
});
