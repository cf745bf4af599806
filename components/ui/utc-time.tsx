// The one UTC date-time format of the screens (issue 18's UI kit): `2026-12-02 14:03 UTC`, or with seconds,
// the same on every machine unlike a locale format. Pure: no server module, usable from client components.
/** `2026-12-02 14:03 UTC`, the same on every machine; the element carries the full ISO 8601 time. */
export function formatUtc(iso: string, seconds = false): string {
  return `${iso.slice(0, 10)} ${iso.slice(11, seconds ? 19 : 16)} UTC`;
}

export function UtcTime({ iso, seconds = false, className }: { iso: string; seconds?: boolean; className?: string }) {
  return (
    <time dateTime={iso} title={iso} className={className}>
      {formatUtc(iso, seconds)}
    </time>
  );
}
