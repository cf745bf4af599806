// What a queued e-mail holds. Shared by the sender (lib/mail/outbox.ts, in the app) and the mail
// job (lib/jobs/mail-job.ts, in the worker); it imports nothing Node-only.
import { z } from 'zod';

export const MAIL_QUEUE = 'mail';

const noLineBreaks = (s: string) => !/[\r\n]/.test(s);

export const mailMessageSchema = z.object({
  to: z.email().max(254),
  subject: z.string().min(1).max(300).refine(noLineBreaks, 'a subject is one line'),
  text: z.string().min(1).max(100_000),
  html: z.string().max(500_000).optional(),
  /** What the mail is for, e.g. `verify-email`, `password-reset`; sent as X-Worldsheet-Mail-Kind. */
  kind: z.string().regex(/^[a-z0-9][a-z0-9-]{0,62}$/, 'a kind is lower-case letters, digits and hyphens'),
});

export type MailMessage = z.infer<typeof mailMessageSchema>;
