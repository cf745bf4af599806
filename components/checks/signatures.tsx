import { UtcTime } from '@/components/ui/utc-time';
import { Table, Td, Th } from '@/components/ui/table';

export interface SignatureRow {
  id: string;
  printedName: string;
  /** "Prepared", "Checked", "Approved", "Issued". */
  meaningLabel: string;
  signedAt: string;
  versionNumber: number;
  sha256: string;
}

/** Electronic signatures as records show them: printed name, meaning, UTC time, and the version's SHA-256. */
export function SignatureTable({ signatures, caption }: { signatures: SignatureRow[]; caption: string }) {
  if (signatures.length === 0) return <p className="text-sm text-ink-muted">No signatures yet.</p>;
  return (
    <Table caption={caption}>
      <thead>
        <tr className="border-b border-rule-strong text-left">
          <Th className="py-2 pr-3">Printed name</Th>
          <Th className="py-2 pr-3">Meaning</Th>
          <Th className="py-2 pr-3">Signed (UTC)</Th>
          <Th className="py-2 pr-3">Version</Th>
          <Th className="py-2">SHA-256 of the version</Th>
        </tr>
      </thead>
      <tbody>
        {signatures.map((s) => (
          <tr key={s.id} className="border-b border-rule align-top">
            <Td className="py-2 pr-3 font-semibold whitespace-nowrap">{s.printedName}</Td>
            <Td className="py-2 pr-3">{s.meaningLabel}</Td>
            <Td className="py-2 pr-3 whitespace-nowrap font-mono">
              <UtcTime iso={s.signedAt} />
            </Td>
            <Td className="py-2 pr-3 font-mono">{s.versionNumber}</Td>
            <Td className="py-2 font-mono text-xs break-all">{s.sha256}</Td>
          </tr>
        ))}
      </tbody>
    </Table>
  );
}

/** The same, compact, for a narrow column (one version's signatures). */
export function SignatureList({ signatures, label }: { signatures: SignatureRow[]; label: string }) {
  if (signatures.length === 0) return <p className="text-sm text-ink-muted">No signatures yet.</p>;
  return (
    <ul aria-label={label} className="space-y-1 text-sm">
      {signatures.map((s) => (
        <li key={s.id}>
          <span className="font-semibold">{s.meaningLabel}</span> · {s.printedName}
          <span className="block font-mono text-xs text-ink-muted">
            <UtcTime iso={s.signedAt} />
          </span>
        </li>
      ))}
    </ul>
  );
}
