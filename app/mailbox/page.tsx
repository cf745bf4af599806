import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { getDb } from '@/db';
import { DemoMailbox } from '@/components/mail/demo-mailbox';
import { getActor } from '@/lib/auth/current-actor';
import { demoMailboxEnabled, loadDemoMailbox } from '@/lib/mail/mailbox';

// Read the capture server on every request; exists only in demo mode.
export const dynamic = 'force-dynamic';

export function generateMetadata(): Metadata {
  // Outside demo mode the page is the not-found page, and its title must not name a mailbox.
  return demoMailboxEnabled() ? { title: 'Demo mailbox' } : {};
}

/** Whose mail the reader sees is decided in lib/mail/mailbox.ts: nothing signed out, their own, or all for an administrator (audited). */
async function MailboxForReader() {
  return <DemoMailbox mailbox={await loadDemoMailbox(getDb(), await getActor())} />;
}

export default function MailboxPage() {
  // Next streams every page under app/loading.tsx, so this renders the not-found page (marked
  // noindex) with status 200 rather than 404, as every notFound() of the app does.
  if (!demoMailboxEnabled()) notFound();
  return <MailboxForReader />;
}
