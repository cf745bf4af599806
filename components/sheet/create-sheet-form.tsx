'use client';

import { useRouter } from 'next/navigation';
import { JsonForm } from '@/components/forms/json-form';

export function CreateSheetForm({ projectId, projectCode }: { projectId: string; projectCode: string }) {
  const router = useRouter();
  return (
    <JsonForm
      action={`/api/projects/${projectId}/sheets`}
      fields={[
        { name: 'title', label: 'Title', required: true },
        {
          name: 'objective',
          label: 'Objective',
          type: 'textarea',
          hint: 'What the calculation must show (ASME NQA-1 Requirement 3).',
        },
        {
          name: 'safetyRelated',
          label: 'Safety-related (feeds radiation-safety, shielding or interlock decisions)',
          type: 'checkbox',
        },
      ]}
      submitLabel="Create the sheet"
      onDone={(body) => router.push(`/projects/${projectCode}/sheets/${String(body.number)}`)}
    />
  );
}
