// The audit trail in words: each event of a project as one sentence ("Demo Checker signed version 4 of
// TPT2-CALC-0061 as checked"), naming the sheet it concerns so that the page can link to it. The
// stored event (action, old and new values) stays the record; the sentence is made from it when shown,
// and an action this file does not know still reads as its actor and its code.
import type { CheckState, ProjectRole, SignatureMeaning, VerificationMethod } from '@/db/schema';
import { MEANING_LABELS, STATE_LABELS, VERIFICATION_LABELS } from '@/lib/checks/workflow';
import { ROLE_LABELS } from '@/lib/projects/projects';

/** The fields of a stored event the sentence is made from. */
export interface AuditEventFacts {
  action: string;
  object_type: string;
  object_id: string | null;
  old_value: unknown;
  new_value: unknown;
  actor_name: string | null;
}

/** Names of the objects events point at, looked up for the events shown. */
export interface AuditNames {
  /** Sheet id → its number in the project and its code (TPT2-CALC-0061). */
  sheets: ReadonlyMap<string, { number: number; code: string }>;
  /** Check id → the id of the sheet checked. */
  checks: ReadonlyMap<string, string>;
  /** User id → display name. */
  users: ReadonlyMap<string, string>;
}

export interface AuditSentence {
  text: string;
  /** The sheet the event concerns, to link to; null for an event of the project or of a person. */
  sheet: { number: number; code: string } | null;
}

function record(value: unknown): Record<string, unknown> {
  return value && typeof value === 'object' && !Array.isArray(value) ? (value as Record<string, unknown>) : {};
}

function str(value: unknown): string | null {
  return typeof value === 'string' || typeof value === 'number' ? String(value) : null;
}

const stateWords = (state: unknown): string => STATE_LABELS[state as CheckState] ?? str(state) ?? 'a new state';

export function auditSentence(event: AuditEventFacts, names: AuditNames): AuditSentence {
  const actor = event.actor_name ?? 'The system';
  const now = record(event.new_value);
  const was = record(event.old_value);
  const sheetId =
    event.object_type === 'sheet'
      ? event.object_id
      : event.object_type === 'check' && event.object_id
        ? (names.checks.get(event.object_id) ?? null)
        : null;
  const sheet = sheetId ? (names.sheets.get(sheetId) ?? null) : null;
  // A sheet's code, or the sheet's own number stored with the event when the sheet is not found.
  const code = sheet?.code ?? str(now.sheet) ?? str(now.number) ?? 'a sheet';
  const version = str(now.version);
  const ofVersion = version ? `version ${version} of ${code}` : code;
  const person = event.object_id ? (names.users.get(event.object_id) ?? 'a person') : 'a person';
  const role = ROLE_LABELS[(now.role ?? was.role) as ProjectRole]?.toLowerCase() ?? str(now.role ?? was.role) ?? '';
  const text = ((): string => {
    switch (event.action) {
      case 'project.create':
        return `${actor} created the project ${str(now.code) ?? ''}${now.name ? `, ${str(now.name)}` : ''}`;
      case 'membership.grant':
        return `${actor} gave ${person} the ${role} role`;
      case 'membership.revoke':
        return `${actor} took the ${role} role from ${person}`;
      case 'sheet.create':
        return `${actor} created ${code}${now.title ? ` “${str(now.title)}”` : ''}${version ? ` as version ${version}` : ''}`;
      case 'version.save':
        return `${actor} saved ${ofVersion}`;
      case 'sheet.void':
        return `${actor} voided ${code}`;
      case 'attachment.upload':
        return `${actor} attached ${str(now.name) ?? 'a file'} to ${code}`;
      case 'attachment.copy':
        return `${actor} copied the attachment ${str(now.name) ?? ''} into ${code}`;
      case 'attachment.import':
        return `${actor} imported the attachment ${str(now.name) ?? ''} into ${code}`;
      case 'check.submit':
        return `${actor} submitted ${ofVersion} for check${now.checker ? ` by ${str(now.checker)}` : ''}`;
      case 'check.work':
        return `${actor} recorded the verification method of the check of ${code}: ${
          VERIFICATION_LABELS[now.verificationMethod as VerificationMethod]?.toLowerCase() ?? 'none'
        }`;
      case 'check.carry_over':
        return `${actor} carried the check of ${code} over to ${ofVersion}`;
      case 'comment.open':
        return `${actor} opened a comment in the check of ${code}`;
      case 'comment.reply':
        return `${actor} replied to a comment in the check of ${code}`;
      case 'comment.resolve':
        return `${actor} resolved a comment in the check of ${code}`;
      case 'signature.sign':
        return `${actor} signed ${ofVersion} as ${(MEANING_LABELS[now.meaning as SignatureMeaning] ?? str(now.meaning) ?? '').toLowerCase()}`;
      case 'signature.refused':
        return `${actor} was refused a signature on ${ofVersion}`;
      case 'workflow.refused':
        return `${actor} was refused: ${str(now.attempted) ?? 'an action'} on ${code}`;
      case 'revision.request':
        return `${actor} asked for revision ${str(now.revision) ?? ''} of ${code} to be issued from version ${version ?? '?'}`;
      case 'revision.issue':
        return `${actor} issued revision ${str(now.revision) ?? ''} of ${code} from version ${version ?? '?'}${
          now.verificationCode ? ` (verification code ${str(now.verificationCode)})` : ''
        }`;
      case 'revision.withdraw':
        return `${actor} withdrew revision ${str(was.revision) ?? ''} of ${code}`;
      default:
        if (event.action.startsWith('check.'))
          return `${actor} moved the check of ${ofVersion} from ${stateWords(was.state)} to ${stateWords(now.state)}`;
        return `${actor}: ${event.action}${event.object_type === 'sheet' || sheet ? ` on ${code}` : ''}`;
    }
  })();
  return { text, sheet };
}
