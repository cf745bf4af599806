import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import {
  CellsSection,
  CheckHeader,
  DecisionColumn,
  OtherThreadsSection,
  RecordAndWork,
  SinceReturnSection,
  sinceReturnOf,
} from '@/components/checks/check-sections';
import { SubmissionAcknowledgements } from '@/components/checks/submission-acknowledgements';
import { CautionNotice, SafetyRelatedNotice } from '@/components/shell/caution-notice';
import { getDb } from '@/db';
import { pageActor } from '@/lib/auth/page-guard';
import { getCheckDetail, type CheckDetail } from '@/lib/checks/queries';
import { AppError } from '@/lib/errors/app-error';
import { pageParams } from '@/lib/http/params';

export const metadata: Metadata = { title: 'Check' };
export const dynamic = 'force-dynamic';

export default async function CheckPage({ params }: { params: Promise<{ checkId: string }> }) {
  const raw = await params;
  const actor = await pageActor(`/checks/${raw.checkId}`);
  const { checkId } = pageParams(raw) ?? notFound();
  let check: CheckDetail;
  try {
    check = await getCheckDetail(getDb(), actor, checkId);
  } catch (error) {
    if (error instanceof AppError && error.code === 'not_found') notFound();
    throw error;
  }
  // A re-check after a return: what changed since the returned version comes first.
  const sinceReturn = sinceReturnOf(check, actor.userId);
  return (
    <div className="space-y-6">
      <CheckHeader check={check} sinceReturn={sinceReturn} />
      {check.sheet.safetyRelated ? <SafetyRelatedNotice /> : null}
      <CautionNotice compact />
      {check.returnReason ? (
        <p role="note" className="rounded border-l-4 border-caution-rule bg-caution-soft px-4 py-3 text-sm text-ink">
          <span className="font-bold">
            {check.state === 'approval_returned' ? 'Returned by the approver' : 'Returned with comments'}:
          </span>{' '}
          {check.returnReason}
        </p>
      ) : null}
      <SubmissionAcknowledgements
        acknowledgements={check.acknowledgements}
        designInputs={check.designInputs}
        submittedBy={check.submittedBy}
      />

      <div className="grid gap-8 lg:grid-cols-[minmax(0,1fr)_20rem]">
        <div className="min-w-0 space-y-8">
          {sinceReturn ? <SinceReturnSection check={check} sinceReturn={sinceReturn} /> : null}
          <CellsSection check={check} sinceReturn={sinceReturn} />
          <OtherThreadsSection check={check} />
          <RecordAndWork check={check} />
        </div>
        <DecisionColumn check={check} />
      </div>
    </div>
  );
}
