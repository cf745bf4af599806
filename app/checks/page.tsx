import type { Metadata } from 'next';
import { UnavailableNotice } from '@/components/shell/unavailable-notice';

export const metadata: Metadata = { title: 'My checks' };

export default function ChecksPage() {
  return (
    <UnavailableNotice title="My checks">
      <p>Not available yet in this build: the check queue arrives with the check and approval workflow.</p>
    </UnavailableNotice>
  );
}
