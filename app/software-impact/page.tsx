import type { Metadata } from 'next';
import Link from 'next/link';
import { UtcTime } from '@/components/ui/utc-time';
import { getDb } from '@/db';
import { pageActor } from '@/lib/auth/page-guard';
import { LIBRARY } from '@/lib/calc/functions';
import {
  softwareImpact,
  softwareImpactQuerySchema,
  SOFTWARE_IMPACT_LIMIT,
  type Facet,
} from '@/lib/sheets/software-impact';
import { VisibleText } from '@/components/data/visible-text';
import { StatusBadge } from '@/components/ui/status-badge';
import { Table, Td, Th } from '@/components/ui/table';
import { smallPrimaryButton } from '@/components/ui/button';
import { Field } from '@/components/ui/field';

export const metadata: Metadata = { title: 'Software impact' };
export const dynamic = 'force-dynamic';

const counted = (f: Facet) =>
  `${f.value} — ${f.versions} ${f.versions === 1 ? 'version' : 'versions'}, ${f.revisions} ${f.revisions === 1 ? 'revision' : 'revisions'}`;

export default async function SoftwareImpactPage({ searchParams }: { searchParams: Promise<Record<string, string>> }) {
  const actor = await pageActor('/software-impact');
  const raw = await searchParams;
  const parsed = softwareImpactQuerySchema.safeParse({ ...raw, format: 'json' });
  const query = parsed.success ? parsed.data : softwareImpactQuerySchema.parse({});
  const problem = parsed.success ? null : `${parsed.error.issues[0].path.join('.')}: ${parsed.error.issues[0].message}`;
  const answer = await softwareImpact(getDb(), actor, query);
  const csv = new URLSearchParams({
    ...(answer.filter.engineVersion ? { engineVersion: answer.filter.engineVersion } : {}),
    ...(answer.filter.constantsEdition ? { constantsEdition: answer.filter.constantsEdition } : {}),
    ...(answer.filter.function ? { function: answer.filter.function } : {}),
    format: 'csv',
  });
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-2xl font-bold">Software impact</h1>
        <p className="mt-1 max-w-prose text-ink-muted">
          When a problem is found in the calculation engine or in a constants edition (ASME NQA-1 Part II, Subpart 2.7),
          find every version evaluated with it, and the revisions issued from them, so that their users can be told.
          Only projects you are a member of are searched
          {actor.isAdmin ? ' (as an administrator, you see all projects)' : ''}.
        </p>
      </header>
      <form
        method="get"
        className="flex flex-wrap items-end gap-3 rounded border border-rule bg-surface p-3 text-sm"
        aria-describedby={problem ? 'swi-problem' : undefined}
      >
        <Field
          label="Engine version"
          id="swi-engine"
          labelClassName="block font-semibold"
          className="min-w-0 max-w-full"
        >
          {(control) => (
            <select
              {...control}
              name="engineVersion"
              defaultValue={answer.filter.engineVersion ?? ''}
              className="w-full max-w-md rounded border border-rule-strong bg-surface px-2 py-1"
            >
              <option value="">Any</option>
              {answer.engineVersions.map((f) => (
                <option key={f.value} value={f.value}>
                  {counted(f)}
                </option>
              ))}
            </select>
          )}
        </Field>
        <Field
          label="Constants edition"
          id="swi-edition"
          labelClassName="block font-semibold"
          className="min-w-0 max-w-full"
        >
          {(control) => (
            <select
              {...control}
              name="constantsEdition"
              defaultValue={answer.filter.constantsEdition ?? ''}
              className="w-full max-w-md rounded border border-rule-strong bg-surface px-2 py-1"
            >
              <option value="">Any</option>
              {answer.constantsEditions.map((f) => (
                <option key={f.value} value={f.value}>
                  {counted(f)}
                </option>
              ))}
            </select>
          )}
        </Field>
        <div>
          <label htmlFor="swi-function" className="block font-semibold">
            Calls the function (optional)
          </label>
          <input
            id="swi-function"
            name="function"
            list="swi-functions"
            defaultValue={answer.filter.function ?? ''}
            aria-describedby="swi-function-hint"
            autoComplete="off"
            className="rounded border border-rule-strong bg-surface px-2 py-1 font-mono"
          />
          <datalist id="swi-functions">
            {LIBRARY.map((f) => (
              <option key={f.name} value={f.name} />
            ))}
          </datalist>
          <p id="swi-function-hint" className="text-xs text-ink-muted">
            A name written with “(” after it in a calculation cell, comments included.
          </p>
        </div>
        <button type="submit" className={smallPrimaryButton}>
          Find
        </button>
        {answer.rows ? (
          <a href={`/api/software-impact?${csv}`} download className="ml-auto font-semibold text-accent underline">
            Export as CSV
          </a>
        ) : null}
      </form>
      {problem ? (
        <p
          id="swi-problem"
          role="alert"
          className="rounded border-l-4 border-fail bg-fail-soft px-3 py-2 text-sm text-fail"
        >
          {problem}
        </p>
      ) : null}
      {answer.engineVersions.length === 0 ? (
        <p className="text-ink-muted">No evaluated version in your projects yet.</p>
      ) : null}
      {answer.rows === null ? (
        answer.engineVersions.length > 0 ? (
          <p className="text-ink-muted">
            Choose an engine version, a constants edition or a function to list what used it.
          </p>
        ) : null
      ) : (
        <section aria-labelledby="swi-results" className="space-y-2">
          <h2 id="swi-results" className="text-lg font-bold">
            What used it
          </h2>
          <p aria-live="polite" className="text-sm">
            {answer.summary!.versions} {answer.summary!.versions === 1 ? 'version' : 'versions'} of{' '}
            {answer.summary!.sheets} {answer.summary!.sheets === 1 ? 'sheet' : 'sheets'}
            {answer.summary!.safetyRelatedSheets > 0
              ? ` (${answer.summary!.safetyRelatedSheets} safety-related)`
              : ''}; {answer.summary!.revisions} issued as{' '}
            {answer.summary!.revisions === 1 ? 'a revision' : 'revisions'}, {answer.summary!.currentRevisions} of them
            current.
            {answer.truncated
              ? ` Only the first ${SOFTWARE_IMPACT_LIMIT.json} are shown; the CSV export holds up to ${SOFTWARE_IMPACT_LIMIT.csv}.`
              : ''}
          </p>
          {answer.rows.length > 0 ? (
            <Table
              caption="Versions evaluated with the chosen engine version, constants edition or function"
              className="w-full text-left text-sm"
              box="rounded border border-rule bg-surface"
            >
              <thead>
                <tr className="border-b border-rule-strong">
                  <Th className="px-3 py-2">Sheet</Th>
                  <Th className="px-3 py-2">Version</Th>
                  <Th className="px-3 py-2">Revision</Th>
                  <Th className="px-3 py-2">Engine · constants</Th>
                  <Th className="px-3 py-2">Saved (UTC)</Th>
                </tr>
              </thead>
              <tbody>
                {answer.rows.map((r) => (
                  <tr key={`${r.sheetId}:${r.versionNumber}`} className="border-b border-rule align-top">
                    <Th scope="row" className="px-3 py-2 text-left font-normal">
                      <Link
                        href={`/projects/${r.projectCode}/sheets/${r.sheetNumber}`}
                        className="font-mono font-semibold text-accent underline"
                      >
                        {r.sheet}
                      </Link>
                      <div>
                        <VisibleText text={r.title} />
                      </div>
                      {r.safetyRelated ? (
                        <span className="rounded bg-caution-soft px-1.5 py-0.5 text-xs font-bold text-caution">
                          safety-related
                        </span>
                      ) : null}
                    </Th>
                    <Td className="px-3 py-2">
                      <Link
                        href={`/projects/${r.projectCode}/sheets/${r.sheetNumber}?version=${r.versionNumber}`}
                        className="text-accent underline"
                      >
                        {r.versionNumber}
                      </Link>
                      <div className="font-mono text-xs text-ink-muted" title={r.versionSha256}>
                        {r.versionSha256.slice(0, 12)}…
                      </div>
                    </Td>
                    <Td className="px-3 py-2 whitespace-nowrap">
                      {r.revision ? (
                        <>
                          {r.revision} <StatusBadge status={r.revisionStatus} compact />
                        </>
                      ) : (
                        'not issued'
                      )}
                    </Td>
                    <Td className="px-3 py-2 text-xs">
                      {r.engineVersion ?? '—'}
                      <div className="text-ink-muted">{r.constantsEdition ?? '—'}</div>
                    </Td>
                    <Td className="px-3 py-2 whitespace-nowrap">
                      <UtcTime iso={r.savedAt} />
                      <div className="text-xs text-ink-muted">{r.author}</div>
                    </Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          ) : null}
        </section>
      )}
    </div>
  );
}
