// The revision-status badge (issue 18's UI kit): the word of a revision's status (current, superseded,
// withdrawn) on its colour, the one place those colours are chosen. Each pair is a text colour on its soft
// background, checked for WCAG AA contrast by tests/ui/contrast.test.ts. Pure: usable from client components.

const STATUS_STYLE: Record<string, string> = {
  current: 'bg-pass-soft text-pass',
  superseded: 'bg-caution-soft text-caution',
  withdrawn: 'bg-fail-soft text-fail',
};

/**
 * A revision status as a small badge. `compact` is the narrower form used inside table cells and lists.
 * A missing status is coloured as current and shows no word, as the software impact table always did.
 */
export function StatusBadge({ status, compact = false }: { status: string | null | undefined; compact?: boolean }) {
  const padding = compact ? 'px-1' : 'px-1.5 py-0.5';
  return (
    <span className={`rounded ${padding} text-xs font-bold ${STATUS_STYLE[status ?? 'current'] ?? ''}`}>{status}</span>
  );
}
