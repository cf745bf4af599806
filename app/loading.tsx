export default function Loading() {
  return (
    <div role="status" aria-live="polite" aria-busy="true" className="space-y-3 py-6">
      <span className="sr-only">Loading…</span>
      <div className="h-7 w-1/3 animate-pulse rounded bg-rule" />
      <div className="h-4 w-2/3 animate-pulse rounded bg-rule" />
      <div className="h-4 w-1/2 animate-pulse rounded bg-rule" />
    </div>
  );
}
