'use client';

import { useRouter } from 'next/navigation';
import { JsonForm } from '@/components/forms/json-form';

/** Document control withdraws a revision, saying why. */
export function WithdrawForm({ revisionId, label }: { revisionId: string; label: string }) {
  const router = useRouter();
  return (
    <details className="text-sm">
      <summary className="cursor-pointer font-semibold text-accent underline">Withdraw {label}</summary>
      <div className="mt-2 rounded border border-rule bg-paper p-2">
        <JsonForm
          action={`/api/revisions/${revisionId}/withdraw`}
          fields={[{ name: 'reason', label: `Why ${label} is withdrawn`, type: 'textarea', required: true }]}
          submitLabel={`Withdraw ${label}`}
          successMessage={`${label} is withdrawn.`}
          onDone={() => router.refresh()}
        />
      </div>
    </details>
  );
}
