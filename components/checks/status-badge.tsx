import type { SheetWorkflow } from '@/lib/checks/queries';

export type SheetStatus = SheetWorkflow['status'];

// Text and background pairs from the theme that reach 4.5:1 (tests/ui/contrast.test.ts).
const TONE: Record<SheetStatus, string> = {
  draft: 'border-rule-strong bg-paper text-ink',
  in_check: 'border-accent bg-accent-soft text-accent-hover',
  checked: 'border-accent bg-accent-soft text-accent-hover',
  approved: 'border-pass bg-pass-soft text-pass',
  returned: 'border-caution-rule bg-caution-soft text-caution',
};

/** Where a sheet stands in the workflow: Draft, In check, Checked, Approved or Returned. */
export function StatusBadge({ status, label }: { status: SheetStatus; label: string }) {
  return <span className={`inline-block rounded border px-2 py-0.5 text-sm font-bold ${TONE[status]}`}>{label}</span>;
}
