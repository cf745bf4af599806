import type { Metadata } from 'next';
import { UnavailableNotice } from '@/components/shell/unavailable-notice';

export const metadata: Metadata = { title: 'Register' };

export default function RegisterPage() {
  return (
    <UnavailableNotice title="Document register">
      <p>Not available yet in this build: the register of issued revisions arrives with issuing.</p>
    </UnavailableNotice>
  );
}
