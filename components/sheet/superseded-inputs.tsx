import Link from 'next/link';
import type { CitedValue, SupersededInput } from '@/lib/sheets/impact';
import { VisibleText } from '@/components/data/visible-text';
import { Table, Td, Th } from '@/components/ui/table';

function Value({ value, missing }: { value: CitedValue | null; missing: string }) {
  if (!value) return <span className="italic">{missing}</span>;
  if (value.error) return <span className="text-fail">error: {value.error}</span>;
  return <span className="font-mono">{value.text}</span>;
}

/**
 * The caution shown on a sheet whose latest version cites a revision that is no longer current:
 * which sheet and revision, what replaced it, and each cited value then and now.
 */
export function SupersededInputs({
  inputs,
  projectCode,
  latestVersion,
}: {
  inputs: SupersededInput[];
  projectCode: string;
  latestVersion: number;
}) {
  if (inputs.length === 0) return null;
  return (
    <aside
      id="superseded-inputs"
      aria-labelledby="superseded-inputs-title"
      className="space-y-3 rounded border-l-4 border-caution-rule bg-caution-soft px-4 py-3 text-caution"
    >
      <h2 id="superseded-inputs-title" className="font-bold">
        Superseded input
      </h2>
      <p className="text-sm">
        Version {latestVersion} cites{' '}
        {inputs.length === 1 ? 'a revision of another sheet that is' : 'revisions of other sheets that are'} no longer
        current. Check whether the results still hold, then save a version citing the current revision.
      </p>
      {inputs.map((input) => {
        const what = `${input.sheet} revision ${input.revision}`;
        return (
          <section key={`${input.sheetId}:${input.revision}`} aria-label={what} className="space-y-1 text-sm">
            <p>
              <Link
                href={`/projects/${projectCode}/sheets/${input.sheetNumber}`}
                className="font-semibold text-caution underline"
              >
                {input.sheet}
              </Link>{' '}
              (<VisibleText text={input.title} />
              ): revision <strong>{input.revision}</strong> is{' '}
              {input.status === 'withdrawn' ? (
                <>withdrawn{input.withdrawnReason ? `: “${input.withdrawnReason}”` : ''}</>
              ) : (
                <>superseded</>
              )}
              {input.currentRevision ? (
                <>
                  ; the current revision is <strong>{input.currentRevision}</strong>.
                </>
              ) : (
                '; the sheet has no current revision.'
              )}{' '}
              {input.compareHref ? (
                <Link href={input.compareHref} className="font-semibold text-caution underline">
                  Compare {input.sheet} version {input.versionNumber} (revision {input.revision}) with version{' '}
                  {input.currentVersionNumber} (revision {input.currentRevision})
                </Link>
              ) : null}
            </p>
            <Table caption={`Values cited from ${what}, then and now`} className="w-full border-collapse text-left">
              <thead>
                <tr className="border-b border-caution-rule">
                  <Th className="py-1 pr-3">Name</Th>
                  <Th className="py-1 pr-3">In revision {input.revision} (cited)</Th>
                  <Th className="py-1 pr-3">
                    {input.currentRevision ? `In revision ${input.currentRevision} (current)` : 'Current'}
                  </Th>
                  <Th className="py-1">Changed</Th>
                </tr>
              </thead>
              <tbody>
                {input.names.map((n) => (
                  <tr key={n.name} className="border-b border-caution-rule align-top">
                    <Th scope="row" className="py-1 pr-3 font-mono font-normal">
                      {n.name}
                    </Th>
                    <Td className="py-1 pr-3">
                      <Value value={n.cited} missing="not recorded" />
                    </Td>
                    <Td className="py-1 pr-3">
                      <Value
                        value={n.current}
                        missing={input.currentRevision ? 'no longer defined' : 'no current revision'}
                      />
                    </Td>
                    <Td className="py-1 font-semibold">{n.changed ? 'yes' : 'no'}</Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          </section>
        );
      })}
    </aside>
  );
}
