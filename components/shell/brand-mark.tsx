/**
 * Worldsheet's mark: a square sheet crossed by the two 45° light-cone lines, with a worldline of
 * constant proper acceleration (a hyperbola) curving inside the future cone.
 */
export function BrandMark({ className = 'h-7 w-7' }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true" focusable="false">
      <rect x="1.5" y="1.5" width="29" height="29" rx="2" fill="none" stroke="currentColor" strokeWidth="2.2" />
      <path d="M4 28 L28 4 M4 4 L28 28" stroke="currentColor" strokeWidth="1.2" opacity="0.45" />
      <path
        d="M16 16 C 16.8 11, 20 8.5, 24.5 4"
        fill="none"
        stroke="currentColor"
        strokeWidth="2.4"
        strokeLinecap="round"
      />
      <circle cx="16" cy="16" r="2.2" fill="currentColor" />
    </svg>
  );
}
