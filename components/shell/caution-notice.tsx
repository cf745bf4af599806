import { CAUTIONS, SAFETY_RELATED_CAUTION } from '@/lib/safety/cautions';

/** The cautions of the product brief, shown wherever results appear. */
export function CautionNotice({ compact = false }: { compact?: boolean }) {
  return (
    <aside
      aria-label="Caution"
      className="rounded border-l-4 border-caution-rule bg-caution-soft px-4 py-3 text-caution"
    >
      <p className={`font-bold ${compact ? 'text-sm' : 'text-base'}`}>Caution</p>
      <ul className={`mt-1 list-disc space-y-0.5 pl-5 ${compact ? 'text-xs' : 'text-sm'}`}>
        {CAUTIONS.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
    </aside>
  );
}

/** The banner of a safety-related sheet, wherever the sheet or its check is shown. */
export function SafetyRelatedNotice() {
  return (
    <p
      role="note"
      className="rounded border-l-4 border-caution-rule bg-caution-soft px-4 py-3 text-sm font-semibold text-caution"
    >
      {SAFETY_RELATED_CAUTION}
    </p>
  );
}
