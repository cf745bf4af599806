// The demo mailbox (app/mailbox/page.tsx): the e-mails captured by the local demo mail server that
// the reader may see (lib/mail/mailbox.ts decides), in a table and one by one with their links
// clickable. The text is shown as text, never as HTML. Signed out, it shows no mail at all.
import { notFound } from 'next/navigation';
import { splitLinks, type CapturedMessage } from '@/lib/mail/capture-client';
import type { DemoMailbox as DemoMailboxData } from '@/lib/mail/mailbox';
import { formatUtc } from '@/components/ui/utc-time';
import { Table, Td, Th } from '@/components/ui/table';

function MessageText({ text }: { text: string }) {
  return (
    <p className="mt-3 whitespace-pre-wrap break-words text-sm">
      {splitLinks(text).map((part, i) =>
        'href' in part ? (
          <a
            key={i}
            href={part.href}
            rel="noreferrer"
            className="break-all font-semibold text-accent underline hover:text-accent-hover"
          >
            {part.href}
          </a>
        ) : (
          <span key={i}>{part.text}</span>
        ),
      )}
    </p>
  );
}

function MessageCard({ message }: { message: CapturedMessage }) {
  const headingId = `message-${message.id}-subject`;
  return (
    <article
      id={`message-${message.id}`}
      aria-labelledby={headingId}
      className="scroll-mt-4 rounded border border-rule bg-surface p-4"
    >
      <h3 id={headingId} className="text-base font-bold">
        {message.subject || '(no subject)'}
      </h3>
      <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-0.5 text-sm">
        <dt className="text-ink-muted">To</dt>
        <dd className="break-all">{message.to.join(', ')}</dd>
        <dt className="text-ink-muted">From</dt>
        <dd className="break-all">{message.from}</dd>
        <dt className="text-ink-muted">Received</dt>
        <dd>
          <time dateTime={message.date}>{formatUtc(message.date, true)}</time>
        </dd>
      </dl>
      {message.text ? (
        <MessageText text={message.text} />
      ) : (
        <p className="mt-3 text-sm text-ink-muted">This e-mail has no plain-text part.</p>
      )}
      {message.html ? (
        <p className="mt-2 text-xs text-ink-muted">It also has an HTML version, not shown here.</p>
      ) : null}
    </article>
  );
}

/** The demo mailbox: the mail the local demo mail server captured, as lib/mail/mailbox.ts lets the reader see it. */
export function DemoMailbox({ mailbox }: { mailbox: DemoMailboxData }) {
  if (mailbox.status === 'not-demo') notFound();

  return (
    <div className="space-y-8">
      <header>
        <h1 className="text-2xl font-bold">Demo mailbox</h1>
        <div
          role="note"
          aria-label="About this mailbox"
          className="mt-4 max-w-prose rounded border-l-4 border-caution-rule bg-caution-soft px-4 py-3 text-caution"
        >
          <p className="font-bold">These e-mails were never delivered</p>
          <p className="mt-1 text-sm">
            This demo installation sends its e-mails (address confirmations, password resets, notifications) to a local
            demo mail server, which keeps them here instead of delivering them. Nobody received them. They are kept in
            memory only, newest first, and are gone when the demo stops.
          </p>
        </div>
      </header>

      {mailbox.status === 'signed-out' ? (
        <section aria-labelledby="signed-out" className="max-w-prose rounded border border-rule bg-surface p-5">
          <h2 id="signed-out" className="text-xl font-bold">
            Sign in to read your mail
          </h2>
          <p className="mt-2 text-ink-muted">
            The mailbox shows each person only the e-mails addressed to them (sign-in links among them), so it shows
            nothing to someone who is not signed in. The demo accounts are listed on the sign-in page.
          </p>
        </section>
      ) : mailbox.status === 'unavailable' ? (
        <section aria-labelledby="unavailable" className="max-w-prose rounded border border-rule bg-surface p-5">
          <h2 id="unavailable" className="text-xl font-bold">
            The demo mail server does not answer
          </h2>
          <p className="mt-2 text-ink-muted">
            {mailbox.captureUrl ? (
              <>
                Could not read <span className="font-mono">{mailbox.captureUrl}</span>: {mailbox.reason}
              </>
            ) : (
              mailbox.reason
            )}
          </p>
        </section>
      ) : mailbox.messages.length === 0 ? (
        <p className="max-w-prose rounded border border-rule bg-surface p-5 text-ink-muted">
          {mailbox.scope === 'all'
            ? 'No e-mail has been captured yet. E-mails this demo sends appear here.'
            : `No e-mail to ${mailbox.viewerEmail} has been captured yet. E-mails this demo sends you appear here.`}
        </p>
      ) : (
        <>
          <section aria-labelledby="captured">
            <h2 id="captured" className="text-xl font-bold">
              {mailbox.scope === 'all' ? 'Captured e-mails' : 'Your e-mails'}
            </h2>
            <p className="mt-1 text-sm text-ink-muted">
              {mailbox.scope === 'all'
                ? 'Every captured e-mail, as you are an administrator. Each reading of this list is recorded in the audit trail.'
                : `The e-mails addressed to ${mailbox.viewerEmail}.`}
            </p>
            <Table caption="E-mails captured by the demo mail server, newest first" box="mt-3">
              <thead>
                <tr className="border-b border-rule-strong text-left">
                  <Th className="py-2 pr-4">To</Th>
                  <Th className="py-2 pr-4">Subject</Th>
                  <Th className="py-2">Received</Th>
                </tr>
              </thead>
              <tbody>
                {mailbox.messages.map((m) => (
                  <tr key={m.id} className="border-b border-rule align-top">
                    <Td className="break-all py-2 pr-4">{m.to.join(', ')}</Td>
                    <Th scope="row" className="py-2 pr-4 text-left font-normal">
                      <a
                        href={`#message-${m.id}`}
                        className="font-semibold text-accent underline hover:text-accent-hover"
                      >
                        {m.subject || '(no subject)'}
                      </a>
                    </Th>
                    <Td className="whitespace-nowrap py-2 font-mono text-xs">
                      <time dateTime={m.date}>{formatUtc(m.date, true)}</time>
                    </Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          </section>

          <section aria-labelledby="messages" className="space-y-4">
            <h2 id="messages" className="text-xl font-bold">
              Messages
            </h2>
            {mailbox.messages.map((m) => (
              <MessageCard key={m.id} message={m} />
            ))}
          </section>
        </>
      )}

      {mailbox.status !== 'signed-out' ? (
        <p>
          {/* A full load, so the list is read again. */}
          <a href="/mailbox" className="font-semibold text-accent underline hover:text-accent-hover">
            Refresh the mailbox
          </a>
        </p>
      ) : null}
    </div>
  );
}
