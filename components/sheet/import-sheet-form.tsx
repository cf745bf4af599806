'use client';

import { useRouter } from 'next/navigation';
import { useId, useState } from 'react';

/** Imports a sheet file (JSON) as a new sheet of the project. */
export function ImportSheetForm({ projectId, projectCode }: { projectId: string; projectCode: string }) {
  const router = useRouter();
  const id = useId();
  const [state, setState] = useState<{ error?: string; busy?: boolean }>({});
  async function onFile(file: File | undefined) {
    if (!file) return;
    setState({ busy: true });
    const response = await fetch(`/api/projects/${projectId}/sheets/import`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: await file.text() });
    const answer = await response.json().catch(() => ({}));
    if (!response.ok) {
      setState({ error: answer.error?.message ?? `The server answered ${response.status}.` });
      return;
    }
    router.push(`/projects/${projectCode}/sheets/${answer.number}`);
  }
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-semibold">
        Import a sheet file (JSON)
      </label>
      <input id={id} type="file" accept="application/json,.json" disabled={state.busy} onChange={(e) => void onFile(e.target.files?.[0])} className="text-sm" />
      <p role="alert" aria-live="polite" className="text-sm text-fail">
        {state.error ?? ''}
      </p>
    </div>
  );
}
