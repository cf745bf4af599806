import type { Metadata } from 'next';
import { VerifyForm } from '@/components/issue/verify-form';

export const metadata: Metadata = { title: 'Verify an issued PDF' };

/** For anyone, signed in or not. */
export default function VerifyPage() {
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Verify an issued PDF</h1>
      <p className="max-w-prose text-ink-muted">
        Were you handed a calculation PDF? Check here whether it is an authentic revision issued through Worldsheet,
        which sheet and revision it is, and whether it is still current. No account is needed.
      </p>
      <VerifyForm />
    </div>
  );
}
