import type { Metadata } from 'next';
import { UnavailableNotice } from '@/components/shell/unavailable-notice';

export const metadata: Metadata = { title: 'Projects' };

export default function ProjectsPage() {
  return (
    <UnavailableNotice title="Projects">
      <p>
        Not available yet in this build: project lists need sign-in and project roles, which are not built yet.
        Until then no project data is shown to anyone.
      </p>
    </UnavailableNotice>
  );
}
