import type { Metadata } from 'next';
import { UnavailableNotice } from '@/components/shell/unavailable-notice';

export const metadata: Metadata = { title: 'Verify a PDF' };

export default function VerifyPage() {
  return (
    <UnavailableNotice title="Verify an issued PDF">
      <p>
        Not available yet in this build: verification of issued PDFs arrives with signed issuing. No PDF can be
        verified here yet.
      </p>
    </UnavailableNotice>
  );
}
