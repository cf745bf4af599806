import { bidiSegments, describeBidiControl } from '@/lib/calc/bidi-controls';

/**
 * Text with every bidirectional control character (lib/calc/bidi-controls.ts) shown as a marker
 * such as ⟦U+202E⟧ in a style of its own (`.ws-bidi-marker`) instead of letting it reorder what is
 * around it. Use it wherever text someone typed is shown; works in server and client components.
 */
export function VisibleText({ text }: { text: string }) {
  const segments = bidiSegments(text);
  if (segments.length === 1 && segments[0].control === null) return <>{text}</>;
  return (
    <>
      {segments.map((s, i) =>
        s.control ? (
          <span
            key={i}
            className="ws-bidi-marker"
            title={`${describeBidiControl(s.control.codePoint)}: a bidirectional control character, shown instead of applied`}
          >
            {s.text}
          </span>
        ) : (
          s.text
        ),
      )}
    </>
  );
}
