'use client';

import { useRouter } from 'next/navigation';
import { JsonForm } from '@/components/forms/json-form';

/**
 * Voids a sheet created by mistake and never issued, saying why (lib/sheets/void.ts says who may and
 * when). The sheet stays in the register as void, with its versions; nothing is deleted.
 */
export function VoidSheetForm({ sheetId, code }: { sheetId: string; code: string }) {
  const router = useRouter();
  return (
    <details className="text-sm">
      <summary className="cursor-pointer font-semibold text-fail underline">Void {code}</summary>
      <div className="mt-2 space-y-2 rounded border border-rule bg-paper p-2">
        <p className="text-xs text-ink-muted">
          For a sheet created by mistake that was never issued. It stays in the register as void, with its versions; no
          one can save, submit or issue it afterwards, and voiding cannot be undone.
        </p>
        <JsonForm
          action={`/api/sheets/${sheetId}/void`}
          fields={[{ name: 'reason', label: `Why ${code} is void`, type: 'textarea', required: true }]}
          submitLabel={`Void ${code}`}
          successMessage={`${code} is void.`}
          onDone={() => router.refresh()}
        />
      </div>
    </details>
  );
}
