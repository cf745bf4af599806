import type { DiffPiece } from '@/lib/sheets/compare';
import { VisibleText } from '@/components/data/visible-text';

/**
 * A word diff as the checker reads it: added words in `<ins>` on green, removed words in `<del>` on
 * red and struck through. Shared by the comparison page and the check view.
 */
export function SourceDiff({ pieces, label }: { pieces: DiffPiece[]; label?: string }) {
  return (
    <pre aria-label={label} className="overflow-x-auto whitespace-pre-wrap rounded bg-paper p-2 font-mono text-sm">
      {pieces.map((p, i) =>
        p.added ? (
          <ins key={i} className="bg-pass-soft text-pass no-underline">
            <VisibleText text={p.text} />
          </ins>
        ) : p.removed ? (
          <del key={i} className="bg-fail-soft text-fail">
            <VisibleText text={p.text} />
          </del>
        ) : (
          <span key={i}>
            <VisibleText text={p.text} />
          </span>
        ),
      )}
    </pre>
  );
}
