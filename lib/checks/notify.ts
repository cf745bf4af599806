// The e-mails of the check workflow: one message per person, queued in the transition's transaction.
import type { Transaction } from 'kysely';
import type { Database } from '@/db/schema';
import { enqueueMail } from '@/lib/mail/outbox';

export async function notify(
  trx: Transaction<Database>,
  to: Array<{ email: string; name: string }>,
  kind: string,
  subject: string,
  lines: string[],
  link: string,
) {
  const seen = new Set<string>();
  for (const r of to) {
    if (seen.has(r.email)) continue;
    seen.add(r.email);
    await enqueueMail(trx, {
      to: r.email,
      kind,
      subject,
      text: [`Hello ${r.name},`, '', ...lines, '', `Open it: ${link}`, '', '— Worldsheet'].join('\n'),
    });
  }
}
