import { FINDING_LABELS, type DesignInputCheck, type FindingKind } from '@/lib/checks/submission-findings';
import { Table, Td, Th } from '@/components/ui/table';

/**
 * What the originator acknowledged in writing on submitting the version (each cell error, failed
 * criterion, engine warning and mismatched design input), and the design inputs that name a cell
 * with the value the engine used: shown to the checker and the approver on the check view.
 */
export function SubmissionAcknowledgements({
  acknowledgements,
  designInputs,
  submittedBy,
}: {
  acknowledgements: Array<{ key: string; kind: FindingKind; message: string; text: string }>;
  designInputs: Array<DesignInputCheck & { index: number; name: string }>;
  submittedBy: string;
}) {
  if (acknowledgements.length === 0 && designInputs.length === 0) return null;
  return (
    <section
      aria-labelledby="acknowledgements-title"
      className={`space-y-3 rounded border-2 bg-surface p-4 ${acknowledgements.length ? 'border-fail' : 'border-rule'}`}
    >
      <h2 id="acknowledgements-title" className="text-lg font-bold">
        {acknowledgements.length
          ? `Acknowledged by ${submittedBy} on submission (${acknowledgements.length})`
          : 'Design inputs and the values used'}
      </h2>
      {acknowledgements.length ? (
        <ul className="space-y-2 text-sm">
          {acknowledgements.map((a) => (
            <li key={a.key} className="rounded bg-fail-soft px-3 py-2">
              <p>
                <span className="font-semibold text-fail">{FINDING_LABELS[a.kind]}:</span> {a.message}
              </p>
              <p className="mt-1 border-l-4 border-rule-strong pl-2">
                <span className="sr-only">Acknowledgement: </span>
                {a.text}
              </p>
            </li>
          ))}
        </ul>
      ) : null}
      {designInputs.length ? (
        <Table
          caption={"Each design input that names a cell: the record's value and the value the engine used."}
          className="w-full text-left text-sm"
          captionClassName="text-left text-xs text-ink-muted"
        >
          <thead>
            <tr>
              <Th>Design input</Th>
              <Th>Record</Th>
              <Th>Value used</Th>
              <Th>Outcome</Th>
            </tr>
          </thead>
          <tbody>
            {designInputs.map((d) => (
              <tr key={d.index} className="border-t border-rule align-top">
                <Td>{d.name}</Td>
                <Td>
                  <code className="font-mono">{d.cell}</code> = {d.recordValue}
                </Td>
                <Td>{d.engineValue ?? '—'}</Td>
                <Td className={d.status === 'match' ? 'text-pass' : 'font-semibold text-fail'}>
                  {d.status === 'match' ? 'matches' : `Error: ${d.words}`}
                </Td>
              </tr>
            ))}
          </tbody>
        </Table>
      ) : null}
    </section>
  );
}
