// The check workflow's vocabulary, shared by the server modules, the routes, the OpenAPI document
// and the screens: verification methods, state and signature labels, the request schemas and the
// stored acknowledgement. The workflow itself: submit.ts (submission), threads.ts (comments),
// work.ts (the checker's work), decide.ts (decisions, by transitions.ts), queries.ts (the read
// model); who may do what: policy.ts over the independence rules of rules.ts.
import { z } from 'zod';
import type { CheckState, SignatureMeaning, VerificationMethod } from '@/db/schema';
import { INT4_MAX } from '@/lib/http/params';
import { cellSchema, refuseBidiControls } from '@/lib/sheets/content';
import { parseTolerance } from './alternate-comparison';
import type { SubmissionFinding } from './submission-findings';

export const VERIFICATION_METHODS = [
  'design_review',
  'alternate_calculation',
  'qualification_test',
] as const satisfies readonly VerificationMethod[];
export const VERIFICATION_LABELS: Record<VerificationMethod, string> = {
  design_review: 'Design review',
  alternate_calculation: 'Alternate calculation',
  qualification_test: 'Qualification test',
};
export const STATE_LABELS: Record<CheckState, string> = {
  in_check: 'in check',
  returned: 'returned by the checker',
  checked: 'checked, awaiting approval',
  approved: 'approved',
  approval_returned: 'returned by the approver',
};
export const MEANING_LABELS: Record<SignatureMeaning, string> = {
  prepared: 'Prepared',
  checked: 'Checked',
  approved: 'Approved',
  issued: 'Issued',
};

const password = z.string().min(1, 'enter your password to sign').max(200);

export const submitSchema = z.object({
  versionNumber: z.number().int().positive().max(INT4_MAX),
  checkerId: z.string().uuid(),
  password,
  /**
   * The originator's written acknowledgement of each cell error, failed criterion, engine warning
   * and mismatched design input of the version (lib/checks/submission-findings.ts), by key.
   */
  acknowledgements: z
    .array(z.object({ key: z.string().min(1).max(200), text: z.string().trim().max(5000) }))
    .max(1000)
    .default([]),
});

export const checkWorkSchema = z.object({
  verificationMethod: z.enum(VERIFICATION_METHODS).nullable().optional(),
  checkerNotes: z.string().max(20_000).optional(),
  alternateCells: z
    .array(cellSchema)
    .max(200)
    .superRefine((cells, ctx) => refuseBidiControls(cells, ctx, []))
    .optional(),
  /** The relative tolerance of the alternate comparison as written: "1e-6", "0.1 %", "5 ppm"; null clears it. */
  tolerance: z
    .string()
    .trim()
    .max(40)
    .superRefine((t, ctx) => {
      const parsed = parseTolerance(t);
      if (!parsed.ok) ctx.addIssue({ code: 'custom', message: parsed.message });
    })
    .nullable()
    .optional(),
  /** The checker confirms the work carried over from the returned check of an earlier version. */
  confirmCarriedOver: z.literal(true).optional(),
});

export const commentSchema = z.object({
  cellId: z.string().regex(/^[a-z0-9][a-z0-9-]{0,39}$/),
  statementLine: z.number().int().positive().max(INT4_MAX).nullable().default(null),
  body: z.string().trim().min(1, 'write the comment').max(10_000),
  /** The thread answered; absent for a new thread. */
  threadId: z.string().uuid().optional(),
});

export const decisionSchema = z.discriminatedUnion('action', [
  z.object({ action: z.literal('return'), reason: z.string().trim().min(1, 'say why it is returned').max(5000) }),
  z.object({ action: z.literal('sign'), password }),
  z.object({ action: z.literal('approve'), password }),
  z.object({ action: z.literal('reject'), reason: z.string().trim().min(1, 'say why it is returned').max(5000) }),
]);
export type Decision = z.infer<typeof decisionSchema>;

export const queueQuerySchema = z.object({ queue: z.enum(['check', 'approval']).default('check') });

export const resolveSchema = z.object({ resolved: z.literal(true) });

/** A finding as acknowledged on submission, stored with the check. */
export type StoredAcknowledgement = SubmissionFinding & { text: string };
