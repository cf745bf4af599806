import { CautionNotice } from '@/components/shell/caution-notice';
import { MyWorkView } from '@/components/home/my-work';
import { getDb } from '@/db';
import { getActor } from '@/lib/auth/current-actor';
import { myWork } from '@/lib/home/my-work';

export const dynamic = 'force-dynamic';

const STEPS = [
  {
    term: 'Write',
    text: 'The originator writes cells with units and the relativistic function library; the server evaluates them.',
  },
  { term: 'Save', text: 'Every save is an immutable version, identified by the SHA-256 of its content.' },
  {
    term: 'Check',
    text: 'An independent checker reviews what changed since the last approved version, comments and signs.',
  },
  { term: 'Approve', text: 'An approver who did not write it approves the checked version.' },
  { term: 'Issue', text: 'Document control issues a numbered revision as a digitally signed PDF.' },
  { term: 'Verify', text: 'Anyone handed the PDF can confirm it is authentic and still current.' },
] as const;

/** Signed in: the person's work (lib/home/my-work.ts); signed out: what the product is. */
export default async function HomePage() {
  const actor = await getActor();
  if (actor) return <MyWorkView name={actor.name} work={await myWork(getDb(), actor)} />;
  return (
    <div className="space-y-10">
      <section className="ws-grid -mx-gutter rounded border border-rule px-gutter py-12">
        <p className="font-mono text-xs font-bold uppercase tracking-widest text-accent">
          Calculation control for relativistic engineering
        </p>
        <h1 className="mt-3 max-w-prose text-3xl font-bold">
          Worldsheet is where engineers write unit-aware relativistic calculations, have each one independently checked
          and approved, and issue it as a signed PDF revision that anyone can verify.
        </h1>
        <p className="mt-4 max-w-prose text-lg text-ink-muted">
          For beam-line and accelerator design, ion-beam therapy, electron optics, satellite timing and mission studies:
          the numbers behind magnet specifications, shielding and interlock set-points and timing budgets.
        </p>
      </section>

      <CautionNotice />

      <section aria-labelledby="journey">
        <h2 id="journey" className="text-xl font-bold">
          How a calculation travels
        </h2>
        <ol className="mt-4 grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {STEPS.map((step, i) => (
            <li key={step.term} className="rounded border border-rule bg-surface p-4">
              <p className="flex items-baseline gap-2">
                <span className="font-mono text-sm text-ink-muted">{String(i + 1).padStart(2, '0')}</span>
                <span className="font-bold">{step.term}</span>
              </p>
              <p className="mt-1 text-sm text-ink-muted">{step.text}</p>
            </li>
          ))}
        </ol>
      </section>
    </div>
  );
}
